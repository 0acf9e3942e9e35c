import { NextResponse, type NextRequest } from "next/server";

/**
 * Only passes the requested path on to pages (x-quell-path) so a sign-in redirect can come back to it.
 * It gates nothing: every page, route handler and server action checks the session itself.
 */
export function proxy(request: NextRequest) {
  const headers = new Headers(request.headers);
  headers.set("x-quell-path", request.nextUrl.pathname + request.nextUrl.search);
  return NextResponse.next({ request: { headers } });
}

export const config = {
  matcher: ["/((?!api/|_next/|icon.svg|favicon.ico).*)"],
};
