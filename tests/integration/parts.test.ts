import { afterAll, beforeAll, describe, expect, it } from "vitest";

import { db } from "@/lib/db/knex";
import { getPart, getPartVersion, latestVersions, listParts } from "@/lib/db/parts";
import { listAudit } from "@/lib/db/audit";
import { getRevision } from "@/lib/db/revisions";
import { createPart, exportParts, importParts, retire, updatePart } from "@/lib/parts/workflow";
import { createScenario } from "@/lib/scenarios/save";
import { applyPart, partsFileSchema } from "@/lib/design/part-records";
import { opampPreset } from "@/lib/design/presets";
import { defaultScenario } from "@/lib/design/templates";
import { upgradeScenario } from "@/lib/design/upgrade";
import { runLoopGain } from "@/lib/design/run";
import { DomainError } from "@/lib/errors";
import * as partsRoute from "@/app/api/parts/route";
import * as partRoute from "@/app/api/parts/[id]/route";
import { closeDb, ctx, makeFixture, request, type Fixture } from "./support/fixtures";

let f: Fixture;
beforeAll(async () => {
  f = await makeFixture("parts");
});
afterAll(closeDb);

function amp(name: string, over: Record<string, unknown> = {}) {
  const { preset: _p, part: _r, ...values } = opampPreset("General 1 MHz single-supply");
  return { kind: "opamp" as const, name, values: { ...values, ...over } };
}

async function refused(p: Promise<unknown>): Promise<DomainError> {
  const e = await p.then(() => null, (x: unknown) => x);
  expect(e).toBeInstanceOf(DomainError);
  return e as DomainError;
}

describe("parts: schema", () => {
  it("refuses bad values naming the field, and a pass device's fields on an op-amp", async () => {
    const e = await refused(createPart(f.designer, amp("Bad GBW", { GBW: -1 })));
    expect([e.status, e.message]).toEqual([400, expect.stringMatching(/^values\.GBW: /)]);
    const extra = await refused(createPart(f.designer, amp("Extra", { betaF: 100 })));
    expect(extra.message).toMatch(/values/);
    expect(extra.message).toMatch(/betaF/);
    const kind = await refused(createPart(f.designer, { kind: "diode", name: "x", values: {} }));
    expect(kind.message).toMatch(/^kind: /);
    expect((await listParts(f.designer)).map((p) => p.name)).not.toContain("Bad GBW");
  });
  it("answers 400 with the field through the API, and writes nothing", async () => {
    const r = await partsRoute.POST(await request("POST", "/api/parts", f.designer, amp("Api bad", { slewRate: "fast" })), ctx({}));
    expect(r.status).toBe(400);
    expect(((await r.json()) as { error: string }).error).toMatch(/values\.slewRate/);
    expect((await listParts(f.designer, { q: "Api bad" })).length).toBe(0);
  });
  it("refuses a second live part of the same kind and name (409), not a retired one's name", async () => {
    const a = await createPart(f.designer, amp("Twin amp"));
    expect((await refused(createPart(f.lead, amp("twin AMP")))).status).toBe(409);
    await retire(f.lead, a.id);
    const b = await createPart(f.designer, amp("Twin amp"));
    expect(b.id).not.toBe(a.id);
  });
});

describe("parts: versions, audit and retirement", () => {
  it("every change is a new version; earlier versions keep their values; each change is audited", async () => {
    const p = await createPart(f.designer, amp("Versioned amp"));
    expect(p.currentVersion).toBe(1);
    const v2 = await updatePart(f.lead, p.id, { values: amp("", { GBW: 3e6 }).values, note: "faster part" });
    expect(v2.currentVersion).toBe(2);
    const d = await getPart(f.viewer, p.id);
    expect(d.versions.map((v) => [v.version, v.values.GBW])).toEqual([[2, 3e6], [1, 1e6]]);
    expect(d.values.GBW).toBe(3e6);
    expect((await getPartVersion(f.viewer, p.id, 1)).values.GBW).toBe(1e6);
    const log = (await listAudit(f.lead.teamId, 100)).filter((a) => a.subjectId === p.id).map((a) => a.action);
    expect(log).toEqual(["part.version", "part.create"]);
    await retire(f.designer, p.id);
    expect((await refused(updatePart(f.designer, p.id, { values: amp("").values }))).status).toBe(409);
    expect((await listParts(f.viewer)).map((x) => x.id)).not.toContain(p.id);
    expect((await listParts(f.viewer, { retired: "only" })).map((x) => x.id)).toContain(p.id);
    expect((await listAudit(f.lead.teamId, 100)).filter((a) => a.subjectId === p.id)[0]!.action).toBe("part.retire");
  });
  it("a PATCH with the other kind's values is refused naming the field", async () => {
    const p = await createPart(f.designer, amp("Kind-kept amp"));
    const r = await partRoute.PATCH(await request("PATCH", `/api/parts/${p.id}`, f.designer, { values: { kind: "npn" } }), ctx({ id: p.id }));
    expect(r.status).toBe(400);
    expect(((await r.json()) as { error: string }).error).toMatch(/^values\./);
    expect((await getPart(f.designer, p.id)).currentVersion).toBe(1);
  });
  it("viewers read but cannot create, version or retire; another team sees 404", async () => {
    const p = await createPart(f.designer, amp("Guarded amp"));
    expect((await refused(createPart(f.viewer, amp("Viewer amp")))).status).toBe(403);
    expect((await refused(updatePart(f.viewer, p.id, { values: amp("").values }))).status).toBe(403);
    expect((await refused(retire(f.viewer, p.id))).status).toBe(403);
    expect((await refused(getPart(f.outsider, p.id))).status).toBe(404);
    expect((await refused(updatePart(f.outsider, p.id, { values: amp("").values }))).status).toBe(404);
    expect((await getPart(f.viewer, p.id)).name).toBe("Guarded amp");
  });
});

