import "server-only";
import type { Knex } from "knex";
import { z } from "zod";
import { db } from "./knex";
import { audit } from "./audit";
import { DomainError } from "./errors";
import { isUuid } from "./users";
import { tracesByIds, type TraceSummary } from "./traces";
import { roleAtLeast, type CurrentUser } from "@/lib/auth/roles";
import { sendMail, type OutgoingMail } from "@/lib/mail/transport";
import { publicBaseUrl } from "@/lib/auth/tokens";
import { DEFAULT_TOLERANCES, tolerancesSchema, type Tolerances } from "@/lib/traces/compare";
import { tryUpgradeScenario } from "@/lib/design/upgrade";
import { TEMPLATES } from "@/lib/design/templates";
import { idealTransconductance } from "@/lib/design/compile";
import { storedText } from "@/lib/api/text";

export const LIBRARY_STATUSES = ["draft", "submitted", "validated", "retired"] as const;
export type LibraryStatus = (typeof LIBRARY_STATUSES)[number];

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

export interface Evidence {
  traceIds: string[];
  comparisons: ComparisonSummary[];
  tolerances?: Tolerances;
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

/** Facets of a scenario body the library filters by. Tolerates bodies from before the design schema. */
export function scenarioFacets(body: unknown, fallbackTemplate: string): {
  template: string; passElement: string; loadType: string; currentMin: number | null; currentMax: number | null;
} {
  const parsed = tryUpgradeScenario(body);
  if (!parsed.ok) {
    const b = (body ?? {}) as Record<string, any>;
    const template = typeof b.template === "string" ? b.template : fallbackTemplate;
    const info = TEMPLATES.find((t) => t.id === template);
    return { template, passElement: info?.passElement ?? "", loadType: typeof b.load?.kind === "string" ? b.load.kind : "", currentMin: null, currentMax: null };
  }
  const s = parsed.scenario;
  const info = TEMPLATES.find((t) => t.id === s.template);
  let passElement: string = info?.passElement ?? s.pass.kind;
  if (s.template === "source-highside") passElement = s.pass.kind;
  // The range the design serves: 0 to full scale (the Howland pump drives both ways: −full scale to full scale).
  const fullScale = Math.abs(idealTransconductance(s) * s.stimulus.commandFullScale);
  return {
    template: s.template,
    passElement,
    loadType: s.load.cable.length > 0 ? `${s.load.kind}+cable` : s.load.kind,
    currentMin: s.template === "howland" ? -fullScale : 0,
    currentMax: fullScale,
  };
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

// ── Mail to the people concerned ───────────────────────────────────────────────────────────────────────────────

interface Recipient { email: string; name: string }

async function teamLeads(teamId: string): Promise<Recipient[]> {
  return db()("memberships as m").join("users as u", "u.id", "m.user_id").where({ "m.team_id": teamId, "m.role": "lead" }).select("u.email", "u.name");
}

async function usersByIds(ids: (string | null | undefined)[]): Promise<Recipient[]> {
  const valid = [...new Set(ids.filter((x): x is string => !!x))];
  if (!valid.length) return [];
  return db()("users").whereIn("id", valid).select("email", "name");
}

export function libraryMail(p: { to: Recipient; subject: string; lines: string[]; entryId: string }): OutgoingMail {
  const link = `${publicBaseUrl()}/library/${p.entryId}`;
  const esc = (s: string) => s.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c]!);
  return {
    to: p.to.email,
    subject: p.subject,
    text: `Hello ${p.to.name},\n\n${p.lines.join("\n\n")}\n\nOpen the entry: ${link}\n`,
    html: `<div style="font-family:system-ui,sans-serif;color:#1C2430"><p>Hello ${esc(p.to.name)},</p>${p.lines
      .map((l) => `<p>${esc(l)}</p>`)
      .join("")}<p><a href="${esc(link)}" style="color:#0F766E">Open the entry</a></p></div>`,
  };
}

