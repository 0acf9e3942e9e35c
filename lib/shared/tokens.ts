import { createHash, randomBytes } from "node:crypto";

/** A URL-safe random token of 256 bits (at least 128 are required for share links and resets). */
export function randomToken(bytes = 32): string {
  return randomBytes(bytes).toString("base64url");
}

/** What the database keeps instead of the token: its SHA-256, hex. A leaked table does not leak usable links. */
export function hashToken(token: string): string {
  return createHash("sha256").update(token, "utf8").digest("hex");
}

/** Public base URL for links in e-mails. Never taken from the request's Host header (reset-link poisoning). */
export function publicBaseUrl(): string {
  const u = process.env.QUELL_PUBLIC_URL ?? process.env.QUELL_BASE_URL ?? `http://localhost:${process.env.PORT ?? "3000"}`;
  return u.replace(/\/+$/, "");
}
