import { describe, expect, it } from "vitest";
import { SCHEMA_VERSION, TEMPLATES, defaultScenario, demoScenarios, scenarioSchema, tryUpgradeScenario, upgradeScenario } from "@/lib/design";

describe("scenario schema and upgrades", () => {
  it("every template's default and every demo is a valid current-version scenario", () => {
    for (const t of TEMPLATES) expect(scenarioSchema.safeParse(defaultScenario(t.id)).success).toBe(true);
    for (const d of demoScenarios()) {
      expect(d.body.schemaVersion).toBe(SCHEMA_VERSION);
      expect(scenarioSchema.safeParse(d.body).success).toBe(true);
      expect(d.body.template).toBe(d.template);
    }
  });
  it("opens version 0 records (template only) as the template's starting scenario", () => {
    const s = upgradeScenario({ schemaVersion: 0, template: "sink-nmos" });
    expect(s).toEqual(defaultScenario("sink-nmos"));
  });
  it("fills fields a stored scenario lacks and keeps the ones it has", () => {
    const stored = JSON.parse(JSON.stringify(demoScenarios()[0].body));
    delete stored.tolerances.accuracyTarget;
    delete stored.studies;
    const s = upgradeScenario(stored);
    expect(s.tolerances.accuracyTarget).toBe(defaultScenario("sink-npn").tolerances.accuracyTarget);
    expect(s.parts.compCapacitor).toBe(demoScenarios()[0].body.parts.compCapacitor);
  });
  it("names the field that is wrong", () => {
    const bad = structuredClone(defaultScenario("sink-npn")) as unknown as { parts: { senseResistor: unknown } };
    bad.parts.senseResistor = -1;
    expect(tryUpgradeScenario(bad)).toEqual({ ok: false, error: "parts.senseResistor: Sense resistor must be above zero" });
    expect(() => upgradeScenario({ schemaVersion: 1, template: "buck" })).toThrow(/template: must be one of/);
    expect(() => upgradeScenario({ schemaVersion: 99, template: "sink-npn" })).toThrow(/newer/);
    expect(() => upgradeScenario("text")).toThrow(/JSON object/);
  });
  it("cross-field rules name the field to change", () => {
    const s = structuredClone(defaultScenario("sink-npn"));
    s.pass.kind = "nmos";
    expect(tryUpgradeScenario(s)).toEqual({ ok: false, error: "pass.kind: The sink-npn template needs a npn pass device (got nmos)" });
    const t = structuredClone(defaultScenario("sink-npn"));
    t.stimulus.stepTime = t.stimulus.stopTime;
    t.load.resistanceMin = 100;
    const r = tryUpgradeScenario(t);
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.error).toContain("load.resistanceMin: Minimum load resistance is above the maximum");
      expect(r.error).toContain("stimulus.stepTime: The step must happen before the stop time");
    }
  });
});