/** Sends each mail; a mail that cannot be sent is logged and reported, the recorded change stands. */
async function deliver(mails: OutgoingMail[]): Promise<string[]> {
  const failed: string[] = [];
  for (const m of mails) {
    try {
      await sendMail(m);
    } catch (e) {
      console.error("[library] mail to", m.to, "failed:", (e as Error).message);
      failed.push(m.to);
    }
  }
  return failed;
}

function others(list: Recipient[], actor: CurrentUser): Recipient[] {
  const seen = new Set<string>();
  return list.filter((r) => r.email !== actor.email && !seen.has(r.email) && seen.add(r.email));
}

// ── The workflow ───────────────────────────────────────────────────────────────────────────────────────────────

export const submitSchema = z.object({
  /** Revision to submit; the scenario's current revision when absent. */
  revisionId: z.string().uuid().optional(),
  note: storedText("note").trim().min(1, "Write a note for the reviewer").max(4000),
  traceIds: z.array(z.string().uuid()).min(1, "Attach at least one bench trace").max(20),
  keyFigures: keyFiguresSchema.default({}),
  comparisons: z.array(comparisonSummarySchema).max(20).default([]),
});
export type SubmitInput = z.infer<typeof submitSchema>;

export interface WorkflowResult {
  entryId: string;
  status: LibraryStatus;
  /** Addresses whose notification could not be sent (the change is recorded regardless). */
  mailFailures: string[];
}

async function recordEvent(
  trx: Knex.Transaction, actor: CurrentUser, entryId: string, action: string, from: string | null, to: string | null, comment: string, detail: Record<string, unknown> = {},
) {
  await trx("library_events").insert({ entry_id: entryId, actor_id: actor.id, action, from_status: from, to_status: to, comment, detail: JSON.stringify(detail) });
  await audit({ teamId: actor.teamId, actorId: actor.id, action: `library.${action}`, subjectType: "library_entry", subjectId: entryId, detail: { from, to, comment: comment.slice(0, 500), ...detail } }, trx);
}

/**
 * A designer (or lead) submits a revision for validation with bench traces and a note. Creates the revision's
 * entry, or resubmits one that was returned. The team's leads are told by mail.
 */
