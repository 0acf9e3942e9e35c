import { afterAll, describe, expect, it } from "vitest";


import { randomUUID } from "node:crypto";
import { db } from "@/lib/db/knex";
import type { CurrentUser, Role } from "@/lib/shared/roles";
import { storeTrace, deleteTrace } from "@/lib/db/traces";
import { getEntry, listEntries, submitSchema } from "@/lib/db/library";
import { changeEntryStatus, commentOnEntry, startFromEntry, submitForValidation } from "@/lib/library/workflow";
import { getTeamTolerances, setTeamTolerances } from "@/lib/library/tolerances";
import { scenarioFacets } from "@/lib/library/facets";
import { parseTraceCsv, DEFAULT_TOLERANCES } from "@/lib/traces";
import { defaultScenario } from "@/lib/design/templates";
import { idealTransconductance } from "@/lib/design/compile";

async function makeTeam(tag: string) {
  const suffix = randomUUID().slice(0, 8);
  const [team] = await db()("teams").insert({ name: `Library bench ${tag} ${suffix}` }).returning("*");
  const users = {} as Record<Role, CurrentUser>;
  for (const role of ["lead", "designer", "viewer"] as Role[]) {
    const email = `${role}.${suffix}@library.test`;
    const [u] = await db()("users").insert({ email, name: `${role} ${suffix}`, password_hash: "x", current_team_id: team.id }).returning("*");
    await db()("memberships").insert({ team_id: team.id, user_id: u.id, role });
    users[role] = { id: u.id, email, name: u.name, teamId: team.id, teamName: team.name, role };
  }
  const body = defaultScenario("sink-npn");
  const [s] = await db()("scenarios").insert({ team_id: team.id, owner_id: users.designer.id, title: `Valve coil ${suffix}`, template: "sink-npn" }).returning("*");
  const [rev] = await db()("revisions").insert({ scenario_id: s.id, number: 1, author_id: users.designer.id, body: JSON.stringify(body) }).returning("*");
  await db()("scenarios").where({ id: s.id }).update({ current_revision_id: rev.id });
  return { team, users, scenarioId: s.id as string, revisionId: rev.id as string, body, suffix };
}

function capture(): string {
  const lines = ["Time (us),CH1 (A)"];
  for (let k = 0; k < 100; k++) lines.push(`${k},${k < 10 ? 0 : 0.75}`);
  return lines.join("\n");
}

/** Mail lands in dev_mailbox through the local SMTP fake (started by the test command). */
async function mailTo(email: string, subject: RegExp): Promise<{ subject: string; text_body: string }[]> {
  const rows = await db()("dev_mailbox").where("to_address", email).orderBy("id");
  return rows.filter((r) => subject.test(r.subject));
}

async function withTrace(tag: string) {
  const team = await makeTeam(tag);
  const t = await storeTrace(team.users.designer, { scenarioId: team.scenarioId, label: "Bench step", fileName: "s.csv", parsed: parseTraceCsv(capture()), settings: {} });
  return { ...team, traceId: t.id };
}

const submission = (traceId: string) =>
  submitSchema.parse({
    note: "Built on the bench board; scope capture of the 0→750 mA step attached.",
    traceIds: [traceId],
    keyFigures: { phaseMarginDeg: 62, overshootPct: 3.1 },
    comparisons: [{
      traceId, channel: 0, offset: -1e-5, verdict: "pass",
      rows: [{ key: "overshoot", label: "Overshoot", unit: "%", measured: 3.4, simulated: 3.1, difference: 0.3, differenceUnit: "pts", tolerance: 5, verdict: "pass" }],
    }],
  });

/** A team whose revision 1 the designer has submitted with one bench trace. */
async function submittedEntry(tag: string) {
  const team = await withTrace(tag);
  const r = await submitForValidation(team.users.designer, team.scenarioId, submission(team.traceId));
  return { ...team, entryId: r.entryId };
}

/** The same, validated by the team's lead. */
async function validatedEntry(tag: string) {
  const team = await submittedEntry(tag);
  await changeEntryStatus(team.users.lead, team.entryId, "validate");
  return team;
}

