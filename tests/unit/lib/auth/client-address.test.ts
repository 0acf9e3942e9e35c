import { afterEach, describe, expect, it, vi } from "vitest";
import { createServer } from "node:http";
import type { AddressInfo } from "node:net";
import { createRequire } from "node:module";
import { clientAddressFrom, PEER_ADDRESS_HEADER } from "@/lib/auth/client-address";
import { SESSION_COOKIE, sessionFromCookieHeader } from "@/lib/auth/session-config";

afterEach(() => vi.unstubAllEnvs());

// X-Forwarded-For semantics: each proxy appends the address it received the request from (MDN, "X-Forwarded-For";
// RFC 7239 §5.2 for the equivalent Forwarded "for=" list): only the right-hand entries written by our own proxies
// can be trusted, the left end is whatever the client typed.
describe("client address for the per-address sign-in limit", () => {
  it("takes the entry our proxy appended, not the one the client sent", () => {
    const h = new Headers({ "x-forwarded-for": "203.0.113.9, 198.51.100.7" });
    expect(clientAddressFrom(h, 1)).toBe("198.51.100.7");
    expect(clientAddressFrom(h, 2)).toBe("203.0.113.9");
  });

  it("a forged left-hand entry does not change the address", () => {
    const a = clientAddressFrom(new Headers({ "x-forwarded-for": "1.1.1.1, 198.51.100.7" }), 1);
    const b = clientAddressFrom(new Headers({ "x-forwarded-for": "2.2.2.2, 198.51.100.7" }), 1);
    expect(a).toBe(b);
  });

  it("reads QUELL_PROXY_HOPS, clamps to the list, and falls back to x-real-ip then 'unknown'", () => {
    vi.stubEnv("QUELL_PROXY_HOPS", "2");
    expect(clientAddressFrom(new Headers({ "x-forwarded-for": "a, b, c" }))).toBe("b");
    expect(clientAddressFrom(new Headers({ "x-forwarded-for": "only" }), 3)).toBe("only");
    expect(clientAddressFrom(new Headers({ "x-real-ip": "192.0.2.1" }))).toBe("192.0.2.1");
    expect(clientAddressFrom(new Headers())).toBe("unknown");
  });
});

describe("session cookie parsing", () => {
  it("treats a cookie with a malformed %-escape as no session (anonymous), without throwing", async () => {
    await expect(sessionFromCookieHeader(`${SESSION_COOKIE}=%E0%A4%A`)).resolves.toEqual({});
    await expect(sessionFromCookieHeader(`other=1; ${SESSION_COOKIE}=%`)).resolves.toEqual({});
  });
});

describe("session cookie Secure flag behind a proxy", () => {
  it("QUELL_COOKIE_SECURE=1 makes it Secure even when the request looks like plain loopback http", async () => {
    const { sessionOptions } = await import("@/lib/auth/session-config");
    vi.stubEnv("NODE_ENV", "production");
    vi.stubEnv("SESSION_SECRET", "s".repeat(40));
    // A TLS-terminating proxy passing Host 127.0.0.1 and no X-Forwarded-Proto.
    const looksLoopback = { proto: null, host: "127.0.0.1:3000" };
    expect(sessionOptions(looksLoopback).cookieOptions?.secure).toBe(false);
    vi.stubEnv("QUELL_COOKIE_SECURE", "1");
    expect(sessionOptions(looksLoopback).cookieOptions).toMatchObject({ secure: true, httpOnly: true, sameSite: "lax" });
    vi.stubEnv("QUELL_COOKIE_SECURE", "0");
    expect(sessionOptions({ proto: "http", host: "192.168.1.5:3000" }).cookieOptions?.secure).toBe(false);
  });
});

describe("client address: the socket's peer by default (QUELL_PROXY_HOPS=0)", () => {
  const STAMP = Symbol.for("quell.peerAddressHeader");
  afterEach(() => {
    delete (globalThis as Record<symbol, unknown>)[STAMP];
  });

  it("ignores a client-sent X-Forwarded-For and counts the socket's peer (as stamped by the start command's hook)", () => {
    (globalThis as Record<symbol, unknown>)[STAMP] = PEER_ADDRESS_HEADER;
    const seen = new Set<string>();
    for (let i = 0; i < 10; i++) {
      seen.add(clientAddressFrom(new Headers({ "x-forwarded-for": `10.9.${i}.1`, [PEER_ADDRESS_HEADER]: "127.0.0.1" })));
    }
    expect([...seen]).toEqual(["127.0.0.1"]);
  });

  it("with one proxy configured, takes the entry that proxy appended (the peer is the proxy itself)", () => {
    (globalThis as Record<symbol, unknown>)[STAMP] = PEER_ADDRESS_HEADER;
    vi.stubEnv("QUELL_PROXY_HOPS", "1");
    const h = new Headers({ "x-forwarded-for": "1.1.1.1, 198.51.100.7", [PEER_ADDRESS_HEADER]: "10.0.0.2" });
    expect(clientAddressFrom(h)).toBe("198.51.100.7");
  });

  it("without the hook, trusts neither X-Forwarded-For nor a client-sent peer header: one shared address, never dodged", () => {
    const a = clientAddressFrom(new Headers({ "x-forwarded-for": "10.9.1.1", [PEER_ADDRESS_HEADER]: "10.9.1.1" }));
    const b = clientAddressFrom(new Headers({ "x-forwarded-for": "10.9.2.1", [PEER_ADDRESS_HEADER]: "10.9.2.1" }));
    expect(a).toBe("unknown");
    expect(b).toBe(a);
  });

  it("the hook (scripts/peer-address.cjs) overwrites a client-sent peer header with the socket's address", async () => {
    const require = createRequire(import.meta.url);
    require("../../../../scripts/peer-address.cjs");
    const server = createServer((req, res) => {
      try {
        const h = new Headers(req.headers as Record<string, string>);
        res.end(JSON.stringify({ peer: req.headers[PEER_ADDRESS_HEADER], address: clientAddressFrom(h, 0) }));
      } catch (e) {
        res.statusCode = 500;
        res.end(JSON.stringify({ error: String(e) }));
      }
    });
    await new Promise<void>((r) => server.listen(0, "127.0.0.1", () => r()));
    try {
      const port = (server.address() as AddressInfo).port;
      const res = await fetch(`http://127.0.0.1:${port}/`, { headers: { "x-forwarded-for": "203.0.113.5", [PEER_ADDRESS_HEADER]: "203.0.113.5" } });
      expect(await res.json()).toEqual({ peer: "127.0.0.1", address: "127.0.0.1" });
    } finally {
      await new Promise((r) => server.close(r));
    }
  });
});
