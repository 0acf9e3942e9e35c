import "server-only";
/**
 * The library's rows and queries: entries, their events, the team's stored tolerances, and the people a change
 * concerns. The workflow that moves an entry between statuses, and its mails, is lib/library/workflow.ts.
 */
import type { Knex } from "knex";
import { z } from "zod";
import { db } from "./knex";
import { audit } from "./audit";
import { DomainError } from "@/lib/errors";
import { isUuid } from "./users";
import { tracesByIds, type TraceSummary } from "./traces";
import type { CurrentUser } from "@/lib/shared/roles";
import { LIBRARY_STATUSES, type LibraryStatus } from "@/lib/shared/statuses";
import { storedText } from "@/lib/shared/text";

/** What the library can be filtered by (all optional; `q` searches title, note and template). */
export const libraryFiltersSchema = z.object({
  q: z.string().trim().max(200).optional(),
  template: z.string().trim().max(40).optional(),
  status: z.enum(LIBRARY_STATUSES, { error: `status must be one of ${LIBRARY_STATUSES.join(", ")}` }).optional(),
  loadType: z.string().trim().max(40).optional(),
  passElement: z.string().trim().max(40).optional(),
  /** Entries whose full-scale current is at least this, A. */
  currentMin: z.coerce.number({ error: "currentMin must be a number (A)" }).finite().nonnegative("currentMin must not be negative").optional(),
  /** Entries whose full-scale current is at most this, A. */
  currentMax: z.coerce.number({ error: "currentMax must be a number (A)" }).finite().nonnegative("currentMax must not be negative").optional(),
});
export type LibraryFilters = z.infer<typeof libraryFiltersSchema>;

/** Simulated figures the submitter's browser computed for the revision (all optional, SI units). */
export const keyFiguresSchema = z
  .object({
    fullScaleCurrent: z.number().finite().nullable().optional(),
    phaseMarginDeg: z.number().finite().nullable().optional(),
    crossoverHz: z.number().finite().nullable().optional(),
    overshootPct: z.number().finite().nullable().optional(),
    settlingTime: z.number().finite().nullable().optional(),
    riseTime: z.number().finite().nullable().optional(),
    worstDissipation: z.number().finite().nullable().optional(),
    fullScaleErrorPct: z.number().finite().nullable().optional(),
  })
  .strict();
export type KeyFigures = z.infer<typeof keyFiguresSchema>;

/** A comparison summary per trace, as computed in the submitter's browser (lib/traces compareStep). */
export const comparisonSummarySchema = z.object({
  traceId: z.string().uuid(),
  channel: z.number().int().min(0).max(7),
  offset: z.number().finite(),
  verdict: z.enum(["pass", "warn", "fail"]),
  rows: z
    .array(
      z.object({
        key: z.string().max(40),
        label: z.string().max(80),
        unit: z.string().max(20),
        measured: z.number().finite().nullable(),
        simulated: z.number().finite().nullable(),
        difference: z.number().finite().nullable(),
        differenceUnit: z.string().max(8),
        tolerance: z.number().finite(),
        verdict: z.enum(["pass", "warn", "fail"]),
      }),
    )
    .max(10),
});
export type ComparisonSummary = z.infer<typeof comparisonSummarySchema>;

/** What a submission for validation carries (the workflow is lib/library/workflow.ts). */
export const submitSchema = z.object({
  /** Revision to submit; the scenario's current revision when absent. */
  revisionId: z.string().uuid().optional(),
  note: storedText("note").trim().min(1, "Write a note for the reviewer").max(4000),
  traceIds: z.array(z.string().uuid()).min(1, "Attach at least one bench trace").max(20),
  keyFigures: keyFiguresSchema.default({}),
  comparisons: z.array(comparisonSummarySchema).max(20).default([]),
});
export type SubmitInput = z.infer<typeof submitSchema>;

/**
 * What is wrong with an entry's evidence for validation, or null when every attached trace was compared and none
 * failed: a comparison whose overall verdict is FAIL, or a trace without a comparison.
 */
