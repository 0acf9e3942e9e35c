import { Matrix, solve } from "ml-matrix";
import { NAMES } from "@/lib/design/compile";
import { describe, expect, it } from "vitest";
import { compile, simulate, type AcResult, type Netlist, type TranResult } from "@/lib/sim";
import { defaultScenario, idealTransconductance, runLoopGain, runOperatingPoint, thermalVoltage, type Scenario } from "@/lib/design";
import { valveCoilDemo } from "@/lib/design/demos";
import { dampingFromPhaseMargin, loopMetrics, overshootFromDamping, stepMetrics } from "@/lib/design/metrics";
import { runSmallSignalStep, runStep } from "@/lib/design/run";

/**
 * The current loop's gain, broken between the op-amp's output and the base resistor (the compensation capacitor's
 * local loop stays closed), checked against outside references: an independent complex nodal solve written here
 * with ml-matrix, the closed-form two-pole loop, and the standard second-order relations between phase margin,
 * damping and overshoot (Ogata, Modern Control Engineering, ch. on transient response; docs/references.md §5a).
 */

/** A sink whose small-signal model is simple enough to write by hand: single-pole op-amp with Rout = 0, a BJT without
 * charges or Early effect, a resistive load. */
function handSolvableSink(): Scenario {
  const s = defaultScenario("sink-npn");
  s.opamp = { ...s.opamp, Rout: 0, fp2: null, slewRate: null, swingHigh: null, swingLow: null, Iout: null };
  s.pass = { ...s.pass, VA: null, Cje0: 0, Cjc0: 0, tauF: 0 };
  s.load = { ...s.load, kind: "resistor", extraCapacitance: 0, cable: { ...s.load.cable, length: 0 } };
  return s;
}

/**
 * Return ratio at the break, solved by hand: the op-amp's output (an ideal source, Rout = 0) drives the capacitor
 * only; a test voltage vt drives the base resistor's far end. Unknowns vb, ve, vinv, voa (complex, written as the
 * real 2n×2n system). The divider's node carries no signal (the command is an AC ground). T = −voa/vt.
 *   b:   (vt − vb)/Rb = gπ(vb − ve)
 *   e:   (gπ + gm)(vb − ve) = ve/Rs + (ve − vinv)/Rfb
 *   inv: (ve − vinv)/Rfb + jωCc(voa − vinv) = 0
 *   oa:  voa = −A(jω)·vinv,  A = Aol/(1 + jω/ωp),  ωp = 2π·GBW/Aol
 */
function handReturnRatio(s: Scenario, gm: number, gpi: number, f: number): [number, number] {
  const w = 2 * Math.PI * f;
  const { baseResistor: rb, senseResistor: rs, feedbackResistor: rfb, compCapacitor: cc } = s.parts;
  const aol = s.opamp.Aol, wp = (2 * Math.PI * s.opamp.GBW) / aol;
  // A = aol/(1 + j w/wp)
  const den = 1 + (w / wp) ** 2;
  const aRe = aol / den, aIm = (-aol * (w / wp)) / den;
  // Complex matrix M·x = b with x = [vb, ve, vinv, voa], vt = 1.
  const mr = [
    [1 / rb + gpi, -gpi, 0, 0],
    [-(gpi + gm), gpi + gm + 1 / rs + 1 / rfb, -1 / rfb, 0],
    [0, -1 / rfb, 1 / rfb, 0],
    [0, 0, aRe, 1],
  ];
  const mi = [
    [0, 0, 0, 0],
    [0, 0, 0, 0],
    [0, 0, w * cc, -w * cc],
    [0, 0, aIm, 0],
  ];
  const br = [1 / rb, 0, 0, 0];
  const n = 4;
  const big = Matrix.zeros(2 * n, 2 * n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      big.set(i, j, mr[i][j]); big.set(i, j + n, -mi[i][j]);
      big.set(i + n, j, mi[i][j]); big.set(i + n, j + n, mr[i][j]);
    }
  }
  const rhs = Matrix.columnVector([...br, 0, 0, 0, 0]);
  const x = solve(big, rhs);
  return [-x.get(3, 0), -x.get(3 + n, 0)];
}

