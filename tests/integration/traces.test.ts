import { afterAll, beforeAll, describe, expect, it } from "vitest";


import { randomUUID } from "node:crypto";
import { db } from "@/lib/db/knex";
import type { CurrentUser, Role } from "@/lib/shared/roles";
import { correctTraceChannel, deleteTrace, getTrace, listTraces, storeTrace, decodeFloat64, encodeFloat64 } from "@/lib/db/traces";
import { channelSettings } from "@/lib/traces/units";
import { parseTraceCsv } from "@/lib/traces";

/** A team of our own per run (lead, designer, viewer) and one scenario with revision 1; plus an outsider team. */
async function makeTeam(tag: string) {
  const suffix = randomUUID().slice(0, 8);
  const [team] = await db()("teams").insert({ name: `Trace bench ${tag} ${suffix}` }).returning("*");
  const users: Record<Role, CurrentUser> = {} as Record<Role, CurrentUser>;
  for (const role of ["lead", "designer", "viewer"] as Role[]) {
    const email = `${role}.${suffix}@traces.test`;
    const [u] = await db()("users").insert({ email, name: `${role} ${suffix}`, password_hash: "x", current_team_id: team.id }).returning("*");
    await db()("memberships").insert({ team_id: team.id, user_id: u.id, role });
    users[role] = { id: u.id, email, name: u.name, teamId: team.id, teamName: team.name, role };
  }
  const [s] = await db()("scenarios").insert({ team_id: team.id, owner_id: users.designer.id, title: `Coil driver ${suffix}`, template: "sink-npn" }).returning("*");
  const [rev] = await db()("revisions").insert({ scenario_id: s.id, number: 1, author_id: users.designer.id, body: JSON.stringify({ schemaVersion: 0, template: "sink-npn" }) }).returning("*");
  await db()("scenarios").where({ id: s.id }).update({ current_revision_id: rev.id });
  return { team, users, scenarioId: s.id as string, revisionId: rev.id as string };
}

/** A 2-channel capture: time in µs, CH1 in mV across a 0.1 Ω sense (→ A), CH2 in V. Values chosen by the test. */
function capture(n = 200): string {
  const lines = ["Sample Interval,1e-6", "Time (us),CH1 (mV),CH2 (V)"];
  for (let k = 0; k < n; k++) lines.push(`${k - 20},${k < 20 ? 0 : 75 * (1 - Math.exp(-(k - 20) / 15))},${k < 20 ? 0 : 5}`);
  return lines.join("\n");
}

