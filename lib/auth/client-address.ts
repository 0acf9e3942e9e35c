/**
 * The client address used to count failed sign-ins per address.
 *
 * X-Forwarded-For is a list each proxy appends to: "client, proxy1, proxy2". Its left end is whatever the client
 * sent, so taking the first entry let anyone pick a fresh address per request and never meet the per-address limit.
 * The entry to trust is the one written by our own outermost proxy: `QUELL_PROXY_HOPS` (default 1) counts the
 * proxies in front of the app, and the address is that many entries from the right. Next's own server fills the
 * header with the socket address when it is absent, so with no proxy the single entry is the peer.
 */
export function clientAddressFrom(h: Headers, hops = proxyHops()): string {
  const list = (h.get("x-forwarded-for") ?? "")
    .split(",")
    .map((s) => s.trim())
    .filter(Boolean);
  if (list.length) return list[Math.max(0, list.length - hops)]!.slice(0, 100);
  return h.get("x-real-ip")?.trim().slice(0, 100) || "unknown";
}

function proxyHops(): number {
  const n = Number(process.env.QUELL_PROXY_HOPS ?? "1");
  return Number.isInteger(n) && n >= 1 && n <= 10 ? n : 1;
}
