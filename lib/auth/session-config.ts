import type { SessionOptions } from "iron-session";
import { unsealData } from "iron-session";

/** What the sealed cookie holds: who is signed in, the team they work in, and their session version. */
export interface SessionData {
  userId?: string;
  teamId?: string;
  /** users.session_version when the session was made; a password reset bumps it and ends older sessions. */
  sv?: number;
  /** The server-side session row (table `sessions`): the session lives only while that row does. */
  sid?: string;
}

export const SESSION_COOKIE = "quell_session";
/** Session lifetime, s (14 days). */
export const SESSION_TTL_S = 14 * 24 * 3600;

const DEV_SECRET = "quell-development-only-session-secret-0000";

/**
 * The cookie-sealing password. Production refuses to run without SESSION_SECRET (the start command
 * generates one and keeps it in .data, outside git); development and tests fall back to a fixed one.
 */
export function sessionPassword(): string {
  const s = process.env.SESSION_SECRET;
  if (s) {
    if (s.length < 32) throw new Error("SESSION_SECRET must be at least 32 characters long");
    return s;
  }
  if (process.env.NODE_ENV === "production") {
    throw new Error("SESSION_SECRET is not set: refusing to seal sessions with a development secret in production");
  }
  return DEV_SECRET;
}

function isLoopback(host: string | null): boolean {
  if (!host) return false;
  const h = host.replace(/:\d+$/, "").replace(/^\[|\]$/g, "");
  return h === "localhost" || h === "127.0.0.1" || h === "::1";
}

/**
 * Cookie flags: httpOnly, sameSite=lax, Secure in production. The one exception is plain http on a loopback
 * host (the start and test commands serve http://127.0.0.1), where a browser would drop a Secure cookie.
 */
export function sessionOptions(req?: { proto?: string | null; host?: string | null }): SessionOptions {
  const production = process.env.NODE_ENV === "production";
  const plainLoopback = req ? req.proto !== "https" && isLoopback(req.host ?? null) : false;
  // A TLS proxy that passes the upstream Host (127.0.0.1) and no X-Forwarded-Proto looks like plain loopback http:
  // QUELL_COOKIE_SECURE=1 makes the cookie Secure whatever the request looks like (0 never, for plain-http setups).
  const forced = process.env.QUELL_COOKIE_SECURE;
  const secure = forced === "1" ? true : forced === "0" ? false : production && !plainLoopback;
  return {
    cookieName: SESSION_COOKIE,
    password: sessionPassword(),
    ttl: SESSION_TTL_S,
    cookieOptions: { httpOnly: true, sameSite: "lax", secure, path: "/" },
  };
}

/** Reads the session out of a raw Cookie header (route handlers and tests: no Next request scope needed). */
export async function sessionFromCookieHeader(header: string | null): Promise<SessionData> {
  if (!header) return {};
  const pair = header
    .split(";")
    .map((p) => p.trim())
    .find((p) => p.startsWith(`${SESSION_COOKIE}=`));
  if (!pair) return {};
  try {
    // Inside the try: a malformed %-escape makes decodeURIComponent throw, and a bad cookie means "anonymous", not 500.
    const seal = decodeURIComponent(pair.slice(SESSION_COOKIE.length + 1));
    const data = await unsealData<SessionData>(seal, { password: sessionPassword(), ttl: SESSION_TTL_S });
    return data && typeof data === "object" ? data : {};
  } catch {
    return {};
  }
}
