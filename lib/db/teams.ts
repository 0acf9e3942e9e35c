import "server-only";
import type { Knex } from "knex";
import { db } from "./knex";
import { audit } from "./audit";
import { DomainError } from "@/lib/errors";
import { isUuid, normaliseEmail } from "./users";
import { hashToken, randomToken } from "@/lib/shared/tokens";
import type { CurrentUser, Role } from "@/lib/shared/roles";

export { DomainError };

/** How long an invitation link stays valid, ms (7 days). */
export const INVITATION_TTL_MS = 7 * 24 * 3600 * 1000;
/** Invitations a team may send per hour (each one is an e-mail: a flood guard, counted in PostgreSQL). */
export const MAX_INVITATIONS_PER_HOUR = 30;

export async function createTeam(name: string, leadUserId: string, trx: Knex | Knex.Transaction = db()) {
  const [team] = await trx("teams").insert({ name: name.trim() }).returning("*");
  await trx("memberships").insert({ team_id: team.id, user_id: leadUserId, role: "lead" });
  await trx("users").where({ id: leadUserId }).update({ current_team_id: team.id });
  await audit({ teamId: team.id, actorId: leadUserId, action: "team.create", subjectType: "team", subjectId: team.id }, trx);
  return { id: team.id as string, name: team.name as string };
}

export interface Member {
  userId: string;
  name: string;
  email: string;
  role: Role;
  joinedAt: string;
}

export async function listMembers(teamId: string): Promise<Member[]> {
  const rows = await db()("memberships as m")
    .join("users as u", "u.id", "m.user_id")
    .where("m.team_id", teamId)
    .orderBy("u.name")
    .select("u.id", "u.name", "u.email", "m.role", "m.created_at");
  return rows.map((r) => ({ userId: r.id, name: r.name, email: r.email, role: r.role, joinedAt: new Date(r.created_at).toISOString() }));
}

/**
 * Serialises a team's membership changes. Locking the target row and then every lead row let two leads demoting
 * (or removing) each other at once each hold the row the other needed: PostgreSQL broke the deadlock by failing one
 * request with a server error. Taken first, this lock makes the second change wait and then see the first one.
 */
async function lockTeamMemberships(trx: Knex.Transaction, teamId: string): Promise<void> {
  await trx.raw("select pg_advisory_xact_lock(hashtext(?))", [`memberships:${teamId}`]);
}

/** The actor's role was read before the lock: a lead demoted meanwhile by another lead may no longer act as one. */
async function actorStillLeads(trx: Knex.Transaction, actor: CurrentUser): Promise<void> {
  const me = await trx("memberships").where({ team_id: actor.teamId, user_id: actor.id }).first("role");
  if (me?.role !== "lead") throw new DomainError(403, "Only a lead can change the team's members.");
}

async function leadCount(trx: Knex.Transaction, teamId: string): Promise<number> {
  const rows = await trx("memberships").where({ team_id: teamId, role: "lead" }).forUpdate().select("user_id");
  return rows.length;
}

/** A lead changes a member's role; the team always keeps at least one lead. */
export async function changeRole(actor: CurrentUser, userId: string, role: Role): Promise<Member> {
  if (actor.role !== "lead") throw new DomainError(403, "Only a lead can change roles.");
  if (!isUuid(userId)) throw new DomainError(404, "No such member.");
  return db().transaction(async (trx) => {
    await lockTeamMemberships(trx, actor.teamId);
    await actorStillLeads(trx, actor);
    const m = await trx("memberships").where({ team_id: actor.teamId, user_id: userId }).forUpdate().first();
    if (!m) throw new DomainError(404, "No such member.");
    if (m.role === "lead" && role !== "lead" && (await leadCount(trx, actor.teamId)) <= 1) {
      throw new DomainError(409, "The team needs at least one lead: make someone else lead first.");
    }
    await trx("memberships").where({ team_id: actor.teamId, user_id: userId }).update({ role });
    await audit({ teamId: actor.teamId, actorId: actor.id, action: "member.role", subjectType: "user", subjectId: userId, detail: { from: m.role, to: role } }, trx);
    const u = await trx("users").where({ id: userId }).first();
    return { userId, name: u.name, email: u.email, role, joinedAt: new Date(m.created_at).toISOString() };
  });
}