describe("parts: import and export (our own JSON shape)", () => {
  it("exports the team's live parts and imports them into another team", async () => {
    await createPart(f.designer, amp("Export amp"));
    const file = await exportParts(f.viewer, "opamp");
    expect(partsFileSchema.safeParse(file).success).toBe(true);
    expect(file.parts.map((p) => p.name)).toContain("Export amp");
    const got = await importParts(f.outsider, { ...file, parts: file.parts.filter((p) => p.name === "Export amp") });
    expect(got.map((p) => [p.name, p.currentVersion])).toEqual([["Export amp", 1]]);
  });
  it("a bad file names the field and imports nothing; a name clash imports nothing", async () => {
    const before = (await listParts(f.designer)).length;
    const bad = { format: "quell-parts", formatVersion: 1, parts: [amp("Import ok"), amp("Import bad", { Aol: "lots" })] };
    const e = await refused(importParts(f.designer, bad));
    expect([e.status, e.message]).toEqual([400, expect.stringMatching(/^parts\.1\.values\.Aol: /)]);
    const clash = { format: "quell-parts", formatVersion: 1, parts: [amp("Import fresh"), amp("Guarded amp")] };
    expect((await refused(importParts(f.designer, clash))).message).toMatch(/^parts\.1\.name/);
    expect((await listParts(f.designer)).length).toBe(before);
    const wrong = await partsRoute.POST(await request("POST", "/api/parts", f.designer, { format: "other", parts: [] }), ctx({}));
    expect(wrong.status).toBe(400);
    expect(((await wrong.json()) as { error: string }).error).toMatch(/^format: /);
  });
});

describe("a revision made with version 1 reproduces after version 2 exists", () => {
  it("stores the values and the part's id and version; the update offer sees version 2", async () => {
    const p = await createPart(f.designer, amp("Reproducible amp", { GBW: 2e6 }));
    const v1 = await getPartVersion(f.designer, p.id, 1);
    const body = applyPart(defaultScenario("sink-npn"), v1);
    const sc = await createScenario(f.designer, { title: "Made with v1", template: "sink-npn", body });
    const before = runLoopGain(upgradeScenario((await getRevision(f.designer, sc.revisionId)).body));
    await updatePart(f.designer, p.id, { values: amp("", { GBW: 8e6 }).values });
    const stored = upgradeScenario((await getRevision(f.designer, sc.revisionId)).body);
    expect(stored.opamp.part).toEqual({ id: p.id, version: 1 });
    expect(stored.opamp.GBW).toBe(2e6);
    expect(stored.opamp.preset).toBe("Reproducible amp");
    // the same loop as when it was saved (deterministic engine: the same netlist gives the same numbers)
    const after = runLoopGain(stored);
    expect(after.phaseMarginDeg).toBe(before.phaseMarginDeg);
    expect(after.crossoverHz).toBe(before.crossoverHz);
    // and the workbench's offer: a newer version exists
    expect((await latestVersions(f.designer, [p.id]))[p.id]).toEqual({ version: 2, name: "Reproducible amp", retired: false });
    // another team learns nothing of it
    expect(await latestVersions(f.outsider, [p.id])).toEqual({});
    // the stored row is the body as saved
    const raw = await db()("revisions").where({ id: sc.revisionId }).first();
    expect(raw.body.opamp.part.version).toBe(1);
  });
});
