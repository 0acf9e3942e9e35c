import { NAMES } from "@/lib/design/compile";
import { describe, expect, it } from "vitest";
import { simulate, type AcResult } from "@/lib/sim";
import { compileNetlistJson, defaultScenario, runLoopGain, runOperatingPoint, tianLoopGain, type Scenario, type TemplateId } from "@/lib/design";

/** An op-amp whose output is an ideal source (Rout 0, single pole, no limits): the exact break is at its output. */
function idealOutput(t: TemplateId): Scenario {
  const s = defaultScenario(t);
  s.opamp = { ...s.opamp, Rout: 0, fp2: null, slewRate: null, swingHigh: null, swingLow: null, Iout: null };
  return s;
}

/**
 * Exact break at the gain element: the op-amp's output pin is moved to a dummy load, and the network it drove is
 * driven by a source holding the operating-point voltage plus 1 V AC. With an ideal output, the op-amp's output
 * voltage is then A(jω)·vd — the returned signal — and T = −v(returned)/v(injected) (Bode's return ratio).
 */
function exactBreak(s: Scenario): AcResult {
  const { op } = runOperatingPoint(s);
  const nl = compileNetlistJson(s, "op");
  const elements = nl.elements.map((e) =>
    e.kind === "opamp" ? { ...e, nodes: [e.nodes[0], e.nodes[1], "oa_x", e.nodes[3], e.nodes[4]] as typeof e.nodes } : e,
  );
  elements.push({ kind: "resistor", name: "dummy-load", nodes: ["oa_x", "gnd"], value: 1e3 });
  elements.push({ kind: "vsource", name: "drive", nodes: ["oa", "gnd"], dc: op.nodes.oa, ac: 1 });
  const r = simulate({ ...nl, elements, analysis: { kind: "ac", fStart: 10, fStop: 1e7, pointsPerDecade: 20 } });
  if (r.kind !== "ac") throw new Error("expected AC");
  return r;
}

describe("two-injection loop gain (Tian et al. 2001, docs/references.md §4.2)", () => {
  it("the formula gives A for an ideal inverting driver with v_L = −A·v_R (derivation in run.ts)", () => {
    // Run 1: v_R = 1/(1+A); run 2: the ideal driver holds v_R = 0, so the probe carries i2 = −1 (L→R).
    const A = 37;
    const [re, im] = tianLoopGain(1 / (1 + A), 0, -1, 0);
    expect(re).toBeCloseTo(A, 10);
    expect(im).toBeCloseTo(0, 12);
  });

  it.each(["sink-npn", "sink-darlington", "source-highside"] as const)(
    "%s: the local loop's T from the probe equals the exact break at the op-amp's gain element at every frequency",
    (t) => {
      const s = idealOutput(t);
      // the op-amp-output break is the one every loop passes through: the local loop's probe
      const lg = runLoopGain(s, {}, { fStart: 10, fStop: 1e7, pointsPerDecade: 20 }).loops.local!;
      const ex = exactBreak(s);
      expect(ex.freq.length).toBe(lg.freq.length);
      for (let k = 0; k < ex.freq.length; k++) {
        const er = -ex.nodes.oa_x.re[k], ei = -ex.nodes.oa_x.im[k];
        const rel = Math.hypot(er - lg.re[k], ei - lg.im[k]) / Math.hypot(er, ei);
        expect(rel).toBeLessThan(1e-4);
      }
    },
  );

  it("low-frequency loop gain of the NPN sink matches the hand small-signal estimate (docs/references.md §6 form)", () => {
    // |T(0)| ≈ Aol·(β+1)Rs/(Rb + rπ + (β+1)Rs), with rπ = β·Vt/Ic (model of our own, docs/references.md §6).
    const s = idealOutput("sink-npn");
    s.pass.VA = null; // no Early effect: the hand formula ignores it
    const { op, summary } = runOperatingPoint(s);
    const q = op.devices[NAMES.pass] as { ic: number };
    const beta = s.pass.betaF;
    const vt = (1.380649e-23 * (s.thermal.ambient + 273.15)) / 1.602176634e-19;
    const rpi = (beta * vt) / q.ic;
    const rs = s.parts.senseResistor;
    const expected = s.opamp.Aol * ((beta + 1) * rs) / (s.parts.baseResistor + rpi + (beta + 1) * rs);
    // At DC the compensation capacitor is open, so the current loop and the op-amp-output break agree; its local loop
    // (Miller integrator, pole near 1/(2π·Aol·Rfb·Ccomp) ≈ 0.04 Hz here) must be far above the test frequency.
    const lg = runLoopGain(s, {}, { fStart: 1e-5, fStop: 1e-4, pointsPerDecade: 5 });
    const t0 = Math.hypot(lg.re[0], lg.im[0]);
    expect(summary.opampLimiting).toBe(false);
    expect(t0 / expected).toBeCloseTo(1, 2);
  });
});

describe("output impedance seen by the load", () => {
  it("improved Howland pump with R4/R3 = R2/R1: Zout → R1 + R2 at low frequency (closed form, ideal op-amp limit)", async () => {
    const { runOutputImpedance } = await import("@/lib/design");
    const s = defaultScenario("howland");
    // I_L = Vin·R2/(R1·Rs) + (Vin − V_L)/(R1 + R2): the only output conductance is 1/(R1 + R2) (derivation in templates).
    const z = runOutputImpedance(s, {}, { fStart: 1, fStop: 100, pointsPerDecade: 2 });
    expect(z.magOhm[0] / (s.parts.howlandR1 + s.parts.howlandR2)).toBeCloseTo(1, 2);
  });
  it("a regulated NPN sink looks far stiffer than its load at low frequency", async () => {
    const { runOutputImpedance } = await import("@/lib/design");
    const s = defaultScenario("sink-npn");
    const z = runOutputImpedance(s, {}, { fStart: 1, fStop: 100, pointsPerDecade: 2 });
    expect(z.magOhm[0]).toBeGreaterThan(20 * s.load.resistance);
  });
});
