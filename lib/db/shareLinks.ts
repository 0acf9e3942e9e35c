import "server-only";
import { db } from "./knex";
import { audit } from "./audit";
import { DomainError } from "@/lib/errors";
import { isUuid } from "./users";
import { ownsOrLeads, scenarioRowInTeam } from "./scenarios";
import { getRevisionUnchecked, type RevisionView } from "./revisions";
import { hashToken, randomToken } from "@/lib/shared/tokens";
import type { CurrentUser } from "@/lib/shared/roles";

/** Longest a public link may live, days. */
export const MAX_PUBLIC_LINK_DAYS = 90;

export interface ShareLinkRow {
  id: string;
  revisionId: string;
  revisionNumber: number;
  createdBy: string | null;
  expiresAt: string;
  revokedAt: string | null;
  createdAt: string;
  state: "active" | "revoked" | "expired";
}

function state(r: { revoked_at: unknown; expires_at: string | Date }, now = Date.now()): ShareLinkRow["state"] {
  if (r.revoked_at) return "revoked";
  if (new Date(r.expires_at).getTime() <= now) return "expired";
  return "active";
}

/** Public links of a scenario (tokens are not kept: only the hash; the URL is shown once, when created). */
export async function listShareLinks(actor: CurrentUser, scenarioId: string): Promise<ShareLinkRow[]> {
  await scenarioRowInTeam(db(), actor, scenarioId, { includeDeleted: true });
  const rows = await db()("share_links as l")
    .join("revisions as r", "r.id", "l.revision_id")
    .leftJoin("users as u", "u.id", "l.created_by")
    .where("l.scenario_id", scenarioId)
    .orderBy("l.created_at", "desc")
    .select("l.*", "r.number as revision_number", "u.name as creator");
  return rows.map((r) => ({
    id: r.id,
    revisionId: r.revision_id,
    revisionNumber: r.revision_number,
    createdBy: r.creator,
    expiresAt: new Date(r.expires_at).toISOString(),
    revokedAt: r.revoked_at ? new Date(r.revoked_at).toISOString() : null,
    createdAt: new Date(r.created_at).toISOString(),
    state: state(r),
  }));
}

/**
 * The owner or a lead publishes one revision read-only to anyone holding the link: a 256-bit random token,
 * stored as its SHA-256, valid for `days`. Returns the token once.
 */
export async function createPublicLink(
  actor: CurrentUser,
  scenarioId: string,
  input: { revisionId?: string; days: number },
): Promise<{ link: ShareLinkRow; token: string }> {
  return db().transaction(async (trx) => {
    const s = await scenarioRowInTeam(trx, actor, scenarioId);
    if (!ownsOrLeads(actor, s.owner_id)) throw new DomainError(403, "Only the owner or a lead can make a public link.");
    const revisionId = input.revisionId ?? s.current_revision_id;
    const rev = isUuid(revisionId) ? await trx("revisions").where({ id: revisionId, scenario_id: scenarioId }).first() : null;
    if (!rev) throw new DomainError(400, "revisionId: not a revision of this scenario.");
    const days = Math.min(Math.max(input.days, 1), MAX_PUBLIC_LINK_DAYS);
    const token = randomToken();
    const [l] = await trx("share_links")
      .insert({ scenario_id: scenarioId, revision_id: rev.id, created_by: actor.id, token_hash: hashToken(token), expires_at: new Date(Date.now() + days * 86400_000) })
      .returning("*");
    await audit({ teamId: actor.teamId, actorId: actor.id, action: "share_link.create", subjectType: "scenario", subjectId: scenarioId, detail: { link: l.id, revision: rev.number, days } }, trx);
    return {
      token,
      link: {
        id: l.id,
        revisionId: rev.id,
        revisionNumber: rev.number,
        createdBy: actor.name,
        expiresAt: new Date(l.expires_at).toISOString(),
        revokedAt: null,
        createdAt: new Date(l.created_at).toISOString(),
        state: "active",
      },
    };
  });
}

export async function revokePublicLink(actor: CurrentUser, scenarioId: string, linkId: string): Promise<void> {
  await db().transaction(async (trx) => {
    const s = await scenarioRowInTeam(trx, actor, scenarioId, { includeDeleted: true });
    if (!ownsOrLeads(actor, s.owner_id)) throw new DomainError(403, "Only the owner or a lead can revoke a public link.");
    if (!isUuid(linkId)) throw new DomainError(404, "No such link.");
    const n = await trx("share_links").where({ id: linkId, scenario_id: scenarioId }).whereNull("revoked_at").update({ revoked_at: trx.fn.now() });
    if (!n) throw new DomainError(404, "No such active link.");
    await audit({ teamId: actor.teamId, actorId: actor.id, action: "share_link.revoke", subjectType: "scenario", subjectId: scenarioId, detail: { link: linkId } }, trx);
  });
}

export type PublicLinkResult =
  | { state: "active"; revision: RevisionView; expiresAt: string }
  | { state: "revoked" | "expired" | "unknown" };

/** Opens a public link by its token: the revision when active, else why not. */
export async function openPublicLink(token: string): Promise<PublicLinkResult> {
  if (!token || token.length > 200) return { state: "unknown" };
  const l = await db()("share_links as l")
    .join("scenarios as s", "s.id", "l.scenario_id")
    .where("l.token_hash", hashToken(token))
    .first("l.*", "s.deleted_at");
  if (!l) return { state: "unknown" };
  const st = l.deleted_at ? "revoked" : state(l);
  if (st !== "active") return { state: st };
  const revision = await getRevisionUnchecked(l.revision_id);
  if (!revision) return { state: "unknown" };
  return { state: "active", revision, expiresAt: new Date(l.expires_at).toISOString() };
}