describe("bench trace storage", () => {
  let a: Awaited<ReturnType<typeof makeTeam>>;
  let other: Awaited<ReturnType<typeof makeTeam>>;
  beforeAll(async () => {
    a = await makeTeam("A");
    other = await makeTeam("B");
  });
  afterAll(async () => {
    await db().destroy();
    (globalThis as { quellKnex?: unknown }).quellKnex = undefined;
  });

  it("stores float64 samples bit-exactly (little-endian round trip)", () => {
    const v = Float64Array.from([0, -0, 1e-300, Math.PI, -2.5e12, Number.MIN_VALUE]);
    expect(Array.from(decodeFloat64(encodeFloat64(v)))).toEqual(Array.from(v));
  });

  it("stores a parsed capture against the current revision and returns the same samples", async () => {
    const parsed = parseTraceCsv(capture(), { channels: [{ scale: 1 / 0.1, unit: "A", name: "Load current" }, {}] });
    const saved = await storeTrace(a.users.designer, {
      scenarioId: a.scenarioId, label: "Step 0→750 mA", fileName: "scope.csv", parsed, settings: { senseResistor: 0.1, probe: "x1" },
    });
    expect(saved).toMatchObject({
      revisionId: a.revisionId, revisionNumber: 1, sampleCount: 200, uploaderId: a.users.designer.id, label: "Step 0→750 mA",
      settings: { senseResistor: 0.1, probe: "x1" },
    });
    expect(saved.channels).toEqual([
      { name: "Load current", unit: "A", sourceUnit: "mV", scale: 1e-3 / 0.1 },
      { name: "CH2", unit: "V", sourceUnit: "V", scale: 1 },
    ]);
    // 200 samples 1 µs apart span 199 µs
    expect(saved.duration).toBeCloseTo(199e-6, 12);

    const back = await getTrace(a.users.viewer, saved.id);
    expect(Array.from(back.time)).toEqual(Array.from(parsed.time));
    expect(Array.from(back.values[0])).toEqual(Array.from(parsed.channels[0].values));
    expect(Array.from(back.values[1])).toEqual(Array.from(parsed.channels[1].values));
    // 75 mV across 0.1 Ω at the end ≈ 0.75 A (Ohm's law), less e^{−179/15} of the exponential
    expect(back.values[0][199]).toBeCloseTo(0.75 * (1 - Math.exp(-179 / 15)), 12);

    const audit = await db()("audit_log").where({ subject_id: saved.id, action: "trace.upload" }).first();
    expect(audit).toBeTruthy();
    const listed = await listTraces(a.users.viewer, a.scenarioId);
    expect(listed.map((t) => t.id)).toContain(saved.id);
  });

  it("refuses viewers, other teams and foreign revisions", async () => {
    const parsed = parseTraceCsv(capture(30));
    await expect(storeTrace(a.users.viewer, { scenarioId: a.scenarioId, label: "x", fileName: "x.csv", parsed, settings: {} })).rejects.toMatchObject({ status: 403 });
    await expect(storeTrace(other.users.designer, { scenarioId: a.scenarioId, label: "x", fileName: "x.csv", parsed, settings: {} })).rejects.toMatchObject({ status: 404 });
    await expect(
      storeTrace(a.users.designer, { scenarioId: a.scenarioId, revisionId: other.revisionId, label: "x", fileName: "x.csv", parsed, settings: {} }),
    ).rejects.toMatchObject({ status: 400 });
    const saved = await storeTrace(a.users.designer, { scenarioId: a.scenarioId, label: "y", fileName: "y.csv", parsed, settings: {} });
    await expect(getTrace(other.users.lead, saved.id)).rejects.toMatchObject({ status: 404 });
    await expect(listTraces(other.users.lead, a.scenarioId)).rejects.toMatchObject({ status: 404 });
    await expect(deleteTrace(other.users.lead, saved.id)).rejects.toMatchObject({ status: 404 });
  });

  it("lets the uploader or a lead delete, not another designer or a viewer", async () => {
    const parsed = parseTraceCsv(capture(30));
    const t1 = await storeTrace(a.users.designer, { scenarioId: a.scenarioId, label: "t1", fileName: "t1.csv", parsed, settings: {} });
    const t2 = await storeTrace(a.users.lead, { scenarioId: a.scenarioId, label: "t2", fileName: "t2.csv", parsed, settings: {} });
    await expect(deleteTrace(a.users.viewer, t1.id)).rejects.toMatchObject({ status: 403 });
    await expect(deleteTrace(a.users.designer, t2.id)).rejects.toMatchObject({ status: 403 });
    await deleteTrace(a.users.designer, t1.id);
    await deleteTrace(a.users.lead, t2.id);
    await expect(getTrace(a.users.lead, t1.id)).rejects.toMatchObject({ status: 404 });
    expect(await db()("audit_log").where({ subject_id: t2.id, action: "trace.delete" }).first()).toBeTruthy();
  });

  it("a channel's unit and scale are corrected after upload: a new settings version, rescaled samples, audited", async () => {
    // The capture without units on CH1: the numbers are millivolts across a 0.1 Ω sense resistor.
    const text = capture().replace("CH1 (mV)", "CH1");
    const t = await storeTrace(a.users.designer, { scenarioId: a.scenarioId, label: "no unit", fileName: "c.csv", parsed: parseTraceCsv(text), settings: {} });
    expect(t.channels[0]).toMatchObject({ unit: "", scale: 1 });
    expect(t.settingsVersion).toBe(0);
    await expect(correctTraceChannel(a.users.viewer, t.id, 0, channelSettings("mV", 10, "A"))).rejects.toMatchObject({ status: 403 });
    await expect(correctTraceChannel(other.users.lead, t.id, 0, channelSettings("mV", 10, "A"))).rejects.toMatchObject({ status: 404 });
    await expect(correctTraceChannel(a.users.designer, t.id, 5, channelSettings("mV", 10, "A"))).rejects.toMatchObject({ status: 400 });
    // mV across 0.1 Ω: × 1e-3 (SI prefix) × 1/0.1 Ω (Ohm's law) = × 0.01 A per number
    const fixed = await correctTraceChannel(a.users.designer, t.id, 0, channelSettings("mV", 1 / 0.1, "A"));
    expect(fixed.channels[0]).toMatchObject({ unit: "A", sourceUnit: "mV" });
    expect(fixed.channels[0].scale).toBeCloseTo(0.01, 15);
    expect(fixed.settingsVersion).toBe(1);
    const data = await getTrace(a.users.viewer, t.id);
    // row 120 of the file: 75·(1 − e^(−100/15)) mV = 74.9059 mV → 0.749059 A (closed form of the capture)
    expect(data.values[0][120]).toBeCloseTo(0.01 * 75 * (1 - Math.exp(-100 / 15)), 12);
    expect(data.values[1][120]).toBe(5); // CH2 untouched
    const second = await correctTraceChannel(a.users.lead, t.id, 0, channelSettings("A"));
    expect(second.settingsVersion).toBe(2);
    expect((await getTrace(a.users.viewer, t.id)).values[0][120]).toBeCloseTo(75 * (1 - Math.exp(-100 / 15)), 12);
    const audits = await db()("audit_log").where({ subject_id: t.id, action: "trace.correct_units" }).orderBy("id");
    expect(audits.map((r) => r.detail.version)).toEqual([1, 2]);
    expect(audits[0].detail).toMatchObject({ channel: 0, from: { unit: "" }, to: { unit: "A", sourceUnit: "mV" } });
  });
});
