import "server-only";
import { db } from "./knex";
import { audit } from "./audit";
import { DomainError } from "@/lib/errors";
import { isUuid } from "./users";
import { scenarioRowInTeam } from "./scenarios";
import type { CurrentUser } from "@/lib/shared/roles";

export interface CommentRow {
  id: string;
  scenarioId: string;
  revisionId: string | null;
  revisionNumber: number | null;
  authorId: string;
  authorName: string;
  body: string;
  createdAt: string;
}

/** The scenario's comments, oldest first. Every member of the team may read them. */
export async function listComments(actor: CurrentUser, scenarioId: string): Promise<CommentRow[]> {
  await scenarioRowInTeam(db(), actor, scenarioId, { includeDeleted: true });
  const rows = await db()("comments as c")
    .join("users as u", "u.id", "c.author_id")
    .leftJoin("revisions as r", "r.id", "c.revision_id")
    .where("c.scenario_id", scenarioId)
    .orderBy("c.created_at", "asc")
    .limit(500)
    .select("c.*", "u.name as author_name", "r.number as revision_number");
  return rows.map((r) => ({
    id: r.id,
    scenarioId: r.scenario_id,
    revisionId: r.revision_id,
    revisionNumber: r.revision_number ?? null,
    authorId: r.author_id,
    authorName: r.author_name,
    body: r.body,
    createdAt: new Date(r.created_at).toISOString(),
  }));
}

/** Every member (viewers too) may comment, optionally on one revision of the scenario. */
export async function addComment(actor: CurrentUser, scenarioId: string, input: { body: string; revisionId?: string | null }): Promise<CommentRow> {
  const text = input.body.trim();
  if (!text) throw new DomainError(400, "body: write something first.");
  return db().transaction(async (trx) => {
    await scenarioRowInTeam(trx, actor, scenarioId);
    let revisionNumber: number | null = null;
    if (input.revisionId) {
      const rev = isUuid(input.revisionId) ? await trx("revisions").where({ id: input.revisionId, scenario_id: scenarioId }).first("number") : null;
      if (!rev) throw new DomainError(400, "revisionId: not a revision of this scenario.");
      revisionNumber = rev.number;
    }
    const [c] = await trx("comments")
      .insert({ scenario_id: scenarioId, revision_id: input.revisionId ?? null, author_id: actor.id, body: text })
      .returning("*");
    await audit({ teamId: actor.teamId, actorId: actor.id, action: "comment.add", subjectType: "scenario", subjectId: scenarioId, detail: { comment: c.id } }, trx);
    return {
      id: c.id,
      scenarioId,
      revisionId: c.revision_id,
      revisionNumber,
      authorId: actor.id,
      authorName: actor.name,
      body: c.body,
      createdAt: new Date(c.created_at).toISOString(),
    };
  });
}
