import { describe, expect, it } from "vitest";
import { alignCapture, alignmentOffset, cannotCompareReason, compareStep, DEFAULT_TOLERANCES } from "@/lib/traces";
import { findStepEdge } from "@/lib/design/step-edge";
import { stepMetrics } from "@/lib/design/metrics";
import { estimateRinging } from "@/lib/design/ringing";
import { createRng, normal } from "@/lib/design/stats";

/**
 * The capture of issue 13 made from closed forms: a 3 ms record stepping at 100 µs, 7.08 kHz ringing, ζ = 0.18.
 * Second-order underdamped step (K. Ogata, Modern Control Engineering, 5th ed., §5-3, "Second-order systems" — the
 * edition and section recalled from memory [MEM]; the formulas are the ones of docs/references.md §5a, [DERIVED]):
 *   y(t) = 1 − e^{−ζωn t}[cos ωd t + ζ/√(1−ζ²) sin ωd t],  ωd = ωn√(1−ζ²),
 *   maximum overshoot Mp = e^{−ζπ/√(1−ζ²)}, peak time tp = π/ωd, ringing frequency ωd/2π, decay rate ζωn.
 * Ogata's rise time is 0–100 % ((π − β)/ωd); ours is 10–90 %, so its oracle is bisection on the same closed form.
 */
const F_RING = 7.08e3; // Hz, ωd/2π
const ZETA = 0.18;
const WD = 2 * Math.PI * F_RING;
const WN = WD / Math.sqrt(1 - ZETA * ZETA);
const T_STEP = 100e-6; // s, the stimulus step
const T_END = 3e-3; // s
const AMP = 0.75; // A, a 750 mA step
const OVERSHOOT = 100 * Math.exp((-ZETA * Math.PI) / Math.sqrt(1 - ZETA * ZETA)); // Ogata Mp: 56.2812 %
const PEAK_TIME = Math.PI / WD; // Ogata tp: 70.6215 µs

function unitStep(t: number, zeta = ZETA, wn = WN): number {
  if (t <= 0) return 0;
  const wd = wn * Math.sqrt(1 - zeta * zeta);
  return 1 - Math.exp(-zeta * wn * t) * (Math.cos(wd * t) + (zeta / Math.sqrt(1 - zeta * zeta)) * Math.sin(wd * t));
}

/** Root of f(t) = level on [a, b] by bisection (f(a) on the other side of level from f(b)). */
function bisect(f: (t: number) => number, level: number, a: number, b: number): number {
  let lo = a, hi = b;
  const below = f(lo) < level;
  for (let k = 0; k < 200; k++) {
    const mid = 0.5 * (lo + hi);
    if ((f(mid) < level) === below) lo = mid; else hi = mid;
  }
  return 0.5 * (lo + hi);
}

/** A capture: `rows` samples over [0, T_END], the step at T_STEP + delay, Gaussian noise σ = noise·AMP (seeded). */
function capture(rows: number, opts: { delay?: number; noise?: number; seed?: number; zeta?: number; offsetLevel?: number } = {}) {
  const rng = createRng(opts.seed ?? 13);
  const dt = T_END / (rows - 1);
  const time = new Float64Array(rows), values = new Float64Array(rows);
  for (let i = 0; i < rows; i++) {
    time[i] = i * dt;
    values[i] = (opts.offsetLevel ?? 0.05) + AMP * unitStep(time[i] - T_STEP - (opts.delay ?? 0), opts.zeta ?? ZETA) + (opts.noise ?? 0) * AMP * normal(rng);
  }
  return { time, values, dt };
}

/** The simulation: the same closed form on a non-uniform grid (fine after the edge, coarser later), like the engine's. */
function simulation() {
  const ts: number[] = [];
  for (let t = 0; t < T_STEP; t += 2e-6) ts.push(t);
  let t = T_STEP, h = 5e-8;
  while (t <= T_END) { ts.push(t); t += h; h = Math.min(h * 1.04, 1.5e-6); }
  const time = Float64Array.from(ts);
  return { time, values: time.map((x) => 0.05 + AMP * unitStep(x - T_STEP)) };
}

const sim = simulation();
// Oracles from the closed form: 10–90 % rise by bisection on [0, tp]; ±2 % settling as the last exit from the band.
const RISE = bisect(unitStep, 0.9, 0, PEAK_TIME) - bisect(unitStep, 0.1, 0, PEAK_TIME);
let lastOut = 0;
for (let t = 0; t < 2e-3; t += 1e-8) if (Math.abs(unitStep(t) - 1) > 0.02) lastOut = t;
const SETTLE_2PCT = bisect(unitStep, unitStep(lastOut) > 1 ? 1.02 : 0.98, lastOut, lastOut + 1e-8);