/** A lead removes a member (not the last lead). */
export async function removeMember(actor: CurrentUser, userId: string): Promise<void> {
  if (actor.role !== "lead") throw new DomainError(403, "Only a lead can remove members.");
  if (!isUuid(userId)) throw new DomainError(404, "No such member.");
  await db().transaction(async (trx) => {
    await lockTeamMemberships(trx, actor.teamId);
    await actorStillLeads(trx, actor);
    const m = await trx("memberships").where({ team_id: actor.teamId, user_id: userId }).forUpdate().first();
    if (!m) throw new DomainError(404, "No such member.");
    if (m.role === "lead" && (await leadCount(trx, actor.teamId)) <= 1) {
      throw new DomainError(409, "The team needs at least one lead: make someone else lead first.");
    }
    await trx("memberships").where({ team_id: actor.teamId, user_id: userId }).delete();
    await trx("users").where({ id: userId, current_team_id: actor.teamId }).update({ current_team_id: null });
    await audit({ teamId: actor.teamId, actorId: actor.id, action: "member.remove", subjectType: "user", subjectId: userId }, trx);
  });
}

export interface Invitation {
  id: string;
  email: string;
  role: Role;
  invitedBy: string | null;
  expiresAt: string;
  createdAt: string;
  status: "pending" | "accepted" | "revoked" | "expired";
}

function invitationStatus(r: Record<string, any>, now = Date.now()): Invitation["status"] {
  if (r.accepted_at) return "accepted";
  if (r.revoked_at) return "revoked";
  if (new Date(r.expires_at).getTime() <= now) return "expired";
  return "pending";
}

function toInvitation(r: Record<string, any>): Invitation {
  return {
    id: r.id,
    email: r.email,
    role: r.role,
    invitedBy: r.inviter_name ?? null,
    expiresAt: new Date(r.expires_at).toISOString(),
    createdAt: new Date(r.created_at).toISOString(),
    status: invitationStatus(r),
  };
}

export async function listInvitations(teamId: string): Promise<Invitation[]> {
  const rows = await db()("invitations as i")
    .leftJoin("users as u", "u.id", "i.invited_by")
    .where("i.team_id", teamId)
    .orderBy("i.created_at", "desc")
    .limit(100)
    .select("i.*", "u.name as inviter_name");
  return rows.map(toInvitation);
}

/** A lead invites an address; returns the invitation and the one-time token for the e-mailed link. */
export async function createInvitation(actor: CurrentUser, email: string, role: Role): Promise<{ invitation: Invitation; token: string }> {
  if (actor.role !== "lead") throw new DomainError(403, "Only a lead can invite.");
  const address = normaliseEmail(email);
  return db().transaction(async (trx) => {
    // Serialise a team's invitations so the hourly count below cannot be raced past.
    await trx.raw("select pg_advisory_xact_lock(hashtext(?))", [`invitations:${actor.teamId}`]);
    const [{ n }] = await trx("invitations")
      .where({ team_id: actor.teamId })
      .where("created_at", ">", new Date(Date.now() - 3600_000))
      .count<{ n: string }[]>({ n: "*" });
    if (Number(n) >= MAX_INVITATIONS_PER_HOUR) {
      throw new DomainError(429, `This team has sent ${MAX_INVITATIONS_PER_HOUR} invitations in the last hour: try again later.`);
    }
    const member = await trx("memberships as m")
      .join("users as u", "u.id", "m.user_id")
      .where("m.team_id", actor.teamId)
      .whereRaw("lower(u.email) = ?", [address])
      .first("u.id");
    if (member) throw new DomainError(409, "That address already belongs to a member of this team.");
    // A new invitation replaces any pending one for the same address.
    await trx("invitations")
      .where({ team_id: actor.teamId })
      .whereRaw("lower(email) = ?", [address])
      .whereNull("accepted_at")
      .whereNull("revoked_at")
      .update({ revoked_at: trx.fn.now() });
    const token = randomToken();
    const [r] = await trx("invitations")
      .insert({
        team_id: actor.teamId,
        email: address,
        role,
        token_hash: hashToken(token),
        invited_by: actor.id,
        expires_at: new Date(Date.now() + INVITATION_TTL_MS),
      })
      .returning("*");
    await audit({ teamId: actor.teamId, actorId: actor.id, action: "invitation.create", subjectType: "invitation", subjectId: r.id, detail: { email: address, role } }, trx);
    return { invitation: toInvitation({ ...r, inviter_name: actor.name }), token };
  });
}