// Every test builds its own team and entry (fresh addresses, so mail counts are its own): any order, any subset.
describe("library workflow", () => {
  afterAll(async () => {
    await db().destroy();
    (globalThis as { quellKnex?: unknown }).quellKnex = undefined;
  });

  it("derives filter facets from the scenario body", async () => {
    const a = await makeTeam("facets");
    const f = scenarioFacets(a.body, "sink-npn");
    expect(f.template).toBe("sink-npn");
    expect(f.passElement).toBe("npn");
    // Full-scale current = k/Rsense × full-scale command (ideal transfer, design layer's idealTransconductance)
    expect(f.currentMax).toBeCloseTo(idealTransconductance(a.body) * a.body.stimulus.commandFullScale, 12);
    expect(f.currentMin).toBe(0); // a sink serves 0 to full scale
    // A body the design schema cannot read keeps its template and pass element, without a current range.
    expect(scenarioFacets({ schemaVersion: 99, template: "sink-nmos" }, "x")).toMatchObject({ template: "sink-nmos", passElement: "nmos", currentMax: null });
  });

  it("refuses a submission from a viewer, without traces, or with another revision's trace", async () => {
    const a = await withTrace("refusals");
    const other = await makeTeam("refusals-other");
    await expect(submitForValidation(a.users.viewer, a.scenarioId, submission(a.traceId))).rejects.toMatchObject({ status: 403 });
    expect(() => submitSchema.parse({ note: "x", traceIds: [] })).toThrow(/Attach at least one bench trace/);
    expect(() => submitSchema.parse({ note: " ", traceIds: [a.traceId] })).toThrow(/Write a note/);
    const foreign = await storeTrace(other.users.designer, { scenarioId: other.scenarioId, label: "o", fileName: "o.csv", parsed: parseTraceCsv(capture()), settings: {} });
    await expect(submitForValidation(a.users.designer, a.scenarioId, { ...submission(a.traceId), traceIds: [foreign.id], comparisons: [] })).rejects.toMatchObject({ status: 400 });
  });

  it("a designer submits: entry submitted, history, audit log, and a mail to the lead", async () => {
    const a = await withTrace("submit");
    const r = await submitForValidation(a.users.designer, a.scenarioId, submission(a.traceId));
    expect(r.status).toBe("submitted");
    expect(r.mailFailures).toEqual([]);
    const e = await getEntry(a.users.viewer, r.entryId);
    expect(e).toMatchObject({ status: "submitted", revisionId: a.revisionId, revisionNumber: 1, submittedBy: a.users.designer.id, template: "sink-npn", passElement: "npn" });
    expect(e.evidence.traceIds).toEqual([a.traceId]);
    expect(e.evidence.tolerances).toEqual(DEFAULT_TOLERANCES);
    expect(e.traces.map((t) => t.id)).toEqual([a.traceId]);
    expect(e.events.map((x) => x.action)).toEqual(["created", "submitted"]);
    expect(await db()("audit_log").where({ subject_id: r.entryId, action: "library.submitted" }).first()).toBeTruthy();
    const mails = await mailTo(a.users.lead.email, /^Validation requested:/);
    expect(mails).toHaveLength(1);
    expect(mails[0].text_body).toContain(`/library/${r.entryId}`);
    // The evidence cannot be deleted while the entry is under review.
    await expect(deleteTrace(a.users.designer, a.traceId)).rejects.toMatchObject({ status: 409 });
    // A second submission of the same revision is a conflict.
    await expect(submitForValidation(a.users.designer, a.scenarioId, submission(a.traceId))).rejects.toMatchObject({ status: 409 });
  });

  it("a viewer or a designer cannot validate, return or retire; another team cannot see the entry", async () => {
    const a = await submittedEntry("roles");
    const other = await makeTeam("roles-other");
    for (const who of [a.users.viewer, a.users.designer]) {
      await expect(changeEntryStatus(who, a.entryId, "validate")).rejects.toMatchObject({ status: 403, message: "Only a lead can validate library entries." });
      await expect(changeEntryStatus(who, a.entryId, "return", "no")).rejects.toMatchObject({ status: 403 });
      await expect(changeEntryStatus(who, a.entryId, "retire")).rejects.toMatchObject({ status: 403 });
    }
    await expect(changeEntryStatus(other.users.lead, a.entryId, "validate")).rejects.toMatchObject({ status: 404 });
    await expect(getEntry(other.users.lead, a.entryId)).rejects.toMatchObject({ status: 404 });
    expect((await getEntry(a.users.lead, a.entryId)).status).toBe("submitted");
  });

  it("the lead returns it with comments; the designer hears of it and resubmits", async () => {
    const a = await submittedEntry("return");
    await expect(changeEntryStatus(a.users.lead, a.entryId, "return", "  ")).rejects.toMatchObject({ status: 400 });
    const r = await changeEntryStatus(a.users.lead, a.entryId, "return", "Capture the load step too, please.");
    expect(r.status).toBe("draft");
    const mails = await mailTo(a.users.designer.email, /^Returned with comments:/);
    expect(mails).toHaveLength(1);
    expect(mails[0].text_body).toContain("Capture the load step too, please.");
    // Viewers may comment; the submitter and the lead are told.
    await commentOnEntry(a.users.viewer, a.entryId, "Which scope probe was used?");
    expect(await mailTo(a.users.designer.email, /^Comment on/)).toHaveLength(1);
    const again = await submitForValidation(a.users.designer, a.scenarioId, submission(a.traceId));
    expect(again).toMatchObject({ entryId: a.entryId, status: "submitted" });
    expect(await mailTo(a.users.lead.email, /^Validation requested:/)).toHaveLength(2);
    expect((await getEntry(a.users.lead, a.entryId)).events.map((x) => x.action)).toEqual(["created", "submitted", "returned", "commented", "submitted"]);
  });

  it("the lead validates: status, validated_by, history, audit and a mail to the designer", async () => {
    const a = await submittedEntry("validate");
    const r = await changeEntryStatus(a.users.lead, a.entryId, "validate", "Agrees with the bench within tolerance.");
    expect(r.status).toBe("validated");
    const e = await getEntry(a.users.designer, a.entryId);
    expect(e).toMatchObject({ status: "validated", validatedBy: a.users.lead.id, validatedByName: a.users.lead.name });
    expect(e.validatedAt).not.toBeNull();
    expect(e.events.map((x) => x.action)).toEqual(["created", "submitted", "validated"]);
    expect(await db()("audit_log").where({ subject_id: a.entryId, action: "library.validated", actor_id: a.users.lead.id }).first()).toBeTruthy();
    expect(await mailTo(a.users.designer.email, /^Validated:/)).toHaveLength(1);
    // Validating twice is a conflict, not a second validation.
    await expect(changeEntryStatus(a.users.lead, a.entryId, "validate")).rejects.toMatchObject({ status: 409 });
  });

  it("validating against a FAIL comparison needs a written reason: stored, marked in the list, in history, audit and mail", async () => {
    const team = await withTrace("override");
    const failing = submitSchema.parse({
      ...submission(team.traceId),
      comparisons: [{
        traceId: team.traceId, channel: 0, offset: 0, verdict: "fail",
        rows: [{ key: "overshoot", label: "Overshoot", unit: "%", measured: 59, simulated: 0.4, difference: 58.6, differenceUnit: "pts", tolerance: 5, verdict: "fail" }],
      }],
    });
    const { entryId } = await submitForValidation(team.users.designer, team.scenarioId, failing);
    // viewers and designers cannot validate at all, with or without a reason
    for (const who of [team.users.viewer, team.users.designer]) {
      await expect(changeEntryStatus(who, entryId, "validate", "", "The bench board had the wrong capacitor.")).rejects.toMatchObject({ status: 403 });
    }
    // the lead without a reason, or with too short a one: refused, nothing changes
    await expect(changeEntryStatus(team.users.lead, entryId, "validate", "Looks fine.")).rejects.toMatchObject({
      status: 400, message: expect.stringMatching(/^overrideReason: a comparison of the bench evidence failed; validating it anyway needs an override/),
    });
    await expect(changeEntryStatus(team.users.lead, entryId, "validate", "", "ok")).rejects.toMatchObject({ status: 400 });
    expect((await getEntry(team.users.lead, entryId)).status).toBe("submitted");

    const reason = "Bench board had a 10x probe on the wrong setting; model confirmed on a second board.";
    const r = await changeEntryStatus(team.users.lead, entryId, "validate", "", reason);
    expect(r.status).toBe("validated");
    const e = await getEntry(team.users.viewer, entryId);
    expect(e).toMatchObject({ status: "validated", overrideReason: reason });
    expect(e.events.map((x) => x.action)).toEqual(["created", "submitted", "validated_with_override"]);
    const audit = await db()("audit_log").where({ subject_id: entryId, action: "library.validated_with_override", actor_id: team.users.lead.id }).first();
    expect(audit.detail).toMatchObject({ override: true, overrideReason: reason });
    const [mail] = await mailTo(team.users.designer.email, /^Validated with an override:/);
    expect(mail.text_body).toContain(`Reason given: “${reason}”`);
    expect(mail.text_body).not.toContain("trusted starting point");
    // the library list marks it
    const [listed] = await listEntries(team.users.viewer, { status: "validated" });
    expect(listed).toMatchObject({ id: entryId, overrideReason: reason });
  });

  it("an entry whose evidence has no comparison also needs the override; a passing one does not and stores none", async () => {
    const team = await withTrace("missing");
    const { entryId } = await submitForValidation(team.users.designer, team.scenarioId, submitSchema.parse({ ...submission(team.traceId), comparisons: [] }));
    await expect(changeEntryStatus(team.users.lead, entryId, "validate")).rejects.toMatchObject({
      status: 400, message: expect.stringMatching(/^overrideReason: the bench evidence has no comparison with the simulation/),
    });
    const passing = await submittedEntry("passing");
    await changeEntryStatus(passing.users.lead, passing.entryId, "validate", "", "An unneeded reason is not stored.");
    expect((await getEntry(passing.users.lead, passing.entryId)).overrideReason).toBeNull();
  });

  it("lists and filters the team's entries", async () => {
    const a = await validatedEntry("list");
    const other = await makeTeam("list-other");
    const all = await listEntries(a.users.viewer);
    expect(all.map((e) => e.id)).toEqual([a.entryId]);
    expect((await listEntries(a.users.viewer, { status: "validated" })).length).toBe(1);
    expect((await listEntries(a.users.viewer, { status: "submitted" })).length).toBe(0);
    expect((await listEntries(a.users.viewer, { template: "sink-nmos" })).length).toBe(0);
    expect((await listEntries(a.users.viewer, { passElement: "npn", q: a.suffix })).length).toBe(1);
    const fullScale = all[0].currentMax!;
    expect((await listEntries(a.users.viewer, { currentMin: fullScale * 2 })).length).toBe(0);
    expect((await listEntries(a.users.viewer, { currentMin: fullScale / 2 })).length).toBe(1);
    expect((await listEntries(a.users.viewer, { currentMax: fullScale / 2 })).length).toBe(0);
    expect((await listEntries(a.users.viewer, { currentMin: fullScale / 2, currentMax: fullScale * 2 })).length).toBe(1);
    expect((await listEntries(a.users.viewer, { loadType: a.body.load.kind })).length).toBe(1);
    expect(await listEntries(other.users.lead)).toEqual([]);
  });

  it("starts a new scenario from a validated entry (designers and leads only)", async () => {
    const a = await validatedEntry("start");
    await expect(startFromEntry(a.users.viewer, a.entryId)).rejects.toMatchObject({ status: 403 });
    const { scenarioId, revisionId } = await startFromEntry(a.users.designer, a.entryId, "Second valve channel");
    const s = await db()("scenarios").where({ id: scenarioId }).first();
    const rev = await db()("revisions").where({ id: revisionId }).first();
    expect(s).toMatchObject({ title: "Second valve channel", owner_id: a.users.designer.id, team_id: a.team.id, current_revision_id: revisionId });
    expect(rev).toMatchObject({ number: 1, parent_id: a.revisionId });
    expect(rev.body).toEqual(a.body);
  });

  it("the submitter withdraws a submission of a newer revision; a viewer cannot", async () => {
    const a = await submittedEntry("withdraw");
    const [rev2] = await db()("revisions").insert({ scenario_id: a.scenarioId, number: 2, parent_id: a.revisionId, author_id: a.users.designer.id, body: JSON.stringify(a.body) }).returning("*");
    await db()("scenarios").where({ id: a.scenarioId }).update({ current_revision_id: rev2.id });
    // Evidence must belong to the submitted revision: the revision-1 trace is refused.
    await expect(submitForValidation(a.users.designer, a.scenarioId, submission(a.traceId))).rejects.toMatchObject({ status: 400 });
    const t2 = await storeTrace(a.users.designer, { scenarioId: a.scenarioId, label: "rev 2 step", fileName: "s2.csv", parsed: parseTraceCsv(capture()), settings: {} });
    expect(t2.revisionNumber).toBe(2);
    const r = await submitForValidation(a.users.designer, a.scenarioId, { ...submission(a.traceId), traceIds: [t2.id], comparisons: [] });
    expect(r.entryId).not.toBe(a.entryId);
    await expect(changeEntryStatus(a.users.viewer, r.entryId, "withdraw")).rejects.toMatchObject({ status: 403 });
    expect((await changeEntryStatus(a.users.designer, r.entryId, "withdraw")).status).toBe("draft");
    await expect(changeEntryStatus(a.users.designer, r.entryId, "withdraw")).rejects.toMatchObject({ status: 409 });
    expect((await getEntry(a.users.lead, r.entryId)).events.map((e) => e.action)).toEqual(["created", "submitted", "withdrawn"]);
  });

  it("only leads set tolerances; the lead retires the entry; retired entries are no starting point", async () => {
    const a = await validatedEntry("retire");
    const other = await makeTeam("retire-other");
    await expect(setTeamTolerances(a.users.designer, DEFAULT_TOLERANCES)).rejects.toMatchObject({ status: 403 });
    await setTeamTolerances(a.users.lead, { ...DEFAULT_TOLERANCES, overshootPts: 3 });
    expect((await getTeamTolerances(a.team.id)).overshootPts).toBe(3);
    expect((await getTeamTolerances(other.team.id)).overshootPts).toBe(DEFAULT_TOLERANCES.overshootPts);
    await changeEntryStatus(a.users.lead, a.entryId, "retire", "Superseded by rev 2.");
    await expect(startFromEntry(a.users.designer, a.entryId)).rejects.toMatchObject({ status: 409 });
    expect(await mailTo(a.users.designer.email, /^Retired:/)).toHaveLength(1);
  });
});