describe("the design layer's step metrics on the closed-form capture, at two sample rates, clean and noisy", () => {
  // 4 000 rows (0.75 µs, about 188 samples per ringing period) and 2 000 rows (1.5 µs, about 94).
  for (const rows of [4000, 2000]) {
    for (const noise of [0, 0.003]) {
      const name = `${rows} rows, noise σ = ${noise * 100} % of the step`;
      const c = capture(rows, { noise });
      const edge = findStepEdge(c.time, c.values);
      const m = stepMetrics(c.time, c.values, T_STEP, { initial: edge.initial, final: edge.final, settleBand: 0.02 });

      it(`${name}: levels and rise time (bisection on Ogata's closed form, ${(RISE * 1e6).toFixed(3)} µs)`, () => {
        expect(Math.abs(edge.initial - 0.05)).toBeLessThan(0.002 * AMP + 1e-12); // the pre-step level, 50 mA
        expect(Math.abs(edge.final - 0.8)).toBeLessThan(0.002 * AMP + 1e-12); // 50 mA + 750 mA
        // clean: within a tenth of a sample of interpolation error; noisy: σ/slope at 10 % and 90 % adds ≈ a sample
        expect(Math.abs(m.riseTime! - RISE)).toBeLessThan(noise ? 2 * c.dt : 0.1 * c.dt);
      });

      it(`${name}: overshoot and peak time (Ogata Mp = ${OVERSHOOT.toFixed(4)} %, tp = π/ωd)`, () => {
        // the largest noisy sample sits about 3σ above the curve (max of ~100 Gaussian samples near the peak)
        expect(Math.abs(m.overshootPct - OVERSHOOT)).toBeLessThan(noise ? 4 * noise * 100 : 0.01);
        expect(Math.abs(m.peakTime! - PEAK_TIME)).toBeLessThan(noise ? 5 * c.dt : 0.5 * c.dt);
      });

      it(`${name}: settling into ±2 % (last exit of the closed form, ${(SETTLE_2PCT * 1e6).toFixed(2)} µs)`, () => {
        expect(m.settleBand).toBe(0.02);
        // clean: the band exit interpolated within two samples; noisy: a ringing peak within the noise of the band edge
        // counts or not, so the figure may move by one half period of the ringing (π/ωd, Ogata)
        expect(Math.abs(m.settlingTime! - SETTLE_2PCT)).toBeLessThan(noise ? Math.PI / WD : 2 * c.dt);
      });

      it(`${name}: ringing frequency ωd/2π = 7.08 kHz and damping ζ = 0.18, the estimators agreeing`, () => {
        const r = m.ringing;
        expect(Math.abs(r.frequencyHz! / F_RING - 1)).toBeLessThan(noise ? 0.01 : 0.002);
        expect(Math.abs(r.peakSpacingHz! / F_RING - 1)).toBeLessThan(noise ? 0.01 : 0.002);
        expect(Math.abs(r.pencilHz! / F_RING - 1)).toBeLessThan(noise ? 0.01 : 0.002);
        expect(Math.abs(r.dampingRatio! - ZETA)).toBeLessThan(noise ? 0.02 : 0.005);
        expect(Math.abs(r.logDecrementDamping! - ZETA)).toBeLessThan(noise ? 0.03 : 0.005);
        expect(r.estimatorsAgree).toBe(true);
        expect(r.uncertaintyHz!).toBeLessThan(0.01 * F_RING);
      });
    }
  }

  it("the two sample rates give the same ringing frequency within 0.5 % (the issue saw 7.04 and 8.05 kHz)", () => {
    const full = capture(4000), half = capture(2000);
    const f = (c: ReturnType<typeof capture>) => {
      const e = findStepEdge(c.time, c.values);
      return stepMetrics(c.time, c.values, T_STEP, { initial: e.initial, final: e.final }).ringing.frequencyHz!;
    };
    expect(Math.abs(f(full) / f(half) - 1)).toBeLessThan(0.005);
  });

  for (const rows of [4000, 2000]) {
    it(`${rows} rows, heavy noise (σ = 1 % of the step): the truth lies within the reported uncertainty`, () => {
      const c = capture(rows, { noise: 0.01, seed: 5 });
      const e = findStepEdge(c.time, c.values);
      const r = stepMetrics(c.time, c.values, T_STEP, { initial: e.initial, final: e.final }).ringing;
      expect(r.uncertaintyHz!).toBeGreaterThan(0);
      expect(Math.abs(r.frequencyHz! - F_RING)).toBeLessThanOrEqual(r.uncertaintyHz!); // ωd/2π = 7.08 kHz
    });
  }

  it("a response still ringing at the end of the record (ζ = 0.02) has no settling time: not within the record", () => {
    // Ogata's ±2 % settling estimate 4/(ζωn) = 4.4 ms, longer than the 3 ms record
    const c = capture(4000, { zeta: 0.02 });
    const m = stepMetrics(c.time, c.values, T_STEP, { settleBand: 0.02, initial: 0.05, final: 0.8 });
    expect(m.settlingTime).toBeNull();
    const cmp = compareStep(c, simulation(), { commandEdge: T_STEP });
    const row = cmp.rows.find((r) => r.key === "settlingTime")!;
    expect(row.measured).toBeNull();
    expect(row.note).toBe("not within the record in the measurement");
  });
});

