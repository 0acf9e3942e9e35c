import { afterAll, beforeAll, describe, expect, it } from "vitest";

import { db } from "@/lib/db/knex";
import {
  getScenarioDetail,
  listScenarios,
  restoreScenario,
  scenarioFacets,
  softDeleteScenario,
  updateScenarioMeta,
} from "@/lib/db/scenarios";
import { forkRevision, getRevision, listRevisions } from "@/lib/db/revisions";
import { createScenario, saveRevision } from "@/lib/scenarios/save";
import { addComment, listComments } from "@/lib/db/comments";
import { createPublicLink, listShareLinks, openPublicLink, revokePublicLink } from "@/lib/db/shareLinks";
import { listAudit } from "@/lib/db/audit";
import { DomainError } from "@/lib/errors";
import { MAX_SCENARIO_BYTES } from "@/lib/design/scenarioBody";
import { defaultScenario } from "@/lib/design/templates";
import { closeDb, makeFixture, scenarioBody, type Fixture } from "./support/fixtures";

// Runs against the real PostgreSQL migrated by the test command; each file works in its own throwaway team.
let f: Fixture;
beforeAll(async () => {
  f = await makeFixture("scen");
});
afterAll(closeDb);

async function refused(p: Promise<unknown>, status: number) {
  const e = await p.then(() => null, (x: unknown) => x);
  expect(e).toBeInstanceOf(DomainError);
  expect((e as DomainError).status).toBe(status);
}

describe("revisions: save with optimistic concurrency", () => {
  it("writes a new immutable revision on top of the current one", async () => {
    const r = await saveRevision(f.designer, {
      scenarioId: f.scenarioId,
      baseRevisionId: f.revisionId,
      note: "Sense resistor to 0.5 Ω",
      body: scenarioBody({ senseResistor: 0.5, baseResistor: 470 }),
    });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.number).toBe(2);
    const first = await getRevision(f.viewer, f.revisionId);
    expect(first.body).toEqual(scenarioBody({ senseResistor: 1, baseResistor: 470 }));
    const second = await getRevision(f.viewer, r.revisionId);
    expect((second.body as { parts: { senseResistor: number } }).parts.senseResistor).toBe(0.5);
    expect(second.parentId).toBe(f.revisionId);
    expect(second.note).toBe("Sense resistor to 0.5 Ω");
    const detail = await getScenarioDetail(f.viewer, f.scenarioId);
    expect(detail.revisionId).toBe(r.revisionId);
    expect(detail.revisionNumber).toBe(2);
  });

  it("refuses a save on a stale base and returns the current revision instead of overwriting", async () => {
    const before = await getScenarioDetail(f.lead, f.scenarioId);
    const r = await saveRevision(f.lead, { scenarioId: f.scenarioId, baseRevisionId: f.revisionId, note: "late", body: scenarioBody({ senseResistor: 2 }) });
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.conflict?.current.revisionId).toBe(before.revisionId);
    expect(r.conflict?.current.number).toBe(before.revisionNumber);
    expect(r.conflict?.current.author).toBe(f.designer.name);
    expect(r.conflict?.current.body).toEqual(before.body);
    const after = await getScenarioDetail(f.lead, f.scenarioId);
    expect(after.revisionId).toBe(before.revisionId);
    const revs = await listRevisions(f.lead, f.scenarioId);
    expect(revs.map((x) => x.number)).toEqual([2, 1]);
  });

  it("lets exactly one of two simultaneous saves on the same base win", async () => {
    const base = (await getScenarioDetail(f.designer, f.scenarioId)).revisionId!;
    const results = await Promise.all(
      [1, 2].map((k) => saveRevision(k === 1 ? f.designer : f.lead, { scenarioId: f.scenarioId, baseRevisionId: base, note: `race ${k}`, body: scenarioBody({ senseResistor: k }) })),
    );
    expect(results.filter((r) => r.ok)).toHaveLength(1);
    expect(results.filter((r) => !r.ok && r.conflict)).toHaveLength(1);
  });

  it("refuses viewers, other teams, invalid scenarios and bodies over the size limit", async () => {
    await refused(saveRevision(f.viewer, { scenarioId: f.scenarioId, baseRevisionId: f.revisionId, note: "", body: scenarioBody() }), 403);
    await refused(saveRevision(f.outsider, { scenarioId: f.scenarioId, baseRevisionId: f.revisionId, note: "", body: scenarioBody() }), 404);
    const base = (await getScenarioDetail(f.designer, f.scenarioId)).revisionId!;
    await refused(saveRevision(f.designer, { scenarioId: f.scenarioId, baseRevisionId: base, note: "", body: [1, 2] }), 400);
    // The design layer's schema names the bad field.
    const negative = saveRevision(f.designer, { scenarioId: f.scenarioId, baseRevisionId: base, note: "", body: scenarioBody({ senseResistor: -1 }) });
    await refused(negative, 400);
    await expect(saveRevision(f.designer, { scenarioId: f.scenarioId, baseRevisionId: base, note: "", body: scenarioBody({ senseResistor: -1 }) })).rejects.toThrow(/parts\.senseResistor/);
    await refused(saveRevision(f.designer, { scenarioId: f.scenarioId, baseRevisionId: base, note: "", body: { blob: "x".repeat(MAX_SCENARIO_BYTES) } }), 413);
  });
});