describe("current loop broken at the base resistor", () => {
  it("equals an independent complex nodal solve of the linearised sink (ml-matrix, written in the test)", () => {
    const s = handSolvableSink();
    const { op } = runOperatingPoint(s);
    const q = op.devices[NAMES.pass] as { ic: number; ib: number };
    const vt = thermalVoltage(s.thermal.ambient);
    // forward-active transport model: gm = Ic/Vt, gπ = Ib/Vt (docs/references.md §1.3)
    const gm = q.ic / vt, gpi = q.ib / vt;
    const lg = runLoopGain(s, {}, { fStart: 1, fStop: 1e7, pointsPerDecade: 10 });
    const cur = lg.loops.current;
    expect(cur.loop).toBe("current");
    for (let k = 0; k < cur.freq.length; k++) {
      const [hr, hi] = handReturnRatio(s, gm, gpi, cur.freq[k]);
      const rel = Math.hypot(hr - cur.re[k], hi - cur.im[k]) / Math.hypot(hr, hi);
      expect(rel).toBeLessThan(1e-4);
    }
  });

  it("differs from the op-amp-output break when the compensation capacitor closes a local loop", () => {
    // The output-pin break sees the local loop (Ccomp around the op-amp) too: its crossover lies near the op-amp's
    // GBW, far above the current loop's, on the valve demo with 2.2 nF.
    const s = valveCoilDemo();
    s.parts.compCapacitor = 2.2e-9;
    const lg = runLoopGain(s);
    expect(lg.loops.local).not.toBeNull();
    expect(lg.loops.local!.crossoverHz!).toBeGreaterThan(10 * lg.crossoverHz!);
    expect(lg.crossoverHz).toBe(lg.loops.current.crossoverHz);
  });
});

describe("two-pole loop with a closed-form phase margin (a follower of a two-pole op-amp)", () => {
  // Unity-gain follower of A(s) = Aol/((1 + s/ωp)(1 + s/ω2)), Rout = 0: T = A exactly. Crossover solves |A(jωc)| = 1;
  // PM = 180° − atan(ωc/ωp) − atan(ωc/ω2) (closed form for a two-pole loop, Franco, Design with Operational
  // Amplifiers, ch. on stability — from memory, and it follows directly from T).
  const Aol = 1e5, GBW = 1e6, fp2 = 0.8e6;
  const fp = GBW / Aol;
  const magAt = (f: number) => Aol / Math.sqrt((1 + (f / fp) ** 2) * (1 + (f / fp2) ** 2));
  let lo = 1, hi = 1e8;
  for (let k = 0; k < 200; k++) { const mid = Math.sqrt(lo * hi); if (magAt(mid) > 1) lo = mid; else hi = mid; }
  const fc = Math.sqrt(lo * hi);
  const pmExact = 180 - (Math.atan(fc / fp) * 180) / Math.PI - (Math.atan(fc / fp2) * 180) / Math.PI;
  const netlist = (kind: "ac" | "tran", probe: boolean): Netlist => ({
    elements: [
      { kind: "vsource" as const, name: "in", nodes: ["in", "gnd"] as [string, string], dc: 0, ac: probe ? 0 : 1,
        wave: { shape: "pulse" as const, low: 0, high: 1e-3, delay: 1e-6, rise: 1e-9, fall: 1e-9, width: 1, period: null } },
      { kind: "opamp" as const, name: "amp", nodes: ["in", "fb", probe ? "o_pin" : "out", "vcc", "vee"] as [string, string, string, string, string],
        model: { Aol, GBW, fp2, Rout: 0 } },
      { kind: "vsource" as const, name: "vcc", nodes: ["vcc", "gnd"] as [string, string], dc: 15 },
      { kind: "vsource" as const, name: "vee", nodes: ["vee", "gnd"] as [string, string], dc: -15 },
      ...(probe ? [{ kind: "vsource" as const, name: "probe", nodes: ["out", "o_pin"] as [string, string], dc: 0, ac: 1 }] : []),
      { kind: "resistor" as const, name: "feedback", nodes: ["out", "fb"] as [string, string], value: 1 },
      { kind: "resistor" as const, name: "load", nodes: ["out", "gnd"] as [string, string], value: 10e3 },
    ],
    analysis: kind === "ac"
      ? { kind: "ac" as const, fStart: 1, fStop: 1e8, pointsPerDecade: 200 }
      : { kind: "tran" as const, tStop: 20e-6, tStep: 1e-9, maxStep: 2e-9, start: "op" as const },
  });

  it("loopMetrics on the engine's loop gain gives the closed-form phase margin and crossover", () => {
    // Voltage injection at an ideal source's output: T = −v(o_pin)/v(out) (Bode's return ratio).
    const r = simulate(netlist("ac", true)) as AcResult;
    const n = r.freq.length;
    const re = new Float64Array(n), im = new Float64Array(n);
    for (let k = 0; k < n; k++) {
      const ar = r.nodes.o_pin.re[k], ai = r.nodes.o_pin.im[k], br = r.nodes.out.re[k], bi = r.nodes.out.im[k];
      const d = br * br + bi * bi;
      re[k] = -(ar * br + ai * bi) / d;
      im[k] = -(ai * br - ar * bi) / d;
    }
    const m = loopMetrics(r.freq, re, im);
    expect(m.crossovers.length).toBe(1);
    expect(m.crossoverHz! / fc).toBeCloseTo(1, 3);
    expect(m.phaseMarginDeg!).toBeCloseTo(pmExact, 1);
    expect(m.gainMarginDb).toBeNull(); // two poles: the phase never reaches −180°
  });

  it("the follower's step overshoot matches the second-order relation for that loop (Ogata)", () => {
    // Above ωp the loop is ωt·ω2/(s(s + ω2)) to within ωp/ωc ≈ 1e-5: ωn² = ωt·ω2, 2ζωn = ω2 (ωt = 2π·GBW).
    const wt = 2 * Math.PI * GBW, w2 = 2 * Math.PI * fp2;
    const zeta = 0.5 * Math.sqrt(w2 / wt);
    const expected = 100 * Math.exp((-zeta * Math.PI) / Math.sqrt(1 - zeta * zeta));
    const r = simulate(netlist("tran", false)) as TranResult;
    const m = stepMetrics(r.time, r.nodes.out, 1e-6);
    expect(m.overshootPct).toBeGreaterThan(expected - 0.5);
    expect(m.overshootPct).toBeLessThan(expected + 0.5);
    // and the phase margin ↔ damping relation of the same loop (docs/references.md §5a)
    expect(overshootFromDamping(dampingFromPhaseMargin(pmExact))).toBeCloseTo(expected, 0);
  });
});

