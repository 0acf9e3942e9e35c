import "server-only";
import { db } from "./knex";

export interface ScenarioWithRevision {
  id: string;
  teamId: string;
  title: string;
  template: string;
  status: string;
  ownerId: string;
  revisionId: string;
  revisionNumber: number;
  body: unknown;
}

/** A scenario with its current revision's body, or null when it does not exist (or is deleted). */
export async function getScenarioWithRevision(id: string): Promise<ScenarioWithRevision | null> {
  if (!/^[0-9a-f-]{36}$/i.test(id)) return null;
  const row = await db()("scenarios as s")
    .join("revisions as r", "r.id", "s.current_revision_id")
    .where("s.id", id)
    .whereNull("s.deleted_at")
    .first(
      "s.id", "s.team_id", "s.title", "s.template", "s.status", "s.owner_id",
      "r.id as revision_id", "r.number as revision_number", "r.body",
    );
  if (!row) return null;
  return {
    id: row.id,
    teamId: row.team_id,
    title: row.title,
    template: row.template,
    status: row.status,
    ownerId: row.owner_id,
    revisionId: row.revision_id,
    revisionNumber: row.revision_number,
    body: row.body,
  };
}
