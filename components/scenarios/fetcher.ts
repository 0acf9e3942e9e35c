import { formatRelative } from "@/lib/shared/dates";
/** SWR fetcher and JSON mutation helper for the REST API: errors carry the server's message and status. */
export class FetchError extends Error {
  constructor(
    public readonly status: number,
    message: string,
    public readonly data?: unknown,
  ) {
    super(message);
    this.name = "FetchError";
  }
}

async function parse<T>(r: Response): Promise<T> {
  if (r.status === 204) return undefined as T;
  const data = (await r.json().catch(() => ({}))) as { error?: string };
  if (!r.ok) throw new FetchError(r.status, data.error ?? `The server answered ${r.status}.`, data);
  return data as T;
}

export async function fetcher<T>(url: string): Promise<T> {
  return parse<T>(await fetch(url, { headers: { accept: "application/json" } }));
}

export async function send<T>(url: string, method: "POST" | "PATCH" | "DELETE", body?: unknown): Promise<T> {
  return parse<T>(
    await fetch(url, {
      method,
      headers: body === undefined ? undefined : { "content-type": "application/json" },
      body: body === undefined ? undefined : JSON.stringify(body),
    }),
  );
}

/** Relative time for tables: "3 min ago", "2 days ago" (lib/shared/dates); the full time goes in a title attribute. */
export function ago(iso: string, now = Date.now()): string {
  return formatRelative(iso, now);
}
