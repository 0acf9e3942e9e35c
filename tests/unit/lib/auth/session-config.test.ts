import { afterEach, describe, expect, it, vi } from "vitest";
import { sealData } from "iron-session";
import { SESSION_COOKIE, sessionFromCookieHeader, sessionOptions, sessionPassword } from "@/lib/auth/session-config";
import { roleAtLeast } from "@/lib/shared/roles";
import { hashToken, randomToken } from "@/lib/shared/tokens";

afterEach(() => vi.unstubAllEnvs());

describe("session cookie settings", () => {
  it("is httpOnly and sameSite=lax, and Secure in production except over plain http on a loopback host", () => {
    vi.stubEnv("NODE_ENV", "production");
    vi.stubEnv("SESSION_SECRET", "s".repeat(40));
    const behindTls = sessionOptions({ proto: "https", host: "quell.example" });
    expect(behindTls.cookieOptions).toMatchObject({ httpOnly: true, sameSite: "lax", secure: true });
    expect(sessionOptions({ proto: "http", host: "quell.example" }).cookieOptions?.secure).toBe(true);
    expect(sessionOptions({ proto: "http", host: "127.0.0.1:3000" }).cookieOptions?.secure).toBe(false);
    expect(sessionOptions({ proto: "http", host: "localhost:3000" }).cookieOptions?.secure).toBe(false);
    vi.stubEnv("NODE_ENV", "development");
    expect(sessionOptions({ proto: "https", host: "quell.example" }).cookieOptions?.secure).toBe(false);
  });

  it("refuses to run in production without a secret, and refuses a short one", () => {
    vi.stubEnv("NODE_ENV", "production");
    vi.stubEnv("SESSION_SECRET", "");
    expect(() => sessionPassword()).toThrow(/SESSION_SECRET is not set/);
    vi.stubEnv("SESSION_SECRET", "short");
    expect(() => sessionPassword()).toThrow(/at least 32 characters/);
  });

  it("reads a sealed cookie out of a Cookie header and ignores tampered ones", async () => {
    vi.stubEnv("SESSION_SECRET", "k".repeat(40));
    const seal = await sealData({ userId: "u1", teamId: "t1", sv: 0 }, { password: "k".repeat(40), ttl: 3600 });
    expect(await sessionFromCookieHeader(`a=b; ${SESSION_COOKIE}=${seal}; c=d`)).toEqual({ userId: "u1", teamId: "t1", sv: 0 });
    const tampered = seal.slice(0, -4) + (seal.endsWith("AAAA") ? "BBBB" : "AAAA");
    expect(await sessionFromCookieHeader(`${SESSION_COOKIE}=${tampered}`)).toEqual({});
    const otherKey = await sealData({ userId: "u1" }, { password: "z".repeat(40), ttl: 3600 });
    expect(await sessionFromCookieHeader(`${SESSION_COOKIE}=${otherKey}`)).toEqual({});
    expect(await sessionFromCookieHeader(null)).toEqual({});
  });
});

describe("roles and tokens", () => {
  it("orders roles lead ⊃ designer ⊃ viewer", () => {
    expect(roleAtLeast("lead", "designer")).toBe(true);
    expect(roleAtLeast("designer", "designer")).toBe(true);
    expect(roleAtLeast("viewer", "designer")).toBe(false);
    expect(roleAtLeast("designer", "lead")).toBe(false);
  });

  it("makes 256-bit URL-safe tokens and stores their SHA-256", () => {
    const t = randomToken();
    expect(t).toMatch(/^[A-Za-z0-9_-]{43}$/); // 32 bytes in base64url without padding
    expect(randomToken()).not.toBe(t);
    // SHA-256("abc") from FIPS 180-2, appendix B.1.
    expect(hashToken("abc")).toBe("ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
  });
});