export async function submitForValidation(actor: CurrentUser, scenarioId: string, input: SubmitInput): Promise<WorkflowResult> {
  if (!roleAtLeast(actor.role, "designer")) throw new DomainError(403, "Viewers cannot submit revisions for validation.");
  if (!isUuid(scenarioId)) throw new DomainError(404, "No such scenario.");
  const result = await db().transaction(async (trx) => {
    const s = await trx("scenarios").where({ id: scenarioId, team_id: actor.teamId }).whereNull("deleted_at").first();
    if (!s) throw new DomainError(404, "No such scenario.");
    const revisionId = input.revisionId ?? s.current_revision_id;
    const rev = revisionId ? await trx("revisions").where({ id: revisionId, scenario_id: s.id }).first() : null;
    if (!rev) throw new DomainError(400, "revisionId: not a revision of this scenario.");
    // FOR SHARE: a trace being deleted right now is waited for (then it is missing, 400), and one attached here
    // cannot be deleted until this submission commits (then deleteTrace sees it is evidence, 409).
    const traces = await trx("bench_traces").whereIn("id", input.traceIds).andWhere({ team_id: actor.teamId }).forShare().select("id", "revision_id");
    const missing = input.traceIds.filter((id) => !traces.some((t) => t.id === id));
    if (missing.length) throw new DomainError(400, `traceIds: no such bench trace ${missing[0]}.`);
    const foreign = traces.find((t) => t.revision_id !== rev.id);
    if (foreign) throw new DomainError(400, `traceIds: trace ${foreign.id} belongs to another revision; upload the capture against revision ${rev.number}.`);
    for (const c of input.comparisons) {
      if (!input.traceIds.includes(c.traceId)) throw new DomainError(400, `comparisons: trace ${c.traceId} is not among the attached traces.`);
    }
    const tolerances = await getTeamTolerances(actor.teamId, trx);
    const facets = scenarioFacets(rev.body, s.template);
    const evidence: Evidence = { traceIds: input.traceIds, comparisons: input.comparisons, tolerances };
    // A revision has at most one entry (unique index). FOR UPDATE locks nothing while there is no row yet, so two
    // concurrent first submissions both inserted and one died on the index with a server error: serialise them.
    await trx.raw("select pg_advisory_xact_lock(hashtext(?))", [`library-entry:${rev.id}`]);
    const existing = await trx("library_entries").where({ revision_id: rev.id }).forUpdate().first();
    const fields = {
      status: "submitted",
      title: s.title,
      template: facets.template,
      pass_element: facets.passElement,
      load_type: facets.loadType,
      current_min: facets.currentMin,
      current_max: facets.currentMax,
      key_figures: JSON.stringify(input.keyFigures),
      evidence: JSON.stringify(evidence),
      note: input.note,
      submitted_by: actor.id,
      submitted_at: trx.fn.now(),
      validated_by: null,
      validated_at: null,
      updated_at: trx.fn.now(),
    };
    let entryId: string;
    let from: string | null = null;
    if (existing) {
      if (existing.status !== "draft") {
        throw new DomainError(409, `Revision ${rev.number} is already ${existing.status}; save a new revision to submit changes.`);
      }
      from = existing.status;
      entryId = existing.id;
      await trx("library_entries").where({ id: entryId }).update(fields);
    } else {
      const [row] = await trx("library_entries")
        .insert({ ...fields, team_id: actor.teamId, scenario_id: s.id, revision_id: rev.id, created_by: actor.id })
        .returning("id");
      entryId = row.id;
      await recordEvent(trx, actor, entryId, "created", null, "draft", "", { revisionNumber: rev.number });
      from = "draft";
    }
    await recordEvent(trx, actor, entryId, "submitted", from, "submitted", input.note, { traceIds: input.traceIds, revisionNumber: rev.number });
    return { entryId, title: s.title as string, number: rev.number as number };
  });
  const leads = others(await teamLeads(actor.teamId), actor);
  const mailFailures = await deliver(
    leads.map((to) =>
      libraryMail({
        to,
        entryId: result.entryId,
        subject: `Validation requested: ${result.title} rev ${result.number}`,
        lines: [`${actor.name} submitted “${result.title}” revision ${result.number} to the library with ${input.traceIds.length} bench trace${input.traceIds.length > 1 ? "s" : ""}.`, `Note: ${input.note}`],
      }),
    ),
  );
  return { entryId: result.entryId, status: "submitted", mailFailures };
}

/** Status changes after submission. Who may do what is checked here, on the server. */
const TRANSITIONS: Record<string, { from: LibraryStatus[]; to: LibraryStatus; lead: boolean; verb: string; needsComment: boolean }> = {
  validate: { from: ["submitted"], to: "validated", lead: true, verb: "validated", needsComment: false },
  return: { from: ["submitted"], to: "draft", lead: true, verb: "returned", needsComment: true },
  retire: { from: ["validated", "submitted", "draft"], to: "retired", lead: true, verb: "retired", needsComment: false },
  withdraw: { from: ["submitted"], to: "draft", lead: false, verb: "withdrew", needsComment: false },
};
export type LibraryAction = keyof typeof TRANSITIONS;
export const LIBRARY_ACTIONS = Object.keys(TRANSITIONS) as LibraryAction[];

/** The action that moves an entry to `status` (the PATCH body names the status). */
export function actionForStatus(current: LibraryStatus, target: LibraryStatus): LibraryAction | null {
  if (target === "validated") return "validate";
  if (target === "retired") return "retire";
  if (target === "draft" && current === "submitted") return "return";
  return null;
}

