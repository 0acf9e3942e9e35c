import { NextResponse, type NextRequest } from "next/server";

/**
 * Passes the requested path on to pages (x-quell-path) so a sign-in redirect can come back to it.
 * It gates nothing: every page, route handler and server action checks the session itself.
 */
export function proxy(request: NextRequest) {
  // Chromium still asks for /favicon.ico now and then (e.g. after a client-side navigation): answer with the app icon.
  if (request.nextUrl.pathname === "/favicon.ico") return NextResponse.rewrite(new URL("/icon.svg", request.url));
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
