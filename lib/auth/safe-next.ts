/**
 * Where to go after signing in: a path on this site, or /scenarios.
 *
 * Checking only that the text starts with "/" and not "//" let "/\t/evil.example" through: browsers drop tabs and
 * newlines while parsing a URL (WHATWG URL Standard, "basic URL parser": strip ASCII tab or newline), leaving
 * "//evil.example", another site. So the text is parsed as a URL against a placeholder origin, exactly as a browser
 * would, and kept only if it stays on that origin; what is returned is the parsed, normalised path.
 */
export function safeNext(next: unknown, fallback = "/scenarios"): string {
  if (typeof next !== "string" || next.length > 2000 || !next.startsWith("/")) return fallback;
  const placeholder = "http://quell.invalid";
  let url: URL;
  try {
    url = new URL(next, placeholder);
  } catch {
    return fallback;
  }
  if (url.origin !== placeholder) return fallback;
  const out = `${url.pathname}${url.search}${url.hash}`;
  return out.startsWith("/") && !out.startsWith("//") && !out.startsWith("/\\") ? out : fallback;
}