/**
 * Validate, return (with comments), retire or withdraw an entry. Validate, return and retire are for leads only;
 * the submitter may withdraw their own submission. The submitter (and the scenario owner) are told by mail.
 */
export async function changeEntryStatus(actor: CurrentUser, entryId: string, action: LibraryAction, comment = ""): Promise<WorkflowResult> {
  const t = TRANSITIONS[action];
  if (!t) throw new DomainError(400, `action: unknown action "${action}".`);
  if (!isUuid(entryId)) throw new DomainError(404, "No such library entry.");
  if (t.lead && actor.role !== "lead") throw new DomainError(403, `Only a lead can ${action} library entries.`);
  if (!t.lead && !roleAtLeast(actor.role, "designer")) throw new DomainError(403, "Viewers cannot change library entries.");
  const text = comment.trim().slice(0, 4000);
  if (t.needsComment && !text) throw new DomainError(400, "comment: say what needs to change before returning the entry.");
  const r = await db().transaction(async (trx) => {
    const e = await trx("library_entries").where({ id: entryId, team_id: actor.teamId }).forUpdate().first();
    if (!e) throw new DomainError(404, "No such library entry.");
    if (action === "withdraw" && e.submitted_by !== actor.id && actor.role !== "lead") {
      throw new DomainError(403, "Only the submitter or a lead can withdraw a submission.");
    }
    if (!t.from.includes(e.status)) throw new DomainError(409, `The entry is ${e.status}; it cannot be ${t.verb === "withdrew" ? "withdrawn" : t.verb} from there.`);
    const patch: Record<string, unknown> = { status: t.to, updated_at: trx.fn.now() };
    if (action === "validate") Object.assign(patch, { validated_by: actor.id, validated_at: trx.fn.now() });
    await trx("library_entries").where({ id: entryId }).update(patch);
    await recordEvent(trx, actor, entryId, action === "withdraw" ? "withdrawn" : t.verb, e.status, t.to, text);
    const owner = await trx("scenarios").where({ id: e.scenario_id }).first("owner_id");
    const rev = await trx("revisions").where({ id: e.revision_id }).first("number");
    return { e, ownerId: owner?.owner_id as string | undefined, number: rev?.number as number };
  });
  const concerned = others(
    [...(await usersByIds([r.e.submitted_by, r.ownerId])), ...(action === "withdraw" || action === "retire" ? await teamLeads(actor.teamId) : [])],
    actor,
  );
  const headline: Record<LibraryAction, string> = {
    validate: `${actor.name} validated “${r.e.title}” revision ${r.number}: it is now a trusted starting point in the library.`,
    return: `${actor.name} returned “${r.e.title}” revision ${r.number} with comments.`,
    retire: `${actor.name} retired “${r.e.title}” revision ${r.number} from the library.`,
    withdraw: `${actor.name} withdrew “${r.e.title}” revision ${r.number} from validation.`,
  };
  const subject: Record<LibraryAction, string> = {
    validate: `Validated: ${r.e.title} rev ${r.number}`,
    return: `Returned with comments: ${r.e.title} rev ${r.number}`,
    retire: `Retired: ${r.e.title} rev ${r.number}`,
    withdraw: `Withdrawn: ${r.e.title} rev ${r.number}`,
  };
  const mailFailures = await deliver(
    concerned.map((to) => libraryMail({ to, entryId, subject: subject[action], lines: [headline[action], ...(text ? [`Comment: ${text}`] : [])] })),
  );
  return { entryId, status: t.to, mailFailures };
}