describe("scenarios: table, create, fork, delete and restore", () => {
  it("creates from a template with a first revision, owned by the creator", async () => {
    const c = await createScenario(f.designer, { title: "Grow-light spare channel", template: "sink-nmos" });
    const d = await getScenarioDetail(f.designer, c.id);
    expect(d.ownerId).toBe(f.designer.id);
    expect(d.revisionNumber).toBe(1);
    expect(d.template).toBe("sink-nmos");
    expect(d.body).toEqual(defaultScenario("sink-nmos")); // the design layer's starting scenario
    await refused(createScenario(f.viewer, { title: "x", template: "sink-npn" }), 403);
  });

  it("searches, filters, sorts and pages within the team only", async () => {
    for (const t of ["Alpha coil", "Beta coil", "Gamma lamp"]) await createScenario(f.lead, { title: t, template: "howland" });
    const coil = await listScenarios(f.viewer, { q: "COIL" });
    expect(coil.items.map((s) => s.title).sort()).toEqual(["Alpha coil", "Beta coil"]);
    const byLead = await listScenarios(f.viewer, { owner: f.lead.id, sort: "title", dir: "desc" });
    expect(byLead.items.map((s) => s.title)).toEqual(["Gamma lamp", "Beta coil", "Alpha coil"]);
    const mine = await listScenarios(f.designer, { owner: "me" });
    expect(mine.items.every((s) => s.ownerId === f.designer.id)).toBe(true);
    const nmos = await listScenarios(f.viewer, { template: "sink-nmos" });
    expect(nmos.items.map((s) => s.title)).toEqual(["Grow-light spare channel"]);
    const page1 = await listScenarios(f.viewer, { sort: "title", pageSize: 2, page: 1 });
    const page2 = await listScenarios(f.viewer, { sort: "title", pageSize: 2, page: 2 });
    expect(page1.total).toBe(page2.total);
    expect(page1.items).toHaveLength(2);
    expect(new Set([...page1.items, ...page2.items].map((s) => s.id)).size).toBe(page1.items.length + page2.items.length);
    const outside = await listScenarios(f.outsider, {});
    expect(outside.items.some((s) => s.title === "Alpha coil")).toBe(false);
    const facets = await scenarioFacets(f.lead.teamId);
    expect(facets.templates).toEqual(expect.arrayContaining(["howland", "sink-nmos", "sink-npn"]));
    // % and _ in a search are literal characters, not wildcards.
    expect((await listScenarios(f.viewer, { q: "%" })).total).toBe(0);
  });

  it("sets status and filters by it", async () => {
    await updateScenarioMeta(f.designer, f.scenarioId, { status: "review" });
    const r = await listScenarios(f.viewer, { status: "review" });
    expect(r.items.map((s) => s.id)).toEqual([f.scenarioId]);
  });

  it("forks a revision into a new scenario of the forker, leaving the source alone", async () => {
    const src = await getScenarioDetail(f.designer, f.scenarioId);
    const fork = await forkRevision(f.lead, f.revisionId);
    const d = await getScenarioDetail(f.lead, fork.scenarioId);
    expect(d.ownerId).toBe(f.lead.id);
    expect(d.body).toEqual((await getRevision(f.lead, f.revisionId)).body);
    expect(d.title).toMatch(/\(fork\)$/);
    expect((await getScenarioDetail(f.designer, f.scenarioId)).revisionId).toBe(src.revisionId);
    await refused(forkRevision(f.viewer, f.revisionId), 403);
    await refused(forkRevision(f.outsider, f.revisionId), 404);
  });

  it("soft-deletes and restores for the owner or a lead only", async () => {
    const c = await createScenario(f.lead, { title: "To delete", template: "sink-npn" });
    await refused(softDeleteScenario(f.designer, c.id), 403); // not the owner, not a lead
    await softDeleteScenario(f.lead, c.id);
    expect((await listScenarios(f.viewer, {})).items.some((s) => s.id === c.id)).toBe(false);
    expect((await listScenarios(f.viewer, { deleted: true })).items.map((s) => s.id)).toContain(c.id);
    await refused(getScenarioDetail(f.viewer, c.id), 404);
    await restoreScenario(f.lead, c.id);
    expect((await listScenarios(f.viewer, {})).items.some((s) => s.id === c.id)).toBe(true);
    await refused(restoreScenario(f.lead, c.id), 409);
  });

  it("records the important actions in the audit log", async () => {
    const actions = (await listAudit(f.lead.teamId, 200)).map((a) => a.action);
    expect(actions).toEqual(expect.arrayContaining(["revision.save", "scenario.create", "scenario.fork", "scenario.delete", "scenario.restore"]));
  });
});

