import "server-only";
import { db } from "./knex";

/** Window over which failed sign-ins are counted, ms (15 minutes). */
export const ATTEMPT_WINDOW_MS = 15 * 60 * 1000;
/** Failed sign-ins allowed per account within the window. */
export const MAX_FAILURES_PER_ACCOUNT = 5;
/** Failed sign-ins allowed per client address within the window (several people may share one address). */
export const MAX_FAILURES_PER_ADDRESS = 20;

export async function recordAttempt(account: string, clientAddress: string, succeeded: boolean): Promise<void> {
  await db()("sign_in_attempts").insert({ account, client_address: clientAddress, succeeded });
}

/**
 * Records an attempt as failed before its password is compared, and returns its id. Counting after this insert
 * (rather than checking, comparing, then recording) closes the race where many concurrent guesses all read the
 * count before any of them was recorded: whichever attempt commits last sees every earlier one.
 */
export async function beginAttempt(account: string, clientAddress: string): Promise<string> {
  const [r] = await db()("sign_in_attempts").insert({ account, client_address: clientAddress, succeeded: false }).returning("id");
  return String(r.id);
}

/** The password matched: the attempt counts as a success (which clears the account's failure count). */
export async function markAttemptSucceeded(id: string): Promise<void> {
  await db()("sign_in_attempts").where({ id }).update({ succeeded: true });
}

/** A throttled attempt never reached the password check: it is not counted (a locked-out user's retries do not extend the lock). */
export async function dropAttempt(id: string): Promise<void> {
  await db()("sign_in_attempts").where({ id }).delete();
}

/**
 * Failed sign-ins in the window: for the account since its last success, and for the client address (a success
 * does not clear the address count, or signing into one's own account would reset it). Counted in PostgreSQL so
 * every server instance sees the same numbers.
 */
export async function recentFailures(account: string, clientAddress: string, now = new Date()): Promise<{ account: number; address: number }> {
  const since = new Date(now.getTime() - ATTEMPT_WINDOW_MS);
  const [a] = await db()("sign_in_attempts")
    .where({ account, succeeded: false })
    .where("created_at", ">", since)
    .whereRaw(
      "created_at > coalesce((select max(created_at) from sign_in_attempts where account = ? and succeeded), '-infinity'::timestamptz)",
      [account],
    )
    .count<{ n: string }[]>({ n: "*" });
  const [b] = await db()("sign_in_attempts")
    .where({ client_address: clientAddress, succeeded: false })
    .where("created_at", ">", since)
    .count<{ n: string }[]>({ n: "*" });
  return { account: Number(a?.n ?? 0), address: Number(b?.n ?? 0) };
}

/** Drops attempts older than a day (called now and then on sign-in; the table stays small). */
export async function pruneAttempts(now = new Date()): Promise<void> {
  await db()("sign_in_attempts").where("created_at", "<", new Date(now.getTime() - 24 * 3600 * 1000)).delete();
}