/** Any member may comment on an entry; the submitter and the leads hear of it. */
export async function commentOnEntry(actor: CurrentUser, entryId: string, comment: string): Promise<WorkflowResult> {
  const text = comment.trim().slice(0, 4000);
  if (!text) throw new DomainError(400, "comment: write something.");
  if (!isUuid(entryId)) throw new DomainError(404, "No such library entry.");
  const e = await db().transaction(async (trx) => {
    const e = await trx("library_entries").where({ id: entryId, team_id: actor.teamId }).first();
    if (!e) throw new DomainError(404, "No such library entry.");
    await recordEvent(trx, actor, entryId, "commented", e.status, e.status, text);
    return e;
  });
  const concerned = others([...(await usersByIds([e.submitted_by])), ...(await teamLeads(actor.teamId))], actor);
  const mailFailures = await deliver(
    concerned.map((to) => libraryMail({ to, entryId, subject: `Comment on ${e.title}`, lines: [`${actor.name} commented on “${e.title}”:`, text] })),
  );
  return { entryId, status: e.status, mailFailures };
}

/** "Start from this": a new scenario owned by the actor whose revision 1 copies a validated entry's revision. */
export async function startFromEntry(actor: CurrentUser, entryId: string, title?: string): Promise<{ scenarioId: string; revisionId: string }> {
  if (!roleAtLeast(actor.role, "designer")) throw new DomainError(403, "Viewers cannot create scenarios.");
  if (!isUuid(entryId)) throw new DomainError(404, "No such library entry.");
  return db().transaction(async (trx) => {
    const e = await trx("library_entries as e")
      .join("revisions as r", "r.id", "e.revision_id")
      .where({ "e.id": entryId, "e.team_id": actor.teamId })
      .first("e.id", "e.status", "e.title", "e.template", "r.id as revision_id", "r.number", "r.body");
    if (!e) throw new DomainError(404, "No such library entry.");
    if (e.status !== "validated") throw new DomainError(409, `Only validated entries are starting points; this one is ${e.status}.`);
    const name = (title?.trim() || `${e.title} (from library)`).slice(0, 200);
    const [s] = await trx("scenarios").insert({ team_id: actor.teamId, owner_id: actor.id, title: name, template: e.template }).returning("id");
    const [rev] = await trx("revisions")
      .insert({
        scenario_id: s.id, number: 1, parent_id: e.revision_id, author_id: actor.id,
        note: `Started from the library: “${e.title}” revision ${e.number}`, body: JSON.stringify(e.body),
      })
      .returning("id");
    await trx("scenarios").where({ id: s.id }).update({ current_revision_id: rev.id });
    await audit({ teamId: actor.teamId, actorId: actor.id, action: "library.start_from", subjectType: "scenario", subjectId: s.id, detail: { entryId, revisionId: e.revision_id } }, trx);
    return { scenarioId: s.id as string, revisionId: rev.id as string };
  });
}

// ── Team tolerances of the measured-vs-simulated verdict ────────────────────────────────────────────────────────

export async function getTeamTolerances(teamId: string, trx: Knex | Knex.Transaction = db()): Promise<Tolerances> {
  const row = await trx("library_settings").where({ team_id: teamId }).first("tolerances");
  const parsed = tolerancesSchema.safeParse(row?.tolerances);
  return parsed.success ? parsed.data : DEFAULT_TOLERANCES;
}

/** Leads set the team's tolerances. */
export async function setTeamTolerances(actor: CurrentUser, tolerances: Tolerances): Promise<Tolerances> {
  if (actor.role !== "lead") throw new DomainError(403, "Only a lead can set the team's tolerances.");
  const t = tolerancesSchema.parse(tolerances);
  await db().transaction(async (trx) => {
    await trx("library_settings")
      .insert({ team_id: actor.teamId, tolerances: JSON.stringify(t), updated_by: actor.id, updated_at: trx.fn.now() })
      .onConflict("team_id")
      .merge();
    await audit({ teamId: actor.teamId, actorId: actor.id, action: "library.tolerances", subjectType: "team", subjectId: actor.teamId, detail: t }, trx);
  });
  return t;
}