export async function revokeInvitation(actor: CurrentUser, id: string): Promise<void> {
  if (actor.role !== "lead") throw new DomainError(403, "Only a lead can revoke invitations.");
  if (!isUuid(id)) throw new DomainError(404, "No such invitation.");
  const n = await db()("invitations")
    .where({ id, team_id: actor.teamId })
    .whereNull("accepted_at")
    .whereNull("revoked_at")
    .update({ revoked_at: db().fn.now() });
  if (!n) throw new DomainError(404, "No such pending invitation.");
  await audit({ teamId: actor.teamId, actorId: actor.id, action: "invitation.revoke", subjectType: "invitation", subjectId: id });
}

export interface InvitationByToken {
  id: string;
  teamId: string;
  teamName: string;
  email: string;
  role: Role;
  status: Invitation["status"];
}

export async function findInvitationByToken(token: string): Promise<InvitationByToken | null> {
  if (!token || token.length > 200) return null;
  const r = await db()("invitations as i")
    .join("teams as t", "t.id", "i.team_id")
    .where("i.token_hash", hashToken(token))
    .first("i.*", "t.name as team_name");
  if (!r) return null;
  return { id: r.id, teamId: r.team_id, teamName: r.team_name, email: r.email, role: r.role, status: invitationStatus(r) };
}

/**
 * Accepts a pending invitation for a user whose address matches it: adds the membership (or keeps an existing
 * one) and makes the team their current one. Single use, checked under a row lock.
 */
export async function acceptInvitation(token: string, userId: string): Promise<{ teamId: string; role: Role }> {
  return db().transaction((trx) => acceptInvitationIn(trx, token, userId));
}

/** The same inside a caller's transaction (creating the account and accepting commit or fail together). */
export async function acceptInvitationIn(trx: Knex.Transaction, token: string, userId: string): Promise<{ teamId: string; role: Role }> {
  const inv = await trx("invitations").where({ token_hash: hashToken(token) }).forUpdate().first();
  if (!inv) throw new DomainError(404, "This invitation link is not valid.");
  const status = invitationStatus(inv);
  if (status !== "pending") throw new DomainError(410, `This invitation has been ${status === "accepted" ? "used already" : status}.`);
  const user = await trx("users").where({ id: userId }).first();
  if (!user || normaliseEmail(user.email) !== normaliseEmail(inv.email)) {
    throw new DomainError(403, "This invitation was sent to another address.");
  }
  await trx("memberships")
    .insert({ team_id: inv.team_id, user_id: userId, role: inv.role })
    .onConflict(["team_id", "user_id"])
    .ignore();
  await trx("invitations").where({ id: inv.id }).update({ accepted_at: trx.fn.now() });
  await trx("users").where({ id: userId }).update({ current_team_id: inv.team_id });
  await audit({ teamId: inv.team_id, actorId: userId, action: "invitation.accept", subjectType: "invitation", subjectId: inv.id }, trx);
  return { teamId: inv.team_id, role: inv.role };
}
