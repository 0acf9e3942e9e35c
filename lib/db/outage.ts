/**
 * Recognising a database outage (as opposed to a bug), so every route, page and action can answer 503 "try again"
 * instead of a generic 500. No server-only marker: the proxy and the route wrapper both use it.
 */

/** What the user reads when PostgreSQL cannot be reached. */
export const DATABASE_UNAVAILABLE = "The database is unavailable, try again.";
/** Retry-After sent with a 503, s. */
export const RETRY_AFTER_S = 5;

/** Socket-level failures reaching the server. */
const NETWORK_CODES = new Set(["ECONNREFUSED", "ECONNRESET", "ETIMEDOUT", "EHOSTUNREACH", "ENETUNREACH", "ENOTFOUND", "EAI_AGAIN", "EPIPE"]);
/**
 * PostgreSQL SQLSTATEs meaning "the server is not there for you now" (PostgreSQL manual, appendix A): class 08
 * connection exceptions, 57P01–57P03 shutdown / cannot connect now, 53300 too many connections.
 */
const PG_CODES = new Set(["57P01", "57P02", "57P03", "53300"]);

/** True when the error says PostgreSQL could not be reached or dropped the connection. */
export function isDatabaseUnavailable(e: unknown, depth = 0): boolean {
  if (!e || typeof e !== "object" || depth > 3) return false;
  const err = e as { code?: unknown; name?: unknown; message?: unknown; errors?: unknown; cause?: unknown };
  const code = typeof err.code === "string" ? err.code : "";
  if (NETWORK_CODES.has(code) || PG_CODES.has(code) || /^08[0-9A-Z]{3}$/.test(code)) return true;
  // Knex could not get a pooled connection in time (the pool keeps failing to connect).
  if (err.name === "KnexTimeoutError") return true;
  const message = typeof err.message === "string" ? err.message : "";
  if (/Connection terminated|connect ECONNREFUSED|Client has encountered a connection error/i.test(message)) return true;
  if (Array.isArray(err.errors) && err.errors.some((x) => isDatabaseUnavailable(x, depth + 1))) return true;
  return isDatabaseUnavailable(err.cause, depth + 1);
}

/**
 * True when PostgreSQL refused text it cannot store (22021: NUL in text; 22P05: \u0000 in jsonb). Inputs are
 * checked before they reach the database; this is the net behind those checks (e.g. a CSV header with a NUL).
 */
export function isUnstorableText(e: unknown): boolean {
  const code = e && typeof e === "object" ? (e as { code?: unknown }).code : undefined;
  return code === "22021" || code === "22P05";
}

/** The 503 answer of an API route during an outage. */
export function databaseUnavailableResponse(): Response {
  return Response.json({ error: DATABASE_UNAVAILABLE }, { status: 503, headers: { "retry-after": String(RETRY_AFTER_S), "cache-control": "no-store" } });
}