describe("comments", () => {
  it("lets every member comment, on a revision or the scenario, and hides them from other teams", async () => {
    const c = await addComment(f.viewer, f.scenarioId, { body: "  Ringing at 40 mH looks fine to me.  ", revisionId: f.revisionId });
    expect(c.body).toBe("Ringing at 40 mH looks fine to me.");
    expect(c.revisionNumber).toBe(1);
    const list = await listComments(f.designer, f.scenarioId);
    expect(list.map((x) => x.body)).toContain("Ringing at 40 mH looks fine to me.");
    await refused(addComment(f.viewer, f.scenarioId, { body: "   " }), 400);
    await refused(addComment(f.outsider, f.scenarioId, { body: "hello" }), 404);
    await refused(listComments(f.outsider, f.scenarioId), 404);
  });
});

describe("public share links", () => {
  it("stores only a hash of a 256-bit token, opens the revision, and says when revoked or expired", async () => {
    const { link, token } = await createPublicLink(f.designer, f.scenarioId, { revisionId: f.revisionId, days: 7 });
    expect(Buffer.from(token, "base64url").length * 8).toBeGreaterThanOrEqual(128);
    const row = await db()("share_links").where({ id: link.id }).first();
    expect(row.token_hash).not.toContain(token);
    expect(row.token_hash).toMatch(/^[0-9a-f]{64}$/);
    const open = await openPublicLink(token);
    expect(open.state).toBe("active");
    if (open.state === "active") expect(open.revision.id).toBe(f.revisionId);
    expect((await openPublicLink(token + "x")).state).toBe("unknown");

    await refused(revokePublicLink(f.viewer, f.scenarioId, link.id), 403);
    await revokePublicLink(f.lead, f.scenarioId, link.id);
    expect((await openPublicLink(token)).state).toBe("revoked");

    const second = await createPublicLink(f.lead, f.scenarioId, { days: 1 });
    await db()("share_links").where({ id: second.link.id }).update({ expires_at: new Date(Date.now() - 1000) });
    expect((await openPublicLink(second.token)).state).toBe("expired");
    const states = (await listShareLinks(f.viewer, f.scenarioId)).map((l) => l.state).sort();
    expect(states).toEqual(["expired", "revoked"]);
  });

  it("lets only the owner or a lead publish", async () => {
    const leadsOwn = await createScenario(f.lead, { title: "Lead's own", template: "sink-npn" });
    await refused(createPublicLink(f.designer, leadsOwn.id, { days: 7 }), 403);
    await refused(createPublicLink(f.viewer, f.scenarioId, { days: 7 }), 403);
    await refused(createPublicLink(f.outsider, f.scenarioId, { days: 7 }), 404);
  });
});
