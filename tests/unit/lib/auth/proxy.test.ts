import { describe, expect, it } from "vitest";
import { NextRequest } from "next/server";
import { proxy } from "@/proxy";

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
