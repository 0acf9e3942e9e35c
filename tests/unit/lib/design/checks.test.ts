import { describe, expect, it } from "vitest";
import {
  baseCurrentError, defaultScenario, demoScenarios, dissipationMaximum, fullScaleCurrent, junctionTemperature, runChecks,
  runOperatingPoint, worstDissipation,
} from "@/lib/design";

/**
 * The sink of docs/references.md §7.2: 12 V load supply, 10 Ω sense resistor, no cable, a resistive load of `rl` Ω,
 * and a full-scale current of 0.1 A (command divider k = 1/2, 2 V full scale: Iout = Vcommand·k/Rsense).
 */
function referenceSink72(rl: number) {
  const s = defaultScenario("sink-npn");
  s.supplies.load = 12;
  s.parts.senseResistor = 10;
  s.parts.dividerTop = 10e3;
  s.parts.dividerBottom = 10e3;
  s.stimulus.commandFullScale = 2;
  s.load.kind = "resistor";
  s.load.resistance = rl;
  s.load.resistanceMin = rl;
  s.load.resistanceMax = Math.max(rl, s.load.resistanceMax);
  s.load.cable.length = 0;
  return s;
}

describe("dissipation maximum (docs/references.md §7.2)", () => {
  it("the worst case over the command range: P = I·(Vs − I·RL − I·Rs) at full current while I* = Vs/2(RL+Rs) is beyond it", () => {
    // Full scale Iout = Vcommand·k/Rsense = 2 V × 1/2 / 10 Ω = 0.1 A (the textbook sink line).
    expect(fullScaleCurrent(referenceSink72(0))).toBeCloseTo(0.1, 12);
    // §7.2 table, I = 0.1 A, Vs = 12 V, Rs = 10 Ω: RL = 0 → 1.1 W, 10 → 1.0 W, 50 → 0.6 W (there I* = 0.1 A exactly).
    expect(worstDissipation(referenceSink72(0)).power).toBeCloseTo(1.1, 9);
    expect(worstDissipation(referenceSink72(10)).power).toBeCloseTo(1.0, 9);
    expect(worstDissipation(referenceSink72(50)).power).toBeCloseTo(0.6, 9);
  });
  it("below full scale when I* is in range: V²/4(RL+Rs) at I* (§7.2, the V²/4R bound)", () => {
    // RL = 100 Ω: I* = 12/(2·110) = 54.5 mA < 0.1 A, P = 144/440 = 0.327273 W (not the 0.1 W of the fixed 0.1 A).
    const w = worstDissipation(referenceSink72(100));
    expect(w.power).toBeCloseTo(144 / 440, 5);
    expect(w.current).toBeCloseTo(12 / 220, 3);
  });
  it("variable current: maximum V²/4R at I* = V/2R when in range; at full current otherwise", () => {
    // RL = 50 Ω, Rs = 10 Ω, Vs = 12 V: I* = 0.1 A, P = 0.6 W.
    expect(dissipationMaximum(12, 60, 0.5)).toEqual({ power: 0.6, current: 0.1 });
    // I* beyond the range (full scale 0.05 A): P = 0.05·(12 − 0.05·60) = 0.45 W.
    expect(dissipationMaximum(12, 60, 0.05).power).toBeCloseTo(0.45, 12);
  });
  it("the reference sink's worst case matches the closed form for a resistive load", () => {
    const s = defaultScenario("sink-npn");
    s.load.kind = "resistor";
    s.load.resistanceMin = 10;
    s.load.cable.length = 0;
    // Full scale from the sink line Iout = Vcommand·k/Rsense, k = Rbottom/(Rtop + Rbottom).
    const p = s.parts;
    const iFs = (s.stimulus.commandFullScale * p.dividerBottom) / (p.dividerTop + p.dividerBottom) / p.senseResistor;
    // §7.2: P(I) = I·(Vs − I·R) with R = RL + Rs is largest at I* = Vs/2R (P = Vs²/4R) when I* ≤ Ifs, else at Ifs.
    const vs = s.supplies.load;
    const r = 10 + p.senseResistor;
    const exact = vs / (2 * r) <= iFs ? (vs * vs) / (4 * r) : iFs * (vs - iFs * r);
    expect(worstDissipation(s).power / exact).toBeCloseTo(1, 4);
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
  it("every row carries a finite number and a verdict word; the reference sink passes compliance", () => {
    const { checks } = runChecks(defaultScenario("sink-npn"));
    for (const r of checks) {
      expect(Number.isFinite(r.value)).toBe(true);
      expect(["pass", "warn", "fail"]).toContain(r.verdict);
    }
    expect(checks.find((r) => r.id === "compliance")!.verdict).toBe("pass");
  });
  it("the dissipation and junction-temperature rows follow their closed forms (docs/references.md §7.2, §7.1)", () => {
    const s = referenceSink72(50);
    s.pass.thetaJC = 3;
    s.thermal = { ...s.thermal, ambient: 25, thetaCS: 1, thetaSA: 8 };
    const { checks } = runChecks(s);
    // §7.2: P = (Vs − I·RL − I·Rs)·I = (12 − 0.1·50 − 0.1·10)·0.1 = 0.6 W.
    expect(checks.find((r) => r.id === "dissipation")!.value).toBeCloseTo(0.6, 9);
    // §7.1: Tj = Ta + P·(θjc + θcs + θsa) = 25 + 0.6·(3 + 1 + 8) = 32.2 °C.
    expect(checks.find((r) => r.id === "junction-temperature")!.value).toBeCloseTo(32.2, 9);
    // Bare package: Tj = Ta + P·θja.
    s.thermal.thetaSA = null;
    s.pass.thetaJA = 62.5;
    expect(runChecks(s).checks.find((r) => r.id === "junction-temperature")!.value).toBeCloseTo(25 + 0.6 * 62.5, 9);
  });
  it("too little supply fails compliance, and the op-amp limiting at the operating point fails", () => {
    const s = defaultScenario("sink-npn");
    s.supplies.load = 10; // 0.49 A × 24 Ω alone needs 11.8 V
    const { op } = runOperatingPoint(s);
    const { checks } = runChecks(s, op);
    expect(checks.find((r) => r.id === "compliance")!.verdict).toBe("fail");
    expect(checks.find((r) => r.id === "op-limiting")?.verdict).toBe("fail");
  });
  it("cautions: above 60 V, coil without clamp, laser, lithium cell, bare package — each deferring to local codes", () => {
    const s = defaultScenario("sink-npn");
    s.supplies.load = 72;
    s.load.clamp = { kind: "none", zenerVoltage: 24 };
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
