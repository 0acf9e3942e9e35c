import "server-only";
import { z, type ZodType } from "zod";
import { ApiError } from "./errors";
import { readLimitedBytes } from "./body";
import { DomainError, fieldErrors } from "@/lib/errors";
import { sessionFromCookieHeader } from "@/lib/auth/session-config";
import { userFromSession } from "@/lib/db/sessions";
import { databaseUnavailableResponse, isDatabaseUnavailable, isUnstorableText } from "@/lib/db/outage";
import { roleAtLeast, type CurrentUser, type Role } from "@/lib/shared/roles";

export { ApiError, fieldErrors };

/** Default largest accepted request body, bytes. */
export const DEFAULT_MAX_BODY_BYTES = 256 * 1024;

export function json(data: unknown, status = 200, headers?: HeadersInit): Response {
  return Response.json(data, { status, headers: { "cache-control": "no-store", ...headers } });
}

/** The user behind a request's session cookie (no Next request scope needed: tests call handlers directly). */
export async function userFromRequest(req: Request): Promise<CurrentUser | null> {
  return userFromSession(await sessionFromCookieHeader(req.headers.get("cookie")));
}


async function readBody(req: Request, maxBytes: number): Promise<string> {
  const bytes = await readLimitedBytes(req, maxBytes);
  if (!bytes) throw new ApiError(413, `Request body over ${maxBytes} bytes.`);
  return new TextDecoder().decode(bytes);
}

/** Mutating requests from another origin are refused (cookies are sameSite=lax, this is the second fence). */
function crossOrigin(req: Request): boolean {
  if (req.method === "GET" || req.method === "HEAD") return false;
  const origin = req.headers.get("origin");
  if (!origin) return false;
  const host = req.headers.get("x-forwarded-host") ?? req.headers.get("host");
  try {
    return new URL(origin).host !== host;
  } catch {
    return true;
  }
}

type Infer<T> = T extends ZodType ? z.output<T> : undefined;

export interface ApiContext<P, B, Q> {
  user: CurrentUser;
  params: P;
  body: B;
  query: Q;
  req: Request;
}

export interface ApiOptions<B extends ZodType | undefined, Q extends ZodType | undefined> {
  /** Least role allowed; any member of the current team when absent. */
  role?: Role;
  body?: B;
  query?: Q;
  /** Largest body, bytes (default 256 KiB); larger gets 413. */
  maxBodyBytes?: number;
}

/**
 * The one wrapper of every route handler. Order: session (401 before the body or params are read) → role (403)
 * → origin → query (400) → body size (413) → JSON and schema (400 with field errors) → handler. Errors:
 * ApiError/DomainError keep their status; a database outage is 503 with Retry-After; anything else is logged and
 * answered 500 without details.
 * A handler returns a Response, or an object sent as 200 JSON.
 */
export function apiRoute<P = Record<string, never>, B extends ZodType | undefined = undefined, Q extends ZodType | undefined = undefined>(
  opts: ApiOptions<B, Q>,
  fn: (ctx: ApiContext<P, Infer<B>, Infer<Q>>) => Promise<Response | object>,
): (req: Request, ctx: { params: Promise<P> }) => Promise<Response> {
  return async (req, ctx) => {
    try {
      const user = await userFromRequest(req);
      if (!user) return json({ error: "Sign in to continue." }, 401);
      if (opts.role && !roleAtLeast(user.role, opts.role)) {
        return json({ error: `This needs the ${opts.role} role or higher in ${user.teamName}.` }, 403);
      }
      if (crossOrigin(req)) return json({ error: "Cross-origin request refused." }, 403);
      let query: unknown = undefined;
      if (opts.query) {
        const raw = Object.fromEntries(new URL(req.url).searchParams);
        const parsed = opts.query.safeParse(raw);
        if (!parsed.success) return json({ error: "Invalid query string.", fieldErrors: fieldErrors(parsed.error) }, 400);
        query = parsed.data;
      }
      let body: unknown = undefined;
      if (opts.body) {
        const text = await readBody(req, opts.maxBodyBytes ?? DEFAULT_MAX_BODY_BYTES);
        let data: unknown;
        try {
          data = text ? JSON.parse(text) : {};
        } catch {
          return json({ error: "The body is not valid JSON." }, 400);
        }
        const parsed = opts.body.safeParse(data);
        if (!parsed.success) return json({ error: "Invalid request body.", fieldErrors: fieldErrors(parsed.error) }, 400);
        body = parsed.data;
      }
      const params = (ctx?.params ? await ctx.params : {}) as P;
      const out = await fn({ user, params, body: body as Infer<B>, query: query as Infer<Q>, req });
      return out instanceof Response ? out : json(out);
    } catch (e) {
      if (e instanceof ApiError) return json({ error: e.message, ...(e.fieldErrors ? { fieldErrors: e.fieldErrors } : {}) }, e.status);
      if (e instanceof DomainError) return json({ error: e.message }, e.status);
      if (isDatabaseUnavailable(e)) return databaseUnavailableResponse();
      if (isUnstorableText(e)) return json({ error: "The request holds a control character (such as NUL) that cannot be stored." }, 400);
      console.error("[api]", req.method, new URL(req.url).pathname, e);
      return json({ error: "Something went wrong on the server." }, 500);
    }
  };
}
