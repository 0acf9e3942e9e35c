import "server-only";
import { db } from "./knex";
import { findUserById, isUuid, resolveCurrentUser, type UserRow } from "./users";
import type { CurrentUser } from "@/lib/shared/roles";

/**
 * Server-side session rows (table `sessions`). The sealed cookie names a row; the row's existence is what keeps a
 * session alive, so sign-out ends it for every copy of the cookie. Everything lives in PostgreSQL: any instance
 * behind a load balancer sees the same sessions.
 */

/** Starts a session row for the user, valid for `ttlS` seconds; returns its id (kept in the sealed cookie). */
export async function createSessionRow(userId: string, ttlS: number): Promise<string> {
  const [r] = await db()("sessions")
    .insert({ user_id: userId, expires_at: new Date(Date.now() + ttlS * 1000) })
    .returning("id");
  if (Math.random() < 0.02) await pruneSessions();
  return String(r.id);
}

/** True while the session row exists for this user and has not expired. */
export async function sessionRowActive(sessionId: unknown, userId: string): Promise<boolean> {
  if (!isUuid(sessionId) || !isUuid(userId)) return false;
  const r = await db()("sessions").where({ id: sessionId, user_id: userId }).where("expires_at", ">", new Date()).first("id");
  return !!r;
}

/** Ends one session (sign-out). */
export async function endSessionRow(sessionId: unknown): Promise<void> {
  if (!isUuid(sessionId)) return;
  await db()("sessions").where({ id: sessionId }).delete();
}

/** Ends every session of a user ("sign out everywhere"); returns how many ended. */
export async function endAllSessionRows(userId: string): Promise<number> {
  if (!isUuid(userId)) return 0;
  return db()("sessions").where({ user_id: userId }).delete();
}

/** Drops expired rows (called now and then when a session starts; the table stays small). */
export async function pruneSessions(now = new Date()): Promise<void> {
  await db()("sessions").where("expires_at", "<=", now).delete();
}

/** The user behind a session's data, in their team: null unless the session row is alive (see resolveCurrentUser). */
export async function userFromSession(s: { userId?: string; teamId?: string; sv?: number; sid?: string }): Promise<CurrentUser | null> {
  if (!s.userId || !(await sessionRowActive(s.sid, s.userId))) return null;
  return resolveCurrentUser(s.userId, s.teamId, s.sv);
}

/** The account behind a live session whether or not it belongs to a team; null when ended or stale. */
export async function accountFromSession(s: { userId?: string; sv?: number; sid?: string }): Promise<UserRow | null> {
  if (!s.userId || !(await sessionRowActive(s.sid, s.userId))) return null;
  const u = await findUserById(s.userId);
  if (!u || (s.sv !== undefined && s.sv !== u.sessionVersion)) return null;
  return u;
}
