import "server-only";
import type { Knex } from "knex";
import { db } from "./knex";
import { audit } from "./audit";
import { DomainError } from "@/lib/errors";
import { isUuid } from "./users";
import { roleAtLeast, type CurrentUser } from "@/lib/shared/roles";

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

export interface ScenarioSummary {
  id: string;
  title: string;
  template: string;
  status: string;
  ownerId: string;
  ownerName: string;
  revisionId: string | null;
  revisionNumber: number | null;
  updatedAt: string;
  createdAt: string;
  deletedAt: string | null;
}

export interface ScenarioDetail extends ScenarioSummary {
  teamId: string;
  body: unknown;
  note: string;
  authorName: string;
  revisionCreatedAt: string | null;
  /** What the asking user may do with it (the UI hides the rest; the server checks again). */
  can: { edit: boolean; delete: boolean; share: boolean; comment: boolean };
}

const SORT_COLUMNS = {
  title: "s.title",
  updated: "s.updated_at",
  created: "s.created_at",
  template: "s.template",
  status: "s.status",
  owner: "u.name",
} as const;
export type ScenarioSort = keyof typeof SORT_COLUMNS;
export const SCENARIO_SORTS = Object.keys(SORT_COLUMNS) as ScenarioSort[];

export interface ScenarioListQuery {
  q?: string;
  owner?: string; // a user id, or "me"
  template?: string;
  status?: string;
  sort?: ScenarioSort;
  dir?: "asc" | "desc";
  page?: number;
  pageSize?: number;
  /** Show the deleted ones (to restore) instead of the live ones. */
  deleted?: boolean;
}

function toSummary(r: Record<string, any>): ScenarioSummary {
  return {
    id: r.id,
    title: r.title,
    template: r.template,
    status: r.status,
    ownerId: r.owner_id,
    ownerName: r.owner_name,
    revisionId: r.revision_id ?? null,
    revisionNumber: r.revision_number ?? null,
    updatedAt: new Date(r.updated_at).toISOString(),
    createdAt: new Date(r.created_at).toISOString(),
    deletedAt: r.deleted_at ? new Date(r.deleted_at).toISOString() : null,
  };
}

function escapeLike(s: string): string {
  return s.replace(/[\\%_]/g, (c) => `\\${c}`);
}

/** The team's scenarios: search in titles, filter by owner, template and status, sort, one page at a time. */
export async function listScenarios(
  actor: CurrentUser,
  query: ScenarioListQuery = {},
): Promise<{ items: ScenarioSummary[]; total: number; page: number; pageSize: number }> {
  const pageSize = Math.min(Math.max(query.pageSize ?? 20, 1), 100);
  const page = Math.max(query.page ?? 1, 1);
  const base = db()("scenarios as s")
    .join("users as u", "u.id", "s.owner_id")
    .leftJoin("revisions as r", "r.id", "s.current_revision_id")
    .where("s.team_id", actor.teamId);
  if (query.deleted) base.whereNotNull("s.deleted_at");
  else base.whereNull("s.deleted_at");
  if (query.q?.trim()) base.whereRaw("lower(s.title) like ? escape '\\'", [`%${escapeLike(query.q.trim().toLowerCase())}%`]);
  if (query.owner) base.where("s.owner_id", query.owner === "me" ? actor.id : isUuid(query.owner) ? query.owner : "00000000-0000-0000-0000-000000000000");
  if (query.template) base.where("s.template", query.template);
  if (query.status) base.where("s.status", query.status);
  const [{ n }] = await base.clone().count<{ n: string }[]>({ n: "*" });
  const column = SORT_COLUMNS[query.sort ?? "updated"];
  const dir = query.dir ?? (query.sort === undefined || query.sort === "updated" || query.sort === "created" ? "desc" : "asc");
  const rows = await base
    .clone()
    .orderBy([{ column, order: dir }, { column: "s.id", order: "asc" }])
    .limit(pageSize)
    .offset((page - 1) * pageSize)
    .select("s.*", "u.name as owner_name", "r.id as revision_id", "r.number as revision_number");
  return { items: rows.map(toSummary), total: Number(n), page, pageSize };
}

/** Owners and templates present in the team, for the table's filters. */
export async function scenarioFacets(teamId: string) {
  const owners = await db()("scenarios as s")
    .join("users as u", "u.id", "s.owner_id")
    .where("s.team_id", teamId)
    .distinct("u.id", "u.name")
    .orderBy("u.name");
  const templates = await db()("scenarios").where({ team_id: teamId }).distinct("template").orderBy("template");
  const statuses = await db()("scenarios").where({ team_id: teamId }).distinct("status").orderBy("status");
  return {
    owners: owners.map((o) => ({ id: o.id as string, name: o.name as string })),
    templates: templates.map((t) => t.template as string),
    statuses: statuses.map((t) => t.status as string),
  };
}

/** Owner or lead: who may delete, restore and publish public links. */
export function ownsOrLeads(actor: CurrentUser, ownerId: string): boolean {
  return actor.role === "lead" || (actor.id === ownerId && roleAtLeast(actor.role, "designer"));
}

