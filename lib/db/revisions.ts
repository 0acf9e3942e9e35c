import "server-only";
import { db } from "./knex";
import { audit } from "./audit";
import { DomainError } from "@/lib/errors";
import { isUuid } from "./users";
import { scenarioRowInTeam, type CheckedScenarioBody } from "./scenarios";
import { roleAtLeast, type CurrentUser } from "@/lib/shared/roles";

export interface RevisionInfo {
  revisionId: string;
  number: number;
  body: unknown;
  author: string;
  createdAt: string;
}

export interface RevisionRow {
  id: string;
  scenarioId: string;
  number: number;
  parentId: string | null;
  authorId: string;
  authorName: string;
  note: string;
  createdAt: string;
}

export type SaveResult =
  | { ok: true; revisionId: string; number: number }
  | { ok: false; conflict?: { current: RevisionInfo }; message: string; retry?: true };

/**
 * Saves a new immutable revision on top of `baseRevisionId`. Optimistic concurrency: the scenario row is locked,
 * and when its current revision is no longer the base, nothing is written and the current revision comes back
 * as a conflict for the user to compare with theirs. The body is checked by the caller
 * (lib/scenarios/save.ts: saveRevision).
 */
export async function insertRevision(
  actor: CurrentUser,
  input: { scenarioId: string; baseRevisionId: string; note: string; body: CheckedScenarioBody },
): Promise<SaveResult> {
  if (!roleAtLeast(actor.role, "designer")) throw new DomainError(403, "Viewers cannot save scenarios.");
  const body = input.body;
  const note = input.note.trim().slice(0, 2000);
  return db().transaction(async (trx) => {
    const s = await scenarioRowInTeam(trx, actor, input.scenarioId, { forUpdate: true });
    if (s.current_revision_id !== input.baseRevisionId) {
      const cur = await trx("revisions as r")
        .join("users as u", "u.id", "r.author_id")
        .where("r.id", s.current_revision_id)
        .first("r.id", "r.number", "r.body", "r.created_at", "u.name");
      return {
        ok: false as const,
        message: cur
          ? `Revision ${cur.number} was saved by ${cur.name} after the one you started from. Compare, then save again on top of it.`
          : "The scenario changed since you opened it.",
        conflict: cur
          ? { current: { revisionId: cur.id, number: cur.number, body: cur.body, author: cur.name, createdAt: new Date(cur.created_at).toISOString() } }
          : undefined,
      };
    }
    const [{ max }] = await trx("revisions").where({ scenario_id: s.id }).max<{ max: number | null }[]>({ max: "number" });
    const number = (max ?? 0) + 1;
    const [rev] = await trx("revisions")
      .insert({ scenario_id: s.id, number, parent_id: input.baseRevisionId, author_id: actor.id, note, body: JSON.stringify(body) })
      .returning("id");
    await trx("scenarios").where({ id: s.id }).update({ current_revision_id: rev.id, updated_at: trx.fn.now(), template: body.template });
    await audit({ teamId: actor.teamId, actorId: actor.id, action: "revision.save", subjectType: "scenario", subjectId: s.id, detail: { number, note } }, trx);
    return { ok: true as const, revisionId: rev.id as string, number };
  });
}

/** Every revision of a team's scenario, newest first (bodies left out; fetch one with getRevision). */
export async function listRevisions(actor: CurrentUser, scenarioId: string): Promise<RevisionRow[]> {
  await scenarioRowInTeam(db(), actor, scenarioId, { includeDeleted: true });
  const rows = await db()("revisions as r")
    .join("users as u", "u.id", "r.author_id")
    .where("r.scenario_id", scenarioId)
    .orderBy("r.number", "desc")
    .select("r.id", "r.scenario_id", "r.number", "r.parent_id", "r.author_id", "r.note", "r.created_at", "u.name as author_name");
  return rows.map(toRevisionRow);
}

/** A revisions row (joined with its author's name) as the app sees it. */
function toRevisionRow(r: {
  id: string; scenario_id: string; number: number; parent_id: string | null; author_id: string;
  author_name: string; note: string; created_at: string | Date;
}): RevisionRow {
  return {
    id: r.id,
    scenarioId: r.scenario_id,
    number: r.number,
    parentId: r.parent_id,
    authorId: r.author_id,
    authorName: r.author_name,
    note: r.note,
    createdAt: new Date(r.created_at).toISOString(),
  };
}

export interface RevisionView extends RevisionRow {
  body: unknown;
  scenarioTitle: string;
  template: string;
  teamId: string;
  currentRevisionId: string | null;
  scenarioDeleted: boolean;
}

async function loadRevision(revisionId: string): Promise<RevisionView | null> {
  if (!isUuid(revisionId)) return null;
  const r = await db()("revisions as r")
    .join("scenarios as s", "s.id", "r.scenario_id")
    .join("users as u", "u.id", "r.author_id")
    .where("r.id", revisionId)
    .first("r.*", "u.name as author_name", "s.title", "s.template", "s.team_id", "s.current_revision_id", "s.deleted_at");
  if (!r) return null;
  return {
    ...toRevisionRow(r),
    body: r.body,
    scenarioTitle: r.title,
    template: r.template,
    teamId: r.team_id,
    currentRevisionId: r.current_revision_id,
    scenarioDeleted: !!r.deleted_at,
  };
}

/** One revision with its body, for a member of the scenario's team (404 otherwise). */
export async function getRevision(actor: CurrentUser, revisionId: string): Promise<RevisionView> {
  const r = await loadRevision(revisionId);
  if (!r || r.teamId !== actor.teamId) throw new DomainError(404, "No such revision.");
  return r;
}

/** A revision by id with no access check: only for a public share link that was already verified. */
export async function getRevisionUnchecked(revisionId: string): Promise<RevisionView | null> {
  return loadRevision(revisionId);
}

/**
 * Fork: a new scenario in the actor's team, owned by the actor, whose first revision is a copy of the given
 * one (its parent), so the original stays as it is.
 */
export async function forkRevision(actor: CurrentUser, revisionId: string, title?: string): Promise<{ scenarioId: string; revisionId: string }> {
  if (!roleAtLeast(actor.role, "designer")) throw new DomainError(403, "Viewers cannot fork scenarios.");
  const src = await getRevision(actor, revisionId);
  return db().transaction(async (trx) => {
    const [s] = await trx("scenarios")
      .insert({ team_id: actor.teamId, owner_id: actor.id, title: (title?.trim() || `${src.scenarioTitle} (fork)`).slice(0, 200), template: src.template })
      .returning("*");
    const [rev] = await trx("revisions")
      .insert({
        scenario_id: s.id,
        number: 1,
        parent_id: src.id,
        author_id: actor.id,
        note: `Forked from “${src.scenarioTitle}” revision ${src.number}`,
        body: JSON.stringify(src.body),
      })
      .returning("id");
    await trx("scenarios").where({ id: s.id }).update({ current_revision_id: rev.id });
    await audit({ teamId: actor.teamId, actorId: actor.id, action: "scenario.fork", subjectType: "scenario", subjectId: s.id, detail: { from: src.id } }, trx);
    return { scenarioId: s.id as string, revisionId: rev.id as string };
  });
}