describe("margins and overshoot tell one story on the valve-coil demo", () => {
  const caps = [47e-12, 470e-12, 2.2e-9, 10e-9];
  const rows = caps.map((cc) => {
    const s = valveCoilDemo();
    s.parts.compCapacitor = cc;
    const lg = runLoopGain(s);
    const step = runStep(s);
    const small = runSmallSignalStep(s, {}, step.metrics.initial)!;
    return { cc, pm: lg.phaseMarginDeg!, os: step.metrics.overshootPct, small: small.metrics.overshootPct };
  });

  it("a design that overshoots more than 20 % has a current-loop margin below 50°; one above 65° overshoots less than 15 %", () => {
    // Common practice, and the second-order relation (PM 50° ⇔ 17.7 %, PM 65° ⇔ 4.6 %: docs/references.md §5a).
    const ringing = rows.filter((r) => r.os > 20);
    const robust = rows.filter((r) => r.pm > 65);
    expect(ringing.length).toBeGreaterThan(0);
    expect(robust.length).toBeGreaterThan(0);
    for (const r of ringing) expect(r.pm).toBeLessThan(50);
    for (const r of robust) expect(r.os).toBeLessThan(15);
  });

  it("the small-signal step's overshoot follows the phase margin by the second-order relation within 3 points", () => {
    // The sink's current loop is close to second-order around its crossover (the coil's pole and the compensation
    // integrator), so overshootFromDamping(dampingFromPhaseMargin(PM)) predicts the linearised step's overshoot.
    for (const r of rows) {
      const predicted = overshootFromDamping(dampingFromPhaseMargin(r.pm));
      expect(Math.abs(r.small - predicted)).toBeLessThan(3);
    }
  });

  it("a larger compensation capacitor raises the margin and lowers the overshoot (monotone over the demo's range)", () => {
    for (let i = 1; i < rows.length; i++) {
      expect(rows[i].pm).toBeGreaterThan(rows[i - 1].pm);
      expect(rows[i].small).toBeLessThan(rows[i - 1].small);
    }
  });
});

