import "server-only";
import { mailSettings } from "./transport";

/**
 * The development outbox shows what the local SMTP fake received. On only while mail goes to a loopback host
 * (the fake), and never when QUELL_DEV_OUTBOX=0; a real relay turns it off.
 */
export function devOutboxEnabled(): boolean {
  if (process.env.QUELL_DEV_OUTBOX === "0") return false;
  const host = mailSettings().host;
  return host === "127.0.0.1" || host === "localhost" || host === "::1";
}