export function evidenceProblem(evidence: Evidence): string | null {
  const failed = evidence.comparisons.filter((c) => c.verdict === "fail");
  if (failed.length) return `${failed.length === 1 ? "a comparison" : `${failed.length} comparisons`} of the bench evidence failed`;
  const compared = new Set(evidence.comparisons.map((c) => c.traceId));
  const missing = evidence.traceIds.filter((id) => !compared.has(id));
  if (evidence.comparisons.length === 0) return "the bench evidence has no comparison with the simulation";
  if (missing.length) return `${missing.length === 1 ? "a bench trace has" : `${missing.length} bench traces have`} no comparison with the simulation`;
  return null;
}

export interface Evidence {
  traceIds: string[];
  comparisons: ComparisonSummary[];
  /** The team's tolerances when the entry was submitted (lib/traces/compare: Tolerances). */
  tolerances?: Record<string, number>;
}

export interface LibraryEntrySummary {
  id: string;
  scenarioId: string;
  revisionId: string;
  revisionNumber: number;
  status: LibraryStatus;
  title: string;
  template: string;
  passElement: string;
  loadType: string;
  currentMin: number | null;
  currentMax: number | null;
  keyFigures: KeyFigures;
  evidence: Evidence;
  note: string;
  submittedBy: string | null;
  submittedByName: string | null;
  submittedAt: string | null;
  validatedBy: string | null;
  validatedByName: string | null;
  validatedAt: string | null;
  /** The lead's written reason for validating against failing or missing evidence; null otherwise. */
  overrideReason: string | null;
  updatedAt: string;
}

export interface LibraryEvent {
  id: string;
  action: string;
  fromStatus: string | null;
  toStatus: string | null;
  comment: string;
  actorName: string | null;
  createdAt: string;
}

export interface LibraryEntryDetail extends LibraryEntrySummary {
  body: unknown;
  revisionNote: string;
  revisionAuthor: string;
  revisionCreatedAt: string;
  events: LibraryEvent[];
  traces: TraceSummary[];
}

const ENTRY_COLUMNS = [
  "e.*", "r.number as revision_number", "sb.name as submitted_by_name", "vb.name as validated_by_name",
];

function entryQuery(trx: Knex | Knex.Transaction) {
  return trx("library_entries as e")
    .join("revisions as r", "r.id", "e.revision_id")
    .leftJoin("users as sb", "sb.id", "e.submitted_by")
    .leftJoin("users as vb", "vb.id", "e.validated_by")
    .select(ENTRY_COLUMNS);
}

const iso = (d: unknown) => (d ? new Date(d as string).toISOString() : null);

function toSummary(r: Record<string, any>): LibraryEntrySummary {
  return {
    id: r.id,
    scenarioId: r.scenario_id,
    revisionId: r.revision_id,
    revisionNumber: r.revision_number,
    status: r.status,
    title: r.title,
    template: r.template,
    passElement: r.pass_element,
    loadType: r.load_type,
    currentMin: r.current_min,
    currentMax: r.current_max,
    keyFigures: r.key_figures ?? {},
    evidence: { traceIds: [], comparisons: [], ...(r.evidence ?? {}) },
    note: r.note,
    submittedBy: r.submitted_by,
    submittedByName: r.submitted_by_name,
    submittedAt: iso(r.submitted_at),
    validatedBy: r.validated_by,
    validatedByName: r.validated_by_name,
    validatedAt: iso(r.validated_at),
    overrideReason: r.override_reason ?? null,
    updatedAt: iso(r.updated_at)!,
  };
}

