import "server-only";
import { db } from "@/lib/db/knex";
import { findUserByEmail, insertUser, normaliseEmail, findUserById, type UserRow } from "@/lib/db/users";
import { acceptInvitationIn, createTeam } from "@/lib/db/teams";
import { audit } from "@/lib/db/audit";
import { DomainError } from "@/lib/errors";
import { beginAttempt, markAttemptSucceeded, dropAttempt, recentFailures, pruneAttempts, MAX_FAILURES_PER_ACCOUNT, MAX_FAILURES_PER_ADDRESS } from "@/lib/db/signInAttempts";
import { createPasswordResetWithin, consumePasswordReset, MAX_RESETS_PER_HOUR, RESET_TTL_MS } from "@/lib/db/passwordResets";
import { hashPassword, verifyPassword, verifyAgainstNothing } from "./password";
import { hashToken, publicBaseUrl } from "@/lib/shared/tokens";
import { sendMail } from "@/lib/mail/transport";
import { passwordResetMail } from "@/lib/mail/messages";

/** The one text for a refused sign-in: it never tells whether the account exists. */
export const SIGN_IN_REFUSED = "That e-mail and password do not match an account.";
export const SIGN_IN_THROTTLED = "Too many failed sign-ins. Wait 15 minutes or reset your password.";

export type SignInResult = { ok: true; user: UserRow } | { ok: false; throttled: boolean; message: string };

/**
 * Checks an e-mail and password. Refuses with the same text whether or not the account exists, spends the same
 * bcrypt time either way, and stops after too many failures per account or per client address (counted in
 * PostgreSQL; the throttle applies before the password is even compared).
 */
export async function signInWithPassword(email: string, password: string, clientAddress: string): Promise<SignInResult> {
  const account = normaliseEmail(email);
  // Recorded (as a failure) before counting, so concurrent guesses cannot all slip under the limit.
  const attempt = await beginAttempt(account, clientAddress);
  const failures = await recentFailures(account, clientAddress);
  if (failures.account > MAX_FAILURES_PER_ACCOUNT || failures.address > MAX_FAILURES_PER_ADDRESS) {
    await dropAttempt(attempt);
    return { ok: false, throttled: true, message: SIGN_IN_THROTTLED };
  }
  const user = await findUserByEmail(account);
  const good = user ? await verifyPassword(password, user.passwordHash) : await verifyAgainstNothing(password);
  if (good) await markAttemptSucceeded(attempt);
  if (Math.random() < 0.02) await pruneAttempts();
  if (!good || !user) return { ok: false, throttled: false, message: SIGN_IN_REFUSED };
  return { ok: true, user };
}

/** Sign-up: a new account and a new team of which it is the first member, hence the lead. */
export async function signUp(p: { name: string; email: string; password: string; teamName: string }): Promise<{ user: UserRow; teamId: string }> {
  const passwordHash = await hashPassword(p.password);
  try {
    return await db().transaction(async (trx) => {
      const user = await insertUser({ email: normaliseEmail(p.email), name: p.name, passwordHash }, trx);
      const team = await createTeam(p.teamName, user.id, trx);
      await audit({ teamId: team.id, actorId: user.id, action: "user.sign_up", subjectType: "user", subjectId: user.id }, trx);
      return { user, teamId: team.id };
    });
  } catch (e) {
    if (e instanceof Error && /users_email_lower/.test(e.message)) {
      throw new DomainError(409, "This address cannot be used to sign up. If it is yours, sign in or reset your password.");
    }
    throw e;
  }
}

/** Creates an account for someone who follows an invitation link (no team of their own). */
export async function createInvitedAccount(p: { name: string; email: string; password: string }): Promise<UserRow> {
  const passwordHash = await hashPassword(p.password);
  try {
    return await insertUser({ email: normaliseEmail(p.email), name: p.name, passwordHash });
  } catch (e) {
    if (e instanceof Error && /users_email_lower/.test(e.message)) {
      throw new DomainError(409, "An account with this address exists: sign in to accept the invitation.");
    }
    throw e;
  }
}

/**
 * Creates the account of someone following an invitation link and accepts the invitation, in one transaction: when
 * the invitation was revoked, used or expired in the meantime, no team-less account is left behind. The address is
 * the invitation's own.
 */
export async function createAccountFromInvitation(token: string, p: { name: string; password: string }): Promise<{ user: UserRow; teamId: string }> {
  const passwordHash = await hashPassword(p.password);
  try {
    return await db().transaction(async (trx) => {
      const inv = await trx("invitations").where({ token_hash: hashToken(token) }).first("email");
      if (!inv) throw new DomainError(404, "This invitation link is not valid.");
      const user = await insertUser({ email: normaliseEmail(inv.email), name: p.name, passwordHash }, trx);
      const { teamId } = await acceptInvitationIn(trx, token, user.id);
      return { user, teamId };
    });
  } catch (e) {
    if (e instanceof Error && /users_email_lower/.test(e.message)) {
      throw new DomainError(409, "An account with this address exists: sign in to accept the invitation.");
    }
    throw e;
  }
}

/**
 * Sends a reset link when the address has an account; does nothing visible otherwise (the caller shows the same
 * confirmation either way). Returns whether a message was sent, for tests only.
 */
export async function requestPasswordReset(email: string): Promise<boolean> {
  const user = await findUserByEmail(email);
  if (!user) {
    await verifyAgainstNothing("timing");
    return false;
  }
  const token = await createPasswordResetWithin(user.id, MAX_RESETS_PER_HOUR);
  if (!token) return false;
  const link = `${publicBaseUrl()}/reset-password?token=${encodeURIComponent(token)}`;
  await sendMail(passwordResetMail({ to: user.email, link, expiresAt: new Date(Date.now() + RESET_TTL_MS) }));
  return true;
}

/** Sets a new password from a reset token; returns the user and the new session version. */
export async function resetPassword(token: string, newPassword: string): Promise<{ user: UserRow; sessionVersion: number }> {
  const { userId, sessionVersion } = await consumePasswordReset(token, await hashPassword(newPassword));
  const user = await findUserById(userId);
  if (!user) throw new DomainError(404, "This account no longer exists.");
  return { user, sessionVersion };
}
