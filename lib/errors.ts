import type { z } from "zod";

/**
 * Thrown for expected refusals (query modules, the scenario-body check, the library workflow); route handlers and
 * actions map `status` to HTTP or to a message.
 */
export class DomainError extends Error {
  constructor(
    public readonly status: 400 | 403 | 404 | 409 | 410 | 413 | 429,
    message: string,
  ) {
    super(message);
    this.name = "DomainError";
  }
}

/** zod issues as `{ "field.path": ["message"] }`; the root is "_". */
export function fieldErrors(error: z.ZodError): Record<string, string[]> {
  const out: Record<string, string[]> = {};
  for (const issue of error.issues) {
    const key = issue.path.length ? issue.path.map(String).join(".") : "_";
    (out[key] ??= []).push(issue.message);
  }
  return out;
}
