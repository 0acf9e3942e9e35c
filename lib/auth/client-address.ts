/**
 * The client address used to count failed sign-ins per address.
 *
 * The address to trust is the one the outermost of *our own* machines saw: the socket's peer when nothing stands in
 * front of the app, else the entry our outermost proxy appended to X-Forwarded-For (a list each proxy appends to:
 * "client, proxy1, proxy2"; its left end is whatever the client typed). `QUELL_PROXY_HOPS` counts the proxies in
 * front of the app; the default 0 trusts no forwarded header at all.
 *
 * Next.js does not hand the socket to route handlers or server actions; scripts/peer-address.cjs (preloaded by the
 * start and test commands) stamps each request with it in `x-quell-peer-address`. Without that hook and with no
 * proxies configured, the socket address cannot be told apart from a client-sent X-Forwarded-For (Next fills that
 * header only when it is absent), so every such request counts under one shared "unknown" address: the limit can
 * then be reached by many clients together, but never dodged.
 */
export const PEER_ADDRESS_HEADER = "x-quell-peer-address";

/** True when scripts/peer-address.cjs runs in this process, so `x-quell-peer-address` is the socket's peer. */
export function peerAddressStamped(): boolean {
  return (globalThis as Record<symbol, unknown>)[Symbol.for("quell.peerAddressHeader")] === PEER_ADDRESS_HEADER;
}

export function clientAddressFrom(h: Headers, hops = proxyHops()): string {
  const forwarded = (h.get("x-forwarded-for") ?? "")
    .split(",")
    .map((s) => s.trim())
    .filter(Boolean);
  const peer = peerAddressStamped() ? h.get(PEER_ADDRESS_HEADER)?.trim() : undefined;
  if (peer) {
    // The chain as our machines saw it: what the trusted proxies appended, then the socket's peer (the innermost).
    const chain = hops > 0 ? [...forwarded, peer] : [peer];
    return chain[Math.max(0, chain.length - 1 - hops)]!.slice(0, 100);
  }
  if (hops === 0) return "unknown";
  if (forwarded.length) return forwarded[Math.max(0, forwarded.length - hops)]!.slice(0, 100);
  return h.get("x-real-ip")?.trim().slice(0, 100) || "unknown";
}

/** `QUELL_PROXY_HOPS`: proxies in front of the app that append to X-Forwarded-For (0–10, default 0). */
export function proxyHops(): number {
  const n = Number(process.env.QUELL_PROXY_HOPS ?? "0");
  return Number.isInteger(n) && n >= 0 && n <= 10 ? n : 0;
}