describe("small-signal step of the engine's linearised circuit", () => {
  it("an RC low-pass gives 1 − e^(−t/RC) (docs/references.md §5b)", () => {
    const c = compile({
      elements: [
        { kind: "vsource", name: "in", nodes: ["in", "gnd"], dc: 2, ac: 1 },
        { kind: "resistor", name: "r", nodes: ["in", "out"], value: 1e3 },
        { kind: "capacitor", name: "c", nodes: ["out", "gnd"], value: 1e-6 },
      ],
      analysis: { kind: "ac", fStart: 1, fStop: 10, pointsPerDecade: 1 },
    });
    const r = c.runLinearStep("in", 5e-3, 5000, 0);
    for (const [t, v] of [[1e-3, 0.632120558829], [2e-3, 0.864664716763], [5e-3, 0.993262053001]] as const) {
      const k = Math.round(t / 1e-6);
      expect(r.nodes.out[k]).toBeCloseTo(v, 5);
    }
  });

  it("a series RLC gives the closed-form underdamped response (docs/references.md §5a values)", () => {
    const c = compile({
      elements: [
        { kind: "vsource", name: "in", nodes: ["in", "gnd"], dc: 0, ac: 1 },
        { kind: "resistor", name: "r", nodes: ["in", "a"], value: 10 },
        { kind: "inductor", name: "l", nodes: ["a", "b"], value: 1e-3 },
        { kind: "capacitor", name: "c", nodes: ["b", "gnd"], value: 1e-6 },
      ],
      analysis: { kind: "ac", fStart: 1, fStop: 10, pointsPerDecade: 1 },
    });
    const r = c.runLinearStep("in", 1e-3, 20000, 0);
    const at = (t: number) => r.nodes.b[Math.round(t / 5e-8)];
    expect(at(50e-6)).toBeCloseTo(0.867862787886, 3);
    expect(at(200e-6)).toBeCloseTo(0.634637745890, 3);
    expect(at(1e-3)).toBeCloseTo(0.993589260855, 3);
    const m = stepMetrics(r.time, r.nodes.b, 0, { initial: 0, final: 1 });
    expect(m.overshootPct).toBeCloseTo(60.4679066, 1);
  });

  it("refuses a source that is not there, naming it", () => {
    const c = compile({
      elements: [{ kind: "vsource", name: "in", nodes: ["in", "gnd"], dc: 1 }, { kind: "resistor", name: "r", nodes: ["in", "gnd"], value: 1 }],
      analysis: { kind: "op" },
    });
    expect(() => c.runLinearStep("nope", 1, 10, 0)).toThrow(/"nope"/);
  });
});

// Two computations that share nothing past the linearised circuit: the loop gain's Nyquist count (frequency domain,
// broken loop) and the linearised closed loop's step (time domain, trapezoidal). An unstable closed loop must show in
// both: the step grows, and T(jω) encircles −1 — in the current loop and, since the closed loop is the same circuit,
// in the local loop too, whose phase margin alone would look fine.
describe("an unstable closed loop is called unstable by the loop gain and by the linearised step", () => {
  it("the valve demo with a 10 Ω sense resistor (loop gain ×10) is unstable; with 4.7 nF of compensation it is not", () => {
    const s = valveCoilDemo();
    s.parts.senseResistor = 10;
    const lg = runLoopGain(s);
    const small = runSmallSignalStep(s)!;
    expect(lg.loops.current.unstable).toBe(true);
    expect(lg.loops.local!.unstable).toBe(true);
    expect(lg.phaseMarginDeg!).toBeLessThan(0);
    expect(lg.gainMarginDb!).toBeLessThan(0);
    expect(small.grows).toBe(true);
    // cut where it leaves four times the step (Vcommand change × k/Rsense): the record ends early, and only its last
    // sample lies beyond that bound
    const bound = 4 * Math.abs(idealTransconductance(s) * (s.stimulus.commandHigh - s.stimulus.commandLow));
    const dev = Array.from(small.iLoad, (i) => Math.abs(i - small.iLoad[0]));
    expect(small.time[small.time.length - 1]).toBeLessThan(s.stimulus.stopTime);
    expect(dev.slice(0, -1).every((d) => d <= bound)).toBe(true);
    expect(dev[dev.length - 1]).toBeGreaterThan(bound);

    s.parts.compCapacitor = 4.7e-9;
    const lg2 = runLoopGain(s);
    const small2 = runSmallSignalStep(s)!;
    expect(lg2.loops.current.unstable).toBe(false);
    expect(lg2.loops.local!.unstable).toBe(false);
    expect(lg2.phaseMarginDeg!).toBeGreaterThan(45);
    expect(small2.grows).toBe(false);
  });
});
