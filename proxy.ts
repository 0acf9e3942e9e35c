import { NextResponse, type NextRequest } from "next/server";
import { databaseUp } from "@/lib/db/knex";
import { DATABASE_UNAVAILABLE, RETRY_AFTER_S } from "@/lib/db/outage";

/** The plain answer to a page request or form post from another site. */
export const CROSS_ORIGIN_REFUSED = "Cross-origin request refused: forms and actions of Quell can only be sent from Quell's own pages.";

/**
 * True for a POST (a server action or a form post, e.g. sign-in) whose Origin is another site than the one it was
 * sent to. Next refuses these too, but by throwing, which answers 500; here they get a plain 403 first. A request
 * without Origin passes (Next's own check treats it the same way; browsers send Origin on every cross-site POST).
 */
export function crossOriginPost(request: NextRequest): boolean {
  if (request.method !== "POST") return false;
  const origin = request.headers.get("origin");
  if (origin === null) return false;
  const host = request.headers.get("x-forwarded-host")?.split(",")[0]?.trim() || request.headers.get("host");
  try {
    return new URL(origin).host !== host;
  } catch {
    return true; // "null" (sandboxed frames, file: pages) or garbage
  }
}

function databaseUnavailablePage(): NextResponse {
  const html = `<!doctype html><html lang="en"><head><meta charset="utf-8"><title>Quell · try again</title></head><body style="font-family:system-ui,sans-serif;background:#F7F5F0;color:#1C2430;padding:4rem 2rem"><main style="max-width:36rem;margin:auto"><h1 style="font-size:1.4rem">${DATABASE_UNAVAILABLE}</h1><p style="color:#5B6472">Nothing you sent was lost on our side; reload this page in a few seconds.</p></main></body></html>`;
  return new NextResponse(html, {
    status: 503,
    headers: { "content-type": "text/html; charset=utf-8", "retry-after": String(RETRY_AFTER_S), "cache-control": "no-store" },
  });
}

/**
 * Runs before every page and server action (route handlers under /api check for themselves):
 * - a cross-origin POST is refused with 403 and a plain message;
 * - when PostgreSQL does not answer, the request gets 503 "the database is unavailable, try again" with Retry-After
 *   (every page and action needs the database, and a status cannot be changed once a page has started streaming);
 * - the requested path goes on to pages (x-quell-path) so a sign-in redirect can come back to it.
 * It gates nothing else: every page, route handler and server action checks the session itself.
 */
export async function proxy(request: NextRequest) {
  // Chromium still asks for /favicon.ico now and then (e.g. after a client-side navigation): answer with the app icon.
  if (request.nextUrl.pathname === "/favicon.ico") return NextResponse.rewrite(new URL("/icon.svg", request.url));
  if (crossOriginPost(request)) {
    return new NextResponse(CROSS_ORIGIN_REFUSED, { status: 403, headers: { "content-type": "text/plain; charset=utf-8", "cache-control": "no-store" } });
  }
  if (!(await databaseUp())) return databaseUnavailablePage();
  const headers = new Headers(request.headers);
  headers.set("x-quell-path", request.nextUrl.pathname + request.nextUrl.search);
  const res = NextResponse.next({ request: { headers } });
  // Pages are never shown inside another site's frame (clickjacking of Save, Share, Validate, role changes…).
  res.headers.set("x-frame-options", "DENY");
  res.headers.set("content-security-policy", "frame-ancestors 'none'");
  res.headers.set("x-content-type-options", "nosniff");
  return res;
}

export const config = {
  matcher: ["/((?!api/|_next/|icon.svg).*)"],
};