/** The team's library entries, newest change first, filtered. */
export async function listEntries(actor: CurrentUser, filters: LibraryFilters = {}): Promise<LibraryEntrySummary[]> {
  const q = entryQuery(db()).where("e.team_id", actor.teamId).orderBy("e.updated_at", "desc").limit(500);
  if (filters.status) q.where("e.status", filters.status);
  if (filters.template) q.where("e.template", filters.template);
  if (filters.loadType) q.where((w) => w.where("e.load_type", filters.loadType!).orWhere("e.load_type", `${filters.loadType}+cable`));
  if (filters.passElement) q.where("e.pass_element", filters.passElement);
  if (filters.currentMin !== undefined) q.where("e.current_max", ">=", filters.currentMin);
  if (filters.currentMax !== undefined) q.where("e.current_max", "<=", filters.currentMax);
  if (filters.q) {
    const like = `%${filters.q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
    q.where((w) => w.whereILike("e.title", like).orWhereILike("e.note", like).orWhereILike("e.template", like));
  }
  return (await q).map(toSummary);
}

/** Distinct values present in the team's library, for the filter menus. */
export async function libraryFacets(teamId: string): Promise<{ templates: string[]; loadTypes: string[]; passElements: string[] }> {
  const rows = await db()("library_entries").where({ team_id: teamId }).distinct("template", "load_type", "pass_element");
  const uniq = (xs: string[]) => [...new Set(xs.filter(Boolean))].sort();
  return {
    templates: uniq(rows.map((r) => r.template)),
    loadTypes: uniq(rows.map((r) => String(r.load_type).replace(/\+cable$/, ""))),
    passElements: uniq(rows.map((r) => r.pass_element)),
  };
}

async function eventsOf(entryId: string, trx: Knex | Knex.Transaction = db()): Promise<LibraryEvent[]> {
  const rows = await trx("library_events as ev")
    .leftJoin("users as u", "u.id", "ev.actor_id")
    .where("ev.entry_id", entryId)
    .orderBy("ev.id", "asc")
    .select("ev.id", "ev.action", "ev.from_status", "ev.to_status", "ev.comment", "ev.created_at", "u.name as actor_name");
  return rows.map((r) => ({
    id: String(r.id), action: r.action, fromStatus: r.from_status, toStatus: r.to_status, comment: r.comment,
    actorName: r.actor_name, createdAt: iso(r.created_at)!,
  }));
}

/** One entry with its revision body, history and evidence traces; 404 outside the actor's team. */
export async function getEntry(actor: CurrentUser, id: string): Promise<LibraryEntryDetail> {
  if (!isUuid(id)) throw new DomainError(404, "No such library entry.");
  const r = await entryQuery(db())
    .join("users as ra", "ra.id", "r.author_id")
    .select("r.body", "r.note as revision_note", "r.created_at as revision_created_at", "ra.name as revision_author")
    .where("e.id", id)
    .andWhere("e.team_id", actor.teamId)
    .first();
  if (!r) throw new DomainError(404, "No such library entry.");
  const summary = toSummary(r);
  return {
    ...summary,
    body: r.body,
    revisionNote: r.revision_note,
    revisionAuthor: r.revision_author,
    revisionCreatedAt: iso(r.revision_created_at)!,
    events: await eventsOf(id),
    traces: await tracesByIds(actor.teamId, summary.evidence.traceIds),
  };
}

/** The library entry of a revision, if it has one (for the review page and the submit form). */
export async function entryForRevision(actor: CurrentUser, revisionId: string): Promise<LibraryEntryDetail | null> {
  if (!isUuid(revisionId)) return null;
  const row = await db()("library_entries").where({ revision_id: revisionId, team_id: actor.teamId }).first("id");
  return row ? getEntry(actor, row.id) : null;
}

// ── Queries of the workflow (lib/library/workflow.ts) ──────────────────────────────────────────────────────────

/** Someone a library change is mailed to. */
export interface Recipient { email: string; name: string }

/** The team's leads. */
export async function teamLeads(teamId: string): Promise<Recipient[]> {
  return db()("memberships as m").join("users as u", "u.id", "m.user_id").where({ "m.team_id": teamId, "m.role": "lead" }).select("u.email", "u.name");
}

/** The users with these ids (blanks and repeats skipped). */
export async function usersByIds(ids: (string | null | undefined)[]): Promise<Recipient[]> {
  const valid = [...new Set(ids.filter((x): x is string => !!x))];
  if (!valid.length) return [];
  return db()("users").whereIn("id", valid).select("email", "name");
}

/** Records one step of an entry's history, and the same in the audit log. */
export async function recordEvent(
  trx: Knex.Transaction, actor: CurrentUser, entryId: string, action: string, from: string | null, to: string | null, comment: string, detail: Record<string, unknown> = {},
) {
  await trx("library_events").insert({ entry_id: entryId, actor_id: actor.id, action, from_status: from, to_status: to, comment, detail: JSON.stringify(detail) });
  await audit({ teamId: actor.teamId, actorId: actor.id, action: `library.${action}`, subjectType: "library_entry", subjectId: entryId, detail: { from, to, comment: comment.slice(0, 500), ...detail } }, trx);
}

/** The team's tolerances as stored (unchecked JSON; lib/library/tolerances.ts parses them), or undefined. */
export async function storedTeamTolerances(teamId: string, trx: Knex | Knex.Transaction = db()): Promise<unknown> {
  const row = await trx("library_settings").where({ team_id: teamId }).first("tolerances");
  return row?.tolerances;
}

/** Stores the team's tolerances (checked by the caller) and audits the change. */
export async function storeTeamTolerances(actor: CurrentUser, tolerances: Record<string, number>): Promise<void> {
  await db().transaction(async (trx) => {
    await trx("library_settings")
      .insert({ team_id: actor.teamId, tolerances: JSON.stringify(tolerances), updated_by: actor.id, updated_at: trx.fn.now() })
      .onConflict("team_id")
      .merge();
    await audit({ teamId: actor.teamId, actorId: actor.id, action: "library.tolerances", subjectType: "team", subjectId: actor.teamId, detail: tolerances }, trx);
  });
}

/** Runs `fn` in one transaction: the workflow's checks and its writes see and lock the same rows. */
export function libraryTransaction<T>(fn: (trx: Knex.Transaction) => Promise<T>): Promise<T> {
  return db().transaction(fn);
}

/** The team's scenario (not deleted), or undefined. */
export function scenarioInTeam(trx: Knex.Transaction, teamId: string, scenarioId: string) {
  return trx("scenarios").where({ id: scenarioId, team_id: teamId }).whereNull("deleted_at").first();
}

/** A revision of the scenario, or undefined. */
export function revisionOfScenario(trx: Knex.Transaction, scenarioId: string, revisionId: string) {
  return trx("revisions").where({ id: revisionId, scenario_id: scenarioId }).first();
}

/**
 * The team's bench traces among `ids` (id, revision_id), locked FOR SHARE: a trace being deleted right now is
 * waited for (then it is missing), and one attached here cannot be deleted until the transaction commits (then
 * deleteTrace sees it is evidence).
 */
export function traceRevisionsForShare(trx: Knex.Transaction, teamId: string, ids: string[]): Promise<{ id: string; revision_id: string }[]> {
  return trx("bench_traces").whereIn("id", ids).andWhere({ team_id: teamId }).forShare().select("id", "revision_id");
}

/**
 * The revision's entry locked FOR UPDATE, or undefined. A revision has at most one entry (unique index); FOR UPDATE
 * locks nothing while there is no row yet, so two concurrent first submissions both inserted and one died on the
 * index with a server error: an advisory lock on the revision serialises them first.
 */
export async function lockEntryOfRevision(trx: Knex.Transaction, revisionId: string) {
  await trx.raw("select pg_advisory_xact_lock(hashtext(?))", [`library-entry:${revisionId}`]);
  return trx("library_entries").where({ revision_id: revisionId }).forUpdate().first();
}

/** What a submission writes on the entry. */
export interface SubmissionFields {
  title: string;
  facets: { template: string; passElement: string; loadType: string; currentMin: number | null; currentMax: number | null };
  keyFigures: KeyFigures;
  evidence: Evidence;
  note: string;
}

/**
 * Writes a submission: over the entry `existingId` (a returned draft), or as a new entry of the revision. Returns
 * the entry's id.
 */
export async function writeSubmission(
  trx: Knex.Transaction, actor: CurrentUser, at: { existingId: string | null; scenarioId: string; revisionId: string }, f: SubmissionFields,
): Promise<string> {
  const fields = {
    status: "submitted",
    title: f.title,
    template: f.facets.template,
    pass_element: f.facets.passElement,
    load_type: f.facets.loadType,
    current_min: f.facets.currentMin,
    current_max: f.facets.currentMax,
    key_figures: JSON.stringify(f.keyFigures),
    evidence: JSON.stringify(f.evidence),
    note: f.note,
    submitted_by: actor.id,
    submitted_at: trx.fn.now(),
    validated_by: null,
    validated_at: null,
    override_reason: null,
    updated_at: trx.fn.now(),
  };
  if (at.existingId) {
    await trx("library_entries").where({ id: at.existingId }).update(fields);
    return at.existingId;
  }
  const [row] = await trx("library_entries")
    .insert({ ...fields, team_id: actor.teamId, scenario_id: at.scenarioId, revision_id: at.revisionId, created_by: actor.id })
    .returning("id");
  return row.id as string;
}

/** The team's entry, or undefined; locked FOR UPDATE when `forUpdate`. */
export function entryInTeam(trx: Knex.Transaction, teamId: string, entryId: string, opts: { forUpdate?: boolean } = {}) {
  const q = trx("library_entries").where({ id: entryId, team_id: teamId });
  return (opts.forUpdate ? q.forUpdate() : q).first();
}

/** Sets an entry's status; `validatedBy` records who validated it, and when. */
export async function setEntryStatus(
  trx: Knex.Transaction, entryId: string, status: LibraryStatus, validatedBy?: string, overrideReason: string | null = null,
): Promise<void> {
  const patch: Record<string, unknown> = { status, updated_at: trx.fn.now() };
  if (validatedBy) Object.assign(patch, { validated_by: validatedBy, validated_at: trx.fn.now(), override_reason: overrideReason });
  await trx("library_entries").where({ id: entryId }).update(patch);
}

/** The owner of the entry's scenario and the number of its revision (for the mails). */
export async function entryOwnerAndNumber(trx: Knex.Transaction, entry: { scenario_id: string; revision_id: string }): Promise<{ ownerId: string | undefined; number: number }> {
  const owner = await trx("scenarios").where({ id: entry.scenario_id }).first("owner_id");
  const rev = await trx("revisions").where({ id: entry.revision_id }).first("number");
  return { ownerId: owner?.owner_id as string | undefined, number: rev?.number as number };
}

/** The team's entry with its revision's id, number and body, or undefined. */
export function entryWithRevision(trx: Knex.Transaction, teamId: string, entryId: string) {
  return trx("library_entries as e")
    .join("revisions as r", "r.id", "e.revision_id")
    .where({ "e.id": entryId, "e.team_id": teamId })
    .first("e.id", "e.status", "e.title", "e.template", "r.id as revision_id", "r.number", "r.body");
}

/** A new scenario owned by the actor whose revision 1 copies the entry's revision; audited. */
export async function insertScenarioFromEntry(
  trx: Knex.Transaction, actor: CurrentUser,
  e: { id: string; title: string; template: string; revision_id: string; number: number; body: unknown }, title: string,
): Promise<{ scenarioId: string; revisionId: string }> {
  const [s] = await trx("scenarios").insert({ team_id: actor.teamId, owner_id: actor.id, title, template: e.template }).returning("id");
  const [rev] = await trx("revisions")
    .insert({
      scenario_id: s.id, number: 1, parent_id: e.revision_id, author_id: actor.id,
      note: `Started from the library: “${e.title}” revision ${e.number}`, body: JSON.stringify(e.body),
    })
    .returning("id");
  await trx("scenarios").where({ id: s.id }).update({ current_revision_id: rev.id });
  await audit({ teamId: actor.teamId, actorId: actor.id, action: "library.start_from", subjectType: "scenario", subjectId: s.id, detail: { entryId: e.id, revisionId: e.revision_id } }, trx);
  return { scenarioId: s.id as string, revisionId: rev.id as string };
}