describe("alignment on the measured step edge", () => {
  it("a capture that steps at 100 µs like the stimulus is not shifted (the issue saw 268 µs)", () => {
    const c = capture(4000);
    // the same closed form in both: the 50 % crossings coincide, the offset is zero within a sample
    expect(Math.abs(alignmentOffset(c, sim, T_STEP))).toBeLessThan(c.dt);
  });

  for (const rows of [4000, 2000]) {
    for (const noise of [0, 0.003]) {
      it(`${rows} rows, noise σ = ${noise * 100} %: a known 123.4 µs trigger offset is recovered within one sample`, () => {
        const delay = 123.4e-6;
        const c = capture(rows, { delay, noise, seed: 29 });
        const cmp = compareStep(c, sim, { commandEdge: T_STEP });
        expect(Math.abs(cmp.autoOffset + delay)).toBeLessThan(c.dt);
        // both edges are reported: the capture's 50 % crossing on its own axis, the simulation's after the command edge
        const half = T_STEP + bisect(unitStep, 0.5, 0, PEAK_TIME); // closed-form 50 % crossing
        expect(Math.abs(cmp.simulatedEdge - half)).toBeLessThan(1e-7);
        expect(Math.abs(cmp.measuredEdge - (half + delay))).toBeLessThan(c.dt);
        expect(cmp.commandEdge).toBe(T_STEP);
        expect(cmp.verdict).toBe("pass");
      });
    }
  }

  it("the workbench overlay's alignment is the comparison's: a 250 µs pre-trigger comes back within one sample", () => {
    const c = capture(4000, { delay: 250e-6 });
    const a = alignCapture(c, sim, T_STEP);
    expect(Math.abs(a.offset + 250e-6)).toBeLessThan(c.dt); // the known delay, closed form
    expect(a.offset).toBe(compareStep(c, sim, { commandEdge: T_STEP }).autoOffset);
    expect(a.time[10] - c.time[10]).toBeCloseTo(a.offset, 15);
  });

  it("the pre-step level is not cut off: a step at 2 % of the record still finds its baseline", () => {
    // 60 µs of baseline in a 3 ms record: the first 2 % straddles the edge, the refined level must not
    const c = capture(4000, { delay: -40e-6 });
    const e = findStepEdge(c.time, c.values);
    expect(e.initial).toBeCloseTo(0.05, 9); // the closed form is exactly 0.05 A before the step
  });

  it("a hand offset moves the alignment and shows as an RMS difference", () => {
    const c = capture(4000);
    const cmp = compareStep(c, sim, { commandEdge: T_STEP, manualOffset: 20e-6 });
    expect(cmp.offset - cmp.autoOffset).toBeCloseTo(20e-6, 12);
    // shifted by 20 µs the records differ by about |dy/dt|·20 µs around the edge: several % of the step
    expect(cmp.rows.find((r) => r.key === "rms")!.measured!).toBeGreaterThan(5);
  });

  it("refuses a flat record", () => {
    const time = Float64Array.from({ length: 100 }, (_, i) => i * 1e-5);
    expect(() => findStepEdge(time, new Float64Array(100).fill(0.5))).toThrow(/^No step found/);
  });
});

describe("one measurement path: the comparison's simulated figures are the workbench's", () => {
  it("the simulated overshoot, rise and peak time equal stepMetrics on the same record (what the workbench shows)", () => {
    const cmp = compareStep(capture(4000), sim, { commandEdge: T_STEP });
    const workbench = stepMetrics(sim.time, sim.values, T_STEP);
    expect(cmp.simulated.overshootPct).toBe(workbench.overshootPct);
    expect(cmp.simulated.riseTime).toBe(workbench.riseTime);
    expect(cmp.simulated.peakTime).toBe(workbench.peakTime);
    expect(cmp.simulated.overshootPct).toBeCloseTo(OVERSHOOT, 1); // Ogata Mp, 56.28 %
  });

  it("a better-damped bench circuit fails: ζ = 0.5 gives 16.3034 % overshoot (docs/references.md §5a table)", () => {
    const c = capture(4000, { zeta: 0.5 });
    const cmp = compareStep(c, sim, { commandEdge: T_STEP, tolerances: DEFAULT_TOLERANCES });
    expect(cmp.measured.overshootPct).toBeCloseTo(16.3034, 1);
    expect(cmp.rows.find((r) => r.key === "overshoot")!.verdict).toBe("fail");
    expect(cmp.verdict).toBe("fail");
  });
});

describe("channels that cannot be compared", () => {
  it("a channel without a unit, or in volts, cannot be compared with the load current; amperes can", () => {
    expect(cannotCompareReason("")).toMatch(/^This channel has no unit, so it cannot be compared/);
    expect(cannotCompareReason("V")).toMatch(/^This channel is in V;/);
    expect(cannotCompareReason("A")).toBeNull();
  });
});