/** Loads a scenario row of the actor's team (404 for other teams: existence is not revealed). */
export async function scenarioRowInTeam(
  trx: Knex | Knex.Transaction,
  actor: CurrentUser,
  id: string,
  opts: { forUpdate?: boolean; includeDeleted?: boolean } = {},
): Promise<Record<string, any>> {
  if (!isUuid(id)) throw new DomainError(404, "No such scenario.");
  const q = trx("scenarios").where({ id, team_id: actor.teamId });
  if (!opts.includeDeleted) q.whereNull("deleted_at");
  if (opts.forUpdate) q.forUpdate();
  const row = await q.first();
  if (!row) throw new DomainError(404, "No such scenario.");
  return row;
}

export async function getScenarioDetail(actor: CurrentUser, id: string, opts: { includeDeleted?: boolean } = {}): Promise<ScenarioDetail> {
  await scenarioRowInTeam(db(), actor, id, opts);
  const r = await db()("scenarios as s")
    .join("users as u", "u.id", "s.owner_id")
    .leftJoin("revisions as r", "r.id", "s.current_revision_id")
    .leftJoin("users as a", "a.id", "r.author_id")
    .where("s.id", id)
    .first("s.*", "u.name as owner_name", "r.id as revision_id", "r.number as revision_number", "r.body", "r.note", "r.created_at as revision_created_at", "a.name as author_name");
  const designer = roleAtLeast(actor.role, "designer");
  return {
    ...toSummary(r),
    teamId: r.team_id,
    body: r.body ?? null,
    note: r.note ?? "",
    authorName: r.author_name ?? "",
    revisionCreatedAt: r.revision_created_at ? new Date(r.revision_created_at).toISOString() : null,
    can: { edit: designer && !r.deleted_at, delete: ownsOrLeads(actor, r.owner_id), share: designer, comment: true },
  };
}

/** A scenario body the design layer has checked (lib/design/scenarioBody.ts): stored as it is, as JSON. */
export interface CheckedScenarioBody {
  readonly template: string;
}

/**
 * A designer creates a scenario with its first revision. The body is checked by the caller
 * (lib/scenarios/save.ts: createScenario), so this module needs nothing of the design layer.
 */
export async function insertScenario(
  actor: CurrentUser,
  input: { title: string; body: CheckedScenarioBody; note?: string },
): Promise<{ id: string; revisionId: string; number: number }> {
  if (!roleAtLeast(actor.role, "designer")) throw new DomainError(403, "Viewers cannot create scenarios.");
  const body = input.body;
  return db().transaction(async (trx) => {
    const [s] = await trx("scenarios")
      .insert({ team_id: actor.teamId, owner_id: actor.id, title: input.title.trim(), template: body.template })
      .returning("*");
    const [rev] = await trx("revisions")
      .insert({ scenario_id: s.id, number: 1, author_id: actor.id, note: input.note?.trim() || "Created", body: JSON.stringify(body) })
      .returning("*");
    await trx("scenarios").where({ id: s.id }).update({ current_revision_id: rev.id });
    await audit({ teamId: actor.teamId, actorId: actor.id, action: "scenario.create", subjectType: "scenario", subjectId: s.id, detail: { title: s.title, template: s.template } }, trx);
    return { id: s.id as string, revisionId: rev.id as string, number: 1 };
  });
}

/** Renames a scenario or sets its status (designers; no new revision: these are not part of the design). */
export async function updateScenarioMeta(actor: CurrentUser, id: string, patch: { title?: string; status?: string }): Promise<void> {
  if (!roleAtLeast(actor.role, "designer")) throw new DomainError(403, "Viewers cannot change scenarios.");
  await db().transaction(async (trx) => {
    await scenarioRowInTeam(trx, actor, id, { forUpdate: true });
    const changes: Record<string, unknown> = { updated_at: trx.fn.now() };
    if (patch.title !== undefined) changes.title = patch.title.trim();
    if (patch.status !== undefined) changes.status = patch.status;
    await trx("scenarios").where({ id }).update(changes);
    await audit({ teamId: actor.teamId, actorId: actor.id, action: "scenario.update", subjectType: "scenario", subjectId: id, detail: patch }, trx);
  });
}

/** Soft delete (owner or lead): hidden from the table, restorable. */
export async function softDeleteScenario(actor: CurrentUser, id: string): Promise<void> {
  await db().transaction(async (trx) => {
    const s = await scenarioRowInTeam(trx, actor, id, { forUpdate: true });
    if (!ownsOrLeads(actor, s.owner_id)) throw new DomainError(403, "Only the owner or a lead can delete this scenario.");
    await trx("scenarios").where({ id }).update({ deleted_at: trx.fn.now() });
    // Deleting revokes the public links for good: restoring the scenario later does not bring them back.
    await trx("share_links").where({ scenario_id: id }).whereNull("revoked_at").update({ revoked_at: trx.fn.now() });
    await audit({ teamId: actor.teamId, actorId: actor.id, action: "scenario.delete", subjectType: "scenario", subjectId: id }, trx);
  });
}

export async function restoreScenario(actor: CurrentUser, id: string): Promise<void> {
  await db().transaction(async (trx) => {
    const s = await scenarioRowInTeam(trx, actor, id, { forUpdate: true, includeDeleted: true });
    if (!ownsOrLeads(actor, s.owner_id)) throw new DomainError(403, "Only the owner or a lead can restore this scenario.");
    if (!s.deleted_at) throw new DomainError(409, "This scenario is not deleted.");
    await trx("scenarios").where({ id }).update({ deleted_at: null, updated_at: trx.fn.now() });
    await audit({ teamId: actor.teamId, actorId: actor.id, action: "scenario.restore", subjectType: "scenario", subjectId: id }, trx);
  });
}
