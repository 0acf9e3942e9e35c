import "server-only";
/**
 * The library's status workflow: submit for validation, validate, return with comments, retire, withdraw, comment,
 * and start a new scenario from a validated entry. Who may do what is checked here, on the server; the people
 * concerned are told by mail (lib/library/mail.ts). The rows and every query, locks included, are lib/db/library.ts;
 * this module decides, inside one transaction, what they may do.
 */
import { isUuid } from "@/lib/db/users";
import {
  entryInTeam, entryOwnerAndNumber, entryWithRevision, insertScenarioFromEntry, libraryTransaction, lockEntryOfRevision, recordEvent,
  revisionOfScenario, scenarioInTeam, setEntryStatus, teamLeads, traceRevisionsForShare, usersByIds, writeSubmission, evidenceProblem,
  type Evidence, type SubmitInput,
} from "@/lib/db/library";
import { DomainError } from "@/lib/errors";
import { roleAtLeast, type CurrentUser } from "@/lib/shared/roles";
import type { LibraryStatus } from "@/lib/shared/statuses";
import { scenarioFacets } from "./facets";
import { getTeamTolerances } from "./tolerances";
import { deliver, libraryMail, others } from "./mail";

export interface WorkflowResult {
  entryId: string;
  status: LibraryStatus;
  /** Addresses whose notification could not be sent (the change is recorded regardless). */
  mailFailures: string[];
}

/**
 * A designer (or lead) submits a revision for validation with bench traces and a note. Creates the revision's
 * entry, or resubmits one that was returned. The team's leads are told by mail.
 */
