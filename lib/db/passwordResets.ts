import "server-only";
import { db } from "./knex";
import { hashToken, randomToken } from "@/lib/shared/tokens";
import { updatePassword } from "./users";
import { audit } from "./audit";
import { DomainError } from "@/lib/errors";

/** How long a password-reset link stays valid, ms (1 hour). */
export const RESET_TTL_MS = 60 * 60 * 1000;

/** Reset e-mails one account may receive per hour (a flood guard; beyond it the request is quietly dropped). */
export const MAX_RESETS_PER_HOUR = 3;

/** How many reset links were issued for the user in the last hour. */
export async function recentResetCount(userId: string): Promise<number> {
  const [{ n }] = await db()("password_resets")
    .where({ user_id: userId })
    .where("created_at", ">", new Date(Date.now() - 3600_000))
    .count<{ n: string }[]>({ n: "*" });
  return Number(n);
}

/** Issues a single-use reset token for a user; only its hash is stored. Earlier unused tokens stop working. */
export async function createPasswordReset(userId: string): Promise<string> {
  const token = await createPasswordResetWithin(userId, Infinity);
  return token!;
}

/**
 * The same, unless the user already had `maxPerHour` links issued in the last hour (then null, nothing written).
 * The count and the insert happen under a per-user lock, so simultaneous requests cannot all pass a count that
 * none of them has added to yet.
 */
export async function createPasswordResetWithin(userId: string, maxPerHour: number): Promise<string | null> {
  const token = randomToken();
  const issued = await db().transaction(async (trx) => {
    await trx.raw("select pg_advisory_xact_lock(hashtext(?))", [`password-reset:${userId}`]);
    const [{ n }] = await trx("password_resets")
      .where({ user_id: userId })
      .where("created_at", ">", new Date(Date.now() - 3600_000))
      .count<{ n: string }[]>({ n: "*" });
    if (Number(n) >= maxPerHour) return false;
    await trx("password_resets").where({ user_id: userId }).whereNull("used_at").update({ used_at: trx.fn.now() });
    await trx("password_resets").insert({ user_id: userId, token_hash: hashToken(token), expires_at: new Date(Date.now() + RESET_TTL_MS) });
    return true;
  });
  return issued ? token : null;
}

export type ResetTokenState = "valid" | "used" | "expired" | "unknown";

export async function resetTokenState(token: string): Promise<ResetTokenState> {
  if (!token || token.length > 200) return "unknown";
  const r = await db()("password_resets").where({ token_hash: hashToken(token) }).first();
  if (!r) return "unknown";
  if (r.used_at) return "used";
  if (new Date(r.expires_at).getTime() <= Date.now()) return "expired";
  return "valid";
}

/**
 * Uses a reset token: under a row lock, checks it is unused and unexpired, sets the new password hash, marks the
 * token used and bumps the session version (every existing session ends). Returns the user id.
 */
export async function consumePasswordReset(token: string, passwordHash: string): Promise<{ userId: string; sessionVersion: number }> {
  return db().transaction(async (trx) => {
    const r = await trx("password_resets").where({ token_hash: hashToken(token) }).forUpdate().first();
    if (!r) throw new DomainError(404, "This reset link is not valid. Ask for a new one.");
    if (r.used_at) throw new DomainError(410, "This reset link has been used already. Ask for a new one.");
    if (new Date(r.expires_at).getTime() <= Date.now()) throw new DomainError(410, "This reset link has expired. Ask for a new one.");
    await trx("password_resets").where({ id: r.id }).update({ used_at: trx.fn.now() });
    const sessionVersion = await updatePassword(r.user_id, passwordHash, trx);
    await audit({ teamId: null, actorId: r.user_id, action: "user.password_reset", subjectType: "user", subjectId: r.user_id }, trx);
    return { userId: r.user_id as string, sessionVersion };
  });
}
