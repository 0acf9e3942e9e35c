import { NAMES } from "@/lib/design/compile";
import { describe, expect, it } from "vitest";
import { simulate, type TranResult } from "@/lib/sim";
import { valveCoilDemo } from "@/lib/design/demos";
import { stepMetrics } from "@/lib/design/metrics";
import { estimateRinging } from "@/lib/design/ringing";
import { compileNetlist, runStep } from "@/lib/design/run";

/**
 * Step metrics from the true waveform: closed-form second-order steps (Ogata, Modern Control Engineering, ch. on
 * transient response: overshoot e^(−ζπ/√(1−ζ²)), peak time π/ωd) sampled coarsely, ringing estimators on clean damped
 * sinusoids at two sample rates, and the design layer's peak refinement against the same circuit simulated with a
 * 30× finer maximum step.
 */
const zeta = 0.2, wn = 2 * Math.PI * 50e3;
const wd = wn * Math.sqrt(1 - zeta * zeta);
const y2 = (t: number) => (t <= 0 ? 0 : 1 - Math.exp(-zeta * wn * t) * (Math.cos(wd * t) + (zeta / Math.sqrt(1 - zeta * zeta)) * Math.sin(wd * t)));
const overshootExact = 100 * Math.exp((-zeta * Math.PI) / Math.sqrt(1 - zeta * zeta));

function sampled(dt: number, tEnd: number, t0 = 0): { t: Float64Array; y: Float64Array } {
  const n = Math.floor(tEnd / dt) + 1;
  const t = new Float64Array(n), y = new Float64Array(n);
  for (let i = 0; i < n; i++) { t[i] = i * dt; y[i] = y2(t[i] - t0); }
  return { t, y };
}

describe("step metrics of a closed-form second-order step", () => {
  it("finely sampled: overshoot and peak time match the closed form", () => {
    const { t, y } = sampled(1e-8, 400e-6, 0);
    const m = stepMetrics(t, y, 0, { initial: 0, final: 1 });
    expect(m.overshootPct).toBeCloseTo(overshootExact, 2);
    expect(m.peakTime! / (Math.PI / wd)).toBeCloseTo(1, 3);
    expect(m.settled).toBe(true);
  });

  it("coarsely sampled (5 samples per period): the reported peak is never above the largest sample by more than 0.1 % of the step", () => {
    const period = (2 * Math.PI) / wd;
    for (const phase of [0, 0.13, 0.37, 0.61, 0.89]) {
      const { t, y } = sampled(period / 5, 400e-6, phase * period / 5);
      let largest = -Infinity;
      for (let i = 0; i < y.length; i++) largest = Math.max(largest, y[i]);
      const m = stepMetrics(t, y, 0, { initial: 0, final: 1 });
      expect(m.overshootPct / 100 + 1).toBeLessThanOrEqual(largest + 1e-3 + 1e-12);
      // and never more than the true peak (closed form)
      expect(m.overshootPct).toBeLessThanOrEqual(overshootExact + 0.1);
    }
  });

  it("a response that does not settle within the record says so: settled false, settling null", () => {
    const { t, y } = sampled(1e-8, 40e-6); // about two ringing periods: still far outside ±1 %
    const m = stepMetrics(t, y, 0, { initial: 0, final: 1 });
    expect(m.settled).toBe(false);
    expect(m.settlingTime1pct).toBeNull();
  });
});

describe("ringing estimators on a clean damped sinusoid (closed form) at two sample rates", () => {
  // y = e^(−ζωn t)·cos(ωd t): frequency ωd/2π and damping ζ are known exactly.
  for (const [z, fHz] of [[0.05, 7.08e3], [0.18, 7.08e3], [0.3, 120e3]] as const) {
    const w = 2 * Math.PI * fHz / Math.sqrt(1 - z * z); // ωn such that ωd/2π = fHz
    for (const perPeriod of [40, 9]) {
      it(`ζ = ${z}, ${fHz} Hz, ${perPeriod} samples per period: estimators agree with the truth`, () => {
        const dt = 1 / (fHz * perPeriod);
        const n = Math.floor((12 / fHz) / dt);
        const t = new Float64Array(n), y = new Float64Array(n);
        for (let i = 0; i < n; i++) { t[i] = i * dt; y[i] = 1 + Math.exp(-z * w * t[i]) * Math.cos(2 * Math.PI * fHz * t[i]); }
        const r = estimateRinging(t, y, 1, 0);
        expect(r.frequencyHz! / fHz).toBeCloseTo(1, 2);
        expect(r.peakSpacingHz! / fHz).toBeCloseTo(1, 1);
        expect(Math.abs(r.dampingRatio! - z)).toBeLessThan(0.01 + 0.05 * z);
      });
    }
  }
});

describe("the design layer's step: peak resolved where the record is coarse", () => {
  it("valve-coil demo at 2.2 nF: overshoot, peak time and rise time agree with a 30× finer run of the same circuit", () => {
    const s = valveCoilDemo();
    s.parts.compCapacitor = 2.2e-9;
    const step = runStep(s);
    // Reference: the engine with its maximum step at stopTime/6000 everywhere (the default is stopTime/200).
    const fine = simulate(compileNetlist(s, "step", { maxStep: s.stimulus.stopTime / 6000, tStep: s.stimulus.stopTime / 6000 })) as TranResult;
    const ref = stepMetrics(fine.time, fine.currents[NAMES.ammeter], s.stimulus.stepTime);
    expect(Math.abs(step.metrics.overshootPct - ref.overshootPct)).toBeLessThan(0.3);
    expect(step.metrics.peakTime! / ref.peakTime!).toBeCloseTo(1, 2);
    expect(step.metrics.riseTime! / ref.riseTime!).toBeCloseTo(1, 2);
    // the plotted record contains a sample at the reported peak (within the 0.1 % lift the metrics allow)
    let largest = -Infinity;
    for (let i = 0; i < step.series.iLoad.length; i++) largest = Math.max(largest, step.series.iLoad[i]);
    const peak = step.metrics.final + (step.metrics.overshootPct / 100) * (step.metrics.final - step.metrics.initial);
    expect(peak - largest).toBeLessThanOrEqual(1e-3 * (step.metrics.final - step.metrics.initial) + 1e-12);
  });

  it("a record too short to settle reports settled: false and no settling time", () => {
    const s = valveCoilDemo();
    s.stimulus.stopTime = 0.3e-3;
    const step = runStep(s);
    expect(step.metrics.settled).toBe(false);
    expect(step.metrics.settlingTime1pct).toBeNull();
  });
});