export async function submitForValidation(actor: CurrentUser, scenarioId: string, input: SubmitInput): Promise<WorkflowResult> {
  if (!roleAtLeast(actor.role, "designer")) throw new DomainError(403, "Viewers cannot submit revisions for validation.");
  if (!isUuid(scenarioId)) throw new DomainError(404, "No such scenario.");
  const result = await libraryTransaction(async (trx) => {
    const s = await scenarioInTeam(trx, actor.teamId, scenarioId);
    if (!s) throw new DomainError(404, "No such scenario.");
    const revisionId = input.revisionId ?? s.current_revision_id;
    const rev = revisionId ? await revisionOfScenario(trx, s.id, revisionId) : null;
    if (!rev) throw new DomainError(400, "revisionId: not a revision of this scenario.");
    // Locked FOR SHARE: no trace attached here can be deleted until the submission commits.
    const traces = await traceRevisionsForShare(trx, actor.teamId, input.traceIds);
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
    const existing = await lockEntryOfRevision(trx, rev.id);
    if (existing && existing.status !== "draft") {
      throw new DomainError(409, `Revision ${rev.number} is already ${existing.status}; save a new revision to submit changes.`);
    }
    const entryId = await writeSubmission(
      trx, actor, { existingId: existing ? existing.id : null, scenarioId: s.id, revisionId: rev.id },
      { title: s.title, facets, keyFigures: input.keyFigures, evidence, note: input.note },
    );
    if (!existing) await recordEvent(trx, actor, entryId, "created", null, "draft", "", { revisionNumber: rev.number });
    const from: string = existing ? existing.status : "draft";
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

/** Shortest written reason for validating against failing or missing evidence, characters. */
export const MIN_OVERRIDE_REASON = 10;

/**
 * Validate, return (with comments), retire or withdraw an entry. Validate, return and retire are for leads only;
 * the submitter may withdraw their own submission. The submitter (and the scenario owner) are told by mail.
 * Validating an entry whose comparison failed or is missing needs `overrideReason`: the lead's written reason, stored
 * on the entry, in its history and the audit log, and in the mail.
 */
export async function changeEntryStatus(
  actor: CurrentUser, entryId: string, action: LibraryAction, comment = "", overrideReason?: string,
): Promise<WorkflowResult> {
  const t = TRANSITIONS[action];
  if (!t) throw new DomainError(400, `action: unknown action "${action}".`);
  if (!isUuid(entryId)) throw new DomainError(404, "No such library entry.");
  if (t.lead && actor.role !== "lead") throw new DomainError(403, `Only a lead can ${action} library entries.`);
  if (!t.lead && !roleAtLeast(actor.role, "designer")) throw new DomainError(403, "Viewers cannot change library entries.");
  const text = comment.trim().slice(0, 4000);
  if (t.needsComment && !text) throw new DomainError(400, "comment: say what needs to change before returning the entry.");
  const r = await libraryTransaction(async (trx) => {
    const e = await entryInTeam(trx, actor.teamId, entryId, { forUpdate: true });
    if (!e) throw new DomainError(404, "No such library entry.");
    if (action === "withdraw" && e.submitted_by !== actor.id && actor.role !== "lead") {
      throw new DomainError(403, "Only the submitter or a lead can withdraw a submission.");
    }
    if (!t.from.includes(e.status)) throw new DomainError(409, `The entry is ${e.status}; it cannot be ${t.verb === "withdrew" ? "withdrawn" : t.verb} from there.`);
    let override: { reason: string; problem: string } | null = null;
    if (action === "validate") {
      const problem = evidenceProblem({ traceIds: [], comparisons: [], ...(e.evidence ?? {}) } as Evidence);
      if (problem) {
        const reason = (overrideReason ?? "").trim().slice(0, 4000);
        if (reason.length < MIN_OVERRIDE_REASON) {
          throw new DomainError(400, `overrideReason: ${problem}; validating it anyway needs an override with a written reason (at least ${MIN_OVERRIDE_REASON} characters).`);
        }
        override = { reason, problem };
      }
    }
    await setEntryStatus(trx, entryId, t.to, action === "validate" ? actor.id : undefined, override?.reason ?? null);
    await recordEvent(
      trx, actor, entryId, action === "withdraw" ? "withdrawn" : override ? "validated_with_override" : t.verb, e.status, t.to, text,
      override ? { override: true, overrideReason: override.reason, evidenceProblem: override.problem } : {},
    );
    return { e, override, ...(await entryOwnerAndNumber(trx, e)) };
  });
  const concerned = others(
    [...(await usersByIds([r.e.submitted_by, r.ownerId])), ...(action === "withdraw" || action === "retire" ? await teamLeads(actor.teamId) : [])],
    actor,
  );
  const headline: Record<LibraryAction, string> = {
    validate: r.override
      ? `${actor.name} validated “${r.e.title}” revision ${r.number} with an override: ${r.override.problem}. Reason given: “${r.override.reason}”. The library marks it as validated against its evidence.`
      : `${actor.name} validated “${r.e.title}” revision ${r.number}: it is now a trusted starting point in the library.`,
    return: `${actor.name} returned “${r.e.title}” revision ${r.number} with comments.`,
    retire: `${actor.name} retired “${r.e.title}” revision ${r.number} from the library.`,
    withdraw: `${actor.name} withdrew “${r.e.title}” revision ${r.number} from validation.`,
  };
  const subject: Record<LibraryAction, string> = {
    validate: r.override ? `Validated with an override: ${r.e.title} rev ${r.number}` : `Validated: ${r.e.title} rev ${r.number}`,
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
  const e = await libraryTransaction(async (trx) => {
    const e = await entryInTeam(trx, actor.teamId, entryId);
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
  return libraryTransaction(async (trx) => {
    const e = await entryWithRevision(trx, actor.teamId, entryId);
    if (!e) throw new DomainError(404, "No such library entry.");
    if (e.status !== "validated") throw new DomainError(409, `Only validated entries are starting points; this one is ${e.status}.`);
    const name = (title?.trim() || `${e.title} (from library)`).slice(0, 200);
    return insertScenarioFromEntry(trx, actor, { ...e, id: entryId }, name);
  });
}
