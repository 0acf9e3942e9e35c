import { describe, expect, it } from "vitest";
import { defaultScenario, runChecks, upgradeScenario } from "@/lib/design";
import { worstDissipation } from "@/lib/design/check-formulas";
import { applyPart, describePartIssues, partInputSchema, partValuesFrom, partsFileSchema } from "@/lib/design/part-records";
import { valveCoilDemo } from "@/lib/design/demos";

const PART_ID = "7f1c2a34-5b6d-4e8f-9a0b-1c2d3e4f5a6b";

describe("part records: the values, the file and putting a part into a scenario", () => {
  it("a part's values are the scenario's fields without preset and link; extra or bad fields are named", () => {
    const values = partValuesFrom(defaultScenario("sink-npn"), "opamp");
    expect(partInputSchema.safeParse({ kind: "opamp", name: "Bench amp", values }).success).toBe(true);
    const bad = partInputSchema.safeParse({ kind: "opamp", name: "Bench amp", values: { ...values, GBW: 0 } });
    expect(bad.success).toBe(false);
    expect(describePartIssues(bad.error!)).toMatch(/^values\.GBW: /);
    const extra = partInputSchema.safeParse({ kind: "pass", name: "x", values: { ...partValuesFrom(defaultScenario("sink-npn"), "pass"), colour: "red" } });
    expect(describePartIssues(extra.error!)).toMatch(/colour/);
  });
  it("a parts file names the entry and the field of its first problem", () => {
    const good = { kind: "opamp", name: "A", values: partValuesFrom(defaultScenario("sink-npn"), "opamp") };
    const r = partsFileSchema.safeParse({ format: "quell-parts", formatVersion: 1, parts: [good, { ...good, name: "", values: good.values }] });
    expect(describePartIssues(r.error!)).toMatch(/^parts\.1\.name: /);
    expect(describePartIssues(partsFileSchema.safeParse({ format: "x", formatVersion: 1, parts: [good] }).error!)).toMatch(/^format: /);
  });
  it("applyPart puts the values, the name and the id and version into the scenario; the schema accepts it", () => {
    const values = { ...partValuesFrom(defaultScenario("sink-npn"), "opamp"), GBW: 4e6 };
    const s = applyPart(defaultScenario("sink-npn"), { id: PART_ID, version: 3, kind: "opamp", name: "Bench amp", values });
    expect(s.opamp).toMatchObject({ GBW: 4e6, preset: "Bench amp", part: { id: PART_ID, version: 3 } });
    expect(upgradeScenario(s).opamp.part).toEqual({ id: PART_ID, version: 3 });
    expect(() => applyPart(s, { id: PART_ID, version: 1, kind: "pass", name: "x", values: { kind: "npn" } })).toThrow(/^values\./);
  });
  it("version 1 scenarios open with the datasheet figures unknown, not the preset's", () => {
    const v1 = JSON.parse(JSON.stringify(valveCoilDemo()));
    v1.schemaVersion = 1;
    for (const k of ["supplyMin", "supplyMax", "swingCurrent", "part"]) delete v1.opamp[k];
    delete v1.pass.soaCornerVoltage;
    const s = upgradeScenario(v1);
    expect([s.opamp.supplyMin, s.opamp.supplyMax, s.opamp.swingCurrent, s.pass.soaCornerVoltage, s.opamp.part]).toEqual([null, null, null, null, null]);
    expect(runChecks(s).checks.map((r) => r.id)).not.toContain("opamp-supply");
  });
});

describe("checks from the datasheet figures", () => {
  it("the op-amp's supply range: 12 V in 3–32 V passes, 40 V fails (the rating, as given)", () => {
    const s = defaultScenario("sink-npn");
    s.opamp.supplyMin = 3;
    s.opamp.supplyMax = 32;
    s.supplies.opampPositive = 12;
    expect(runChecks(s).checks.find((r) => r.id === "opamp-supply")!.verdict).toBe("pass");
    s.supplies.opampPositive = 40;
    const row = runChecks(s).checks.find((r) => r.id === "opamp-supply")!;
    expect([row.verdict, row.value, row.limit]).toEqual(["fail", 40, 32]);
  });
  it("the swing figures' current: full-scale base current 0.491 A/βmin = 4.9 mA passes at 10 mA, warns at 2 mA", () => {
    // I = 5 V × (1k/50.9k) / 0.2 Ω = 0.4912 A; βmin 100 (the preset): Ib = 4.91 mA (closed form, written out here)
    const s = defaultScenario("sink-npn");
    s.opamp.swingCurrent = 0.01;
    const row = runChecks(s).checks.find((r) => r.id === "opamp-swing-current")!;
    expect(row.value).toBeCloseTo((5 * (1e3 / 50.9e3)) / 0.2 / 100, 9);
    expect(row.verdict).toBe("pass");
    s.opamp.swingCurrent = 0.002;
    expect(runChecks(s).checks.find((r) => r.id === "opamp-swing-current")!.verdict).toBe("warn");
  });
  it("beyond the SOA corner the allowed power falls by Vcorner/V (I ∝ V⁻², the second-breakdown line)", () => {
    const s = defaultScenario("sink-npn");
    s.pass.soaCornerVoltage = 5;
    const vDrop = worstDissipation(s).vDrop;
    expect(vDrop).toBeGreaterThan(5);
    const row = runChecks(s).checks.find((r) => r.id === "soa")!;
    const factor = Number(/× ([\d.]+)\)/.exec(row.detail)![1]);
    expect(factor).toBeCloseTo(5 / vDrop, 2);
    s.pass.soaCornerVoltage = null;
    expect(runChecks(s).checks.find((r) => r.id === "soa")!.detail).not.toMatch(/SOA corner/);
  });
});
