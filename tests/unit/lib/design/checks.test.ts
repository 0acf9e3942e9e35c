import { describe, expect, it } from "vitest";
import {
  baseCurrentError, defaultScenario, demoScenarios, dissipationMaximum, junctionTemperature, runChecks, runOperatingPoint,
  worstDissipation,
} from "@/lib/design";

describe("dissipation maximum (docs/references.md §7.2)", () => {
  it("fixed current: P = I·(Vs − I·(RL + Rs)), the table for I = 0.1 A, Vs = 12 V, Rs = 10 Ω", () => {
    const P = (rl: number) => 0.1 * (12 - 0.1 * (rl + 10));
    expect(P(0)).toBeCloseTo(1.1, 12);
    expect(P(10)).toBeCloseTo(1.0, 12);
    expect(P(50)).toBeCloseTo(0.6, 12);
    expect(P(100)).toBeCloseTo(0.1, 12);
  });
  it("variable current: maximum V²/4R at I* = V/2R when in range; at full current otherwise", () => {
    // RL = 50 Ω, Rs = 10 Ω, Vs = 12 V: I* = 0.1 A, P = 0.6 W.
    expect(dissipationMaximum(12, 60, 0.5)).toEqual({ power: 0.6, current: 0.1 });
    // I* beyond the range (full scale 0.05 A): P = 0.05·(12 − 0.05·60) = 0.45 W.
    expect(dissipationMaximum(12, 60, 0.05).power).toBeCloseTo(0.45, 12);
  });
  it("the scenario's worst case matches the closed form for a resistive load", () => {
    const s = defaultScenario("sink-npn");
    s.load.kind = "resistor";
    s.load.resistanceMin = 10;
    s.load.cable.length = 0;
    const w = worstDissipation(s);
    const exact = dissipationMaximum(s.supplies.load, 10 + s.parts.senseResistor, 1.0416666666666667);
    expect(w.power / exact.power).toBeCloseTo(1, 4);
  });
});

describe("junction temperature (docs/references.md §7.1 worked example)", () => {
  it("5 W, θjc 3, θcs 1, θsa 8 °C/W at 25 °C gives 85 °C", () => {
    const s = defaultScenario("sink-npn");
    s.pass.thetaJC = 3;
    s.thermal = { ...s.thermal, ambient: 25, thetaCS: 1, thetaSA: 8 };
    expect(junctionTemperature(s, 5).tj).toBeCloseTo(85, 12);
  });
  it("with no heatsink the bare package's θja applies", () => {
    const s = defaultScenario("sink-npn");
    s.thermal.thetaSA = null;
    expect(junctionTemperature(s, 1).tj).toBeCloseTo(s.thermal.ambient + s.pass.thetaJA, 12);
  });
});

describe("checks table", () => {
  it("base-current error term is 1/(β+1) for a BJT (Darlington: β² + 2β) and 0 for a MOSFET", () => {
    const npn = defaultScenario("sink-npn");
    expect(baseCurrentError(npn, 60)).toBeCloseTo(1 / 61, 15);
    const dar = defaultScenario("sink-darlington");
    expect(baseCurrentError(dar, 60)).toBeCloseTo(1 / (60 * 60 + 120 + 1), 15);
    expect(baseCurrentError(defaultScenario("sink-nmos"))).toBe(0);
  });
  it("every row carries numbers, a unit and its formula; the reference sink passes compliance", () => {
    const { checks } = runChecks(defaultScenario("sink-npn"));
    for (const r of checks) {
      expect(Number.isFinite(r.value)).toBe(true);
      expect(r.formula.length).toBeGreaterThan(5);
      expect(["pass", "warn", "fail"]).toContain(r.verdict);
    }
    expect(checks.find((r) => r.id === "compliance")!.verdict).toBe("pass");
  });
  it("too little supply fails compliance, and the op-amp limiting at the operating point fails", () => {
    const s = defaultScenario("sink-npn");
    s.supplies.load = 20; // 1.04 A × 24 Ω alone needs 25 V
    const { op } = runOperatingPoint(s);
    const { checks } = runChecks(s, op);
    expect(checks.find((r) => r.id === "compliance")!.verdict).toBe("fail");
    expect(checks.find((r) => r.id === "op-limiting")?.verdict).toBe("fail");
  });
  it("cautions: above 60 V, coil without clamp, laser, lithium cell, bare package — each deferring to local codes", () => {
    const s = defaultScenario("sink-npn");
    s.supplies.load = 72;
    s.load.clampDiode = false;
    s.load.laserEmitter = true;
    s.thermal.thetaSA = 20;
    const ids = runChecks(s).cautions.map((c) => c.id);
    expect(ids).toEqual(expect.arrayContaining(["voltage", "inductive", "laser", "bare-package"]));
    const cell = demoScenarios()[2].body;
    const cc = runChecks(cell).cautions;
    expect(cc.map((c) => c.id)).toContain("lithium");
    for (const c of [...runChecks(s).cautions, ...cc]) expect(c.text).toMatch(/local codes and licensed practice/);
  });
  it("cautions: a high-power LED string (1.5 A grow-light demo) gets the light caution; a 100 mA one does not", () => {
    // Threshold 350 mA: the common 1 W LED class (common practice, not a standard's limit).
    const grow = demoScenarios()[1].body;
    const caution = runChecks(grow).cautions.find((c) => c.id === "led-light");
    expect(caution?.text).toMatch(/IEC 62471/);
    expect(caution?.text).toMatch(/local codes and licensed practice/);
    const dim = structuredClone(grow);
    dim.stimulus.commandFullScale = grow.stimulus.commandFullScale * (0.1 / 1.5);
    expect(runChecks(dim).cautions.map((c) => c.id)).not.toContain("led-light");
  });
  it("the simulated current of the NPN sink lies inside the worst-case budget (op row passes)", () => {
    const s = defaultScenario("sink-npn");
    const { op } = runOperatingPoint(s);
    const { checks, budget } = runChecks(s, op);
    expect(checks.find((r) => r.id === "op-current")!.verdict).toBe("pass");
    expect(budget.rss).toBeLessThan(budget.worstCase);
  });
});
