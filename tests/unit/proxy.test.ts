import { describe, expect, it } from "vitest";
import { NextRequest } from "next/server";
import { crossOriginPost, proxy } from "@/proxy";

// Framing refusal as specified by RFC 7034 (X-Frame-Options) and CSP Level 2 "frame-ancestors"; nosniff per the
// Fetch Standard ("X-Content-Type-Options").
describe("proxy: page responses", () => {
  it("refuse to be framed by another site and pass the requested path on for the sign-in redirect", async () => {
    const res = await proxy(new NextRequest("http://127.0.0.1:3000/scenarios/abc?tab=history"));
    expect(res.headers.get("x-frame-options")).toBe("DENY");
    expect(res.headers.get("content-security-policy")).toBe("frame-ancestors 'none'");
    expect(res.headers.get("x-content-type-options")).toBe("nosniff");
    // NextResponse.next({ request: { headers } }) forwards overridden request headers under x-middleware-request-*.
    expect(res.headers.get("x-middleware-request-x-quell-path")).toBe("/scenarios/abc?tab=history");
  });

  it("a client cannot choose the forwarded path: the proxy overwrites x-quell-path", async () => {
    const res = await proxy(new NextRequest("http://127.0.0.1:3000/library", { headers: { "x-quell-path": "//evil.example" } }));
    expect(res.headers.get("x-middleware-request-x-quell-path")).toBe("/library");
  });
});

describe("proxy: cross-origin posts", () => {
  const post = (headers: Record<string, string>) => new NextRequest("http://127.0.0.1:3000/sign-in", { method: "POST", headers: { host: "127.0.0.1:3000", ...headers } });

  // Origin semantics per RFC 6454 (scheme, host, port) and the Fetch Standard (browsers send Origin on every
  // cross-site POST; "null" from opaque origins).
  it("refuses a POST whose Origin is another site, or the opaque 'null'", () => {
    expect(crossOriginPost(post({ origin: "http://evil.example" }))).toBe(true);
    expect(crossOriginPost(post({ origin: "http://127.0.0.1:4000" }))).toBe(true);
    expect(crossOriginPost(post({ origin: "null" }))).toBe(true);
  });

  it("lets same-origin posts, posts without Origin and GETs through", () => {
    expect(crossOriginPost(post({ origin: "http://127.0.0.1:3000" }))).toBe(false);
    expect(crossOriginPost(post({}))).toBe(false);
    expect(crossOriginPost(new NextRequest("http://127.0.0.1:3000/sign-in", { headers: { origin: "http://evil.example" } }))).toBe(false);
  });

  it("answers 403 with a plain message", async () => {
    const res = await proxy(post({ origin: "http://evil.example", "next-action": "x" }));
    expect(res.status).toBe(403);
    expect(res.headers.get("content-type")).toMatch(/^text\/plain/);
    expect(await res.text()).toMatch(/^Cross-origin request refused/);
  });
});
