import "server-only";
import type { Knex } from "knex";
import { db } from "./knex";
import { isRole, type CurrentUser, type Role } from "@/lib/shared/roles";

export interface UserRow {
  id: string;
  email: string;
  name: string;
  passwordHash: string;
  sessionVersion: number;
  currentTeamId: string | null;
}

function toUser(r: Record<string, any>): UserRow {
  return {
    id: r.id,
    email: r.email,
    name: r.name,
    passwordHash: r.password_hash,
    sessionVersion: r.session_version,
    currentTeamId: r.current_team_id,
  };
}

export function normaliseEmail(email: string): string {
  return email.trim().toLowerCase();
}

export async function findUserByEmail(email: string, trx: Knex | Knex.Transaction = db()): Promise<UserRow | null> {
  const r = await trx("users").whereRaw("lower(email) = ?", [normaliseEmail(email)]).first();
  return r ? toUser(r) : null;
}

export async function findUserById(id: string, trx: Knex | Knex.Transaction = db()): Promise<UserRow | null> {
  if (!isUuid(id)) return null;
  const r = await trx("users").where({ id }).first();
  return r ? toUser(r) : null;
}

export function isUuid(s: unknown): s is string {
  return typeof s === "string" && /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i.test(s);
}

export async function insertUser(
  u: { email: string; name: string; passwordHash: string },
  trx: Knex | Knex.Transaction = db(),
): Promise<UserRow> {
  const [r] = await trx("users")
    .insert({ email: u.email.trim(), name: u.name.trim(), password_hash: u.passwordHash })
    .returning("*");
  return toUser(r);
}

/** Sets a new password hash and bumps the session version, which ends every existing session of the user. */
export async function updatePassword(userId: string, passwordHash: string, trx: Knex | Knex.Transaction = db()): Promise<number> {
  const [r] = await trx("users")
    .where({ id: userId })
    .update({ password_hash: passwordHash, session_version: trx.raw("session_version + 1") })
    .returning("session_version");
  return r.session_version;
}

export async function setCurrentTeam(userId: string, teamId: string): Promise<void> {
  await db()("users").where({ id: userId }).update({ current_team_id: teamId });
}

export interface TeamOfUser {
  teamId: string;
  teamName: string;
  role: Role;
}

/** Every team the user belongs to, by name. */
export async function teamsOfUser(userId: string): Promise<TeamOfUser[]> {
  if (!isUuid(userId)) return [];
  const rows = await db()("memberships as m")
    .join("teams as t", "t.id", "m.team_id")
    .where("m.user_id", userId)
    .orderBy("t.name")
    .select("t.id", "t.name", "m.role");
  return rows.map((r) => ({ teamId: r.id, teamName: r.name, role: r.role }));
}

/**
 * The user as the app sees them: their account plus the team they work in and their role there.
 * `teamId` is the session's team; when they no longer belong to it, their saved current team, then any team.
 * Null when the account is gone, the session version is stale (password reset), or they belong to no team.
 */
export async function resolveCurrentUser(userId: string, teamId?: string, sessionVersion?: number): Promise<CurrentUser | null> {
  const user = await findUserById(userId);
  if (!user) return null;
  if (sessionVersion !== undefined && sessionVersion !== user.sessionVersion) return null;
  const teams = await teamsOfUser(userId);
  const pick =
    teams.find((t) => t.teamId === teamId) ?? teams.find((t) => t.teamId === user.currentTeamId) ?? teams[0];
  if (!pick || !isRole(pick.role)) return null;
  return { id: user.id, email: user.email, name: user.name, teamId: pick.teamId, teamName: pick.teamName, role: pick.role };
}
