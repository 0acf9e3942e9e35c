import { describe, expect, it } from "vitest";
import { alignmentOffset, compareStep, findStepEdge, stepFigures, DEFAULT_TOLERANCES } from "@/lib/traces";
import { createRng } from "@/lib/design/stats";

/**
 * Second-order step response (docs/references.md §5a, closed form):
 *   y(t) = 1 − e^{−ζω0 t}[cos ωd t + ζ/√(1−ζ²) sin ωd t],  ωd = ω0√(1−ζ²), y = 0 for t < 0.
 * With the §5a series RLC (R = 10 Ω, L = 1 mH, C = 1 µF): ω0 = 31622.776602 rad/s, ζ = 0.158113883.
 */
const W0 = 31622.776602;
const ZETA = 0.158113883;
const WD = W0 * Math.sqrt(1 - ZETA * ZETA); // 31224.989992 rad/s (§5a)

function secondOrder(t: number, zeta = ZETA, w0 = W0): number {
  if (t <= 0) return 0;
  const wd = w0 * Math.sqrt(1 - zeta * zeta);
  return 1 - Math.exp(-zeta * w0 * t) * (Math.cos(wd * t) + (zeta / Math.sqrt(1 - zeta * zeta)) * Math.sin(wd * t));
}

// Deterministic pseudo-random numbers (mulberry32, the project's seeded generator), so the noisy capture is the same on every run.
const seeded = createRng;

/** Root of y(t) = level on [a, b] by bisection on the closed form (the oracle for rise and settling). */
function solve(f: (t: number) => number, level: number, a: number, b: number): number {
  let lo = a;
  let hi = b;
  const below = f(lo) < level;
  for (let k = 0; k < 200; k++) {
    const mid = 0.5 * (lo + hi);
    if ((f(mid) < level) === below) lo = mid;
    else hi = mid;
  }
  return 0.5 * (lo + hi);
}

/** Uniform grid sampled from the closed form, scaled and shifted. */
function sampled(t0: number, t1: number, dt: number, f: (t: number) => number) {
  const n = Math.round((t1 - t0) / dt) + 1;
  const time = new Float64Array(n);
  const values = new Float64Array(n);
  for (let i = 0; i < n; i++) { time[i] = t0 + i * dt; values[i] = f(time[i]); }
  return { time, values };
}

/** Non-uniform grid (fine near the edge, coarser later) like an adaptive-step transient. */
function adaptive(t1: number, f: (t: number) => number) {
  const ts: number[] = [];
  for (let t = -2e-4; t < 0; t += 2e-6) ts.push(t);
  let t = 0;
  let h = 1e-7;
  while (t <= t1) { ts.push(t); t += h; h = Math.min(h * 1.05, 2e-6); }
  const time = Float64Array.from(ts);
  return { time, values: time.map(f) };
}

describe("step figures on the closed-form second-order response", () => {
  const wave = sampled(-5e-4, 4e-3, 2e-7, (t) => secondOrder(t));
  const figures = stepFigures(wave.time, wave.values, { settleBand: 0.02, edgeTime: 0 });

  it("overshoot and peak time", () => {
    // §5a: overshoot exp(−ζπ/√(1−ζ²)) = 60.4679066 %, tp = π/ωd = 100.6114863 µs
    expect(figures.overshootPct).toBeCloseTo(60.4679066, 3);
    expect(figures.peakTime! * 1e6).toBeCloseTo(100.6114863, 0); // within half a 0.2 µs sample
  });

  it("rise time 10–90 % equals the closed form's crossing times", () => {
    // Oracle: bisection on the §5a closed form for y = 0.1 and y = 0.9 on [0, tp].
    const tp = Math.PI / WD;
    const expected = solve((t) => secondOrder(t), 0.9, 0, tp) - solve((t) => secondOrder(t), 0.1, 0, tp);
    expect(figures.riseTime! / expected).toBeCloseTo(1, 4);
  });

  it("settling time into ±2 % equals the last exit from the band", () => {
    // Oracle: scan the closed form on a 10 ns grid for the last |y − 1| > 0.02, then bisect.
    let last = 0;
    for (let t = 0; t < 4e-3; t += 1e-8) if (Math.abs(secondOrder(t) - 1) > 0.02) last = t;
    const target = secondOrder(last) > 1 ? 1.02 : 0.98;
    const expected = solve((t) => secondOrder(t), target, last, last + 1e-8);
    expect(figures.settlingTime! / expected).toBeCloseTo(1, 3);
  });

  it("ringing frequency ωd/2π (§5a: ωd = 31224.989992 rad/s → 4969.6 Hz)", () => {
    expect(figures.ringingHz! / (WD / (2 * Math.PI))).toBeCloseTo(1, 3);
  });

  it("the FFT peak alone finds a lightly damped ring (ζ = 0.02) within 0.5 %", () => {
    // Lightly damped: the spectral peak sits at ωd to within the window's resolution (closed form, ζ ≪ 1).
    const light = sampled(-1e-4, 20e-3, 1e-6, (t) => secondOrder(t, 0.02) + (t > 0 ? 0 : 0));
    const f = stepFigures(light.time, light.values, { settleBand: 0.02, edgeTime: 0 });
    const expected = (W0 * Math.sqrt(1 - 0.02 ** 2)) / (2 * Math.PI);
    expect(Math.abs(f.ringingHz! / expected - 1)).toBeLessThan(0.005);
  });

  it("a first-order step: rise time τ·ln 9 and no ringing (docs/references.md §5b)", () => {
    const tau = 1e-4;
    const rc = sampled(-1e-4, 2e-3, 1e-7, (t) => (t > 0 ? 1 - Math.exp(-t / tau) : 0));
    const f = stepFigures(rc.time, rc.values, { settleBand: 0.02 });
    expect(f.riseTime! / (tau * 2.197224577)).toBeCloseTo(1, 3); // §5b: 10–90 % = τ·ln 9
    // No overshoot in a first-order step; the final level is the median of the last tenth, so allow 1e-3 %.
    expect(f.overshootPct).toBeLessThan(1e-3);
    expect(f.ringingHz).toBeNull();
    // 2 % settling of a first-order step: e^{−t/τ} = 0.02 at τ·ln 50 after the step (closed form); with no edge
    // given it is counted from the 50 % crossing at τ·ln 2, so τ·(ln 50 − ln 2) = τ·ln 25.
    expect(f.settlingTime! / (tau * Math.log(25))).toBeCloseTo(1, 3);
    const fromStep = stepFigures(rc.time, rc.values, { settleBand: 0.02, edgeTime: 0 });
    expect(fromStep.settlingTime! / (tau * Math.log(50))).toBeCloseTo(1, 3);
    // 50 % crossing at τ·ln 2 (closed form)
    expect(f.edgeTime / (tau * Math.LN2)).toBeCloseTo(1, 3);
  });

  it("refuses a flat waveform", () => {
    const flat = sampled(0, 1e-3, 1e-5, () => 0.5);
    expect(() => stepFigures(flat.time, flat.values)).toThrow(RangeError);
    expect(() => findStepEdge(flat.time, flat.values)).toThrow(/no step found/);
  });
});

describe("alignment and comparison: a noisy, delayed, scaled capture of the same response", () => {
  const amplitude = 0.75; // A: full-scale step of a 750 mA sink
  const delay = 3.7e-4; // s: where the scope's trigger put the edge
  const rand = seeded(7);
  const noise = 0.004 * amplitude; // ±0.4 % of the step, uniform
  const measured = sampled(-2e-4, 3.5e-3, 1e-6, (t) => amplitude * secondOrder(t - delay) + noise * (2 * rand() - 1));
  const simulated = adaptive(3.2e-3, (t) => amplitude * secondOrder(t));

  it("finds the edge shift within one scope sample", () => {
    // The simulated 50 % crossing and the measured one differ by exactly the delay (same closed form).
    const offset = alignmentOffset(measured, simulated);
    expect(Math.abs(offset + delay)).toBeLessThan(1e-6);
  });

  it("agrees on every figure and passes the default tolerances", () => {
    const c = compareStep(measured, simulated, { tolerances: DEFAULT_TOLERANCES });
    const row = (k: string) => c.rows.find((r) => r.key === k)!;
    expect(Math.abs(row("riseTime").difference!)).toBeLessThan(3); // % of the closed-form rise time
    expect(Math.abs(row("overshoot").difference!)).toBeLessThan(1); // percentage points; §5a 60.47 % in both
    expect(c.simulated.overshootPct).toBeCloseTo(60.4679066, 1);
    expect(Math.abs(row("ringing").difference!)).toBeLessThan(1); // % of ωd/2π
    // RMS of uniform noise ±a is a/√3 (closed form): 0.4 %/√3 ≈ 0.23 % of the step, plus interpolation error
    expect(row("rms").measured!).toBeGreaterThan(0.2);
    expect(row("rms").measured!).toBeLessThan(0.4);
    expect(c.verdict).toBe("pass");
  });

  it("aligns 50 % crossing on 50 % crossing when the simulated stimulus time is given", () => {
    // The stimulus is at t = 0 in the simulation; the 50 % crossing of the response comes later (bisection on §5a's
    // closed form), and the capture is delayed by `delay`: the shift must be −delay, not the stimulus time.
    const offset = alignmentOffset(measured, simulated, 0);
    expect(Math.abs(offset + delay)).toBeLessThan(1e-6);
    const c = compareStep(measured, simulated, { simulatedEdge: 0 });
    expect(Math.abs(c.autoOffset + delay)).toBeLessThan(1e-6);
    // Figures counted from the stimulus: peak time π/ωd = 100.6114863 µs (§5a) in both
    expect(c.simulated.peakTime! * 1e6).toBeCloseTo(100.6114863, 0);
    expect(Math.abs(c.measured.peakTime! - c.simulated.peakTime!)).toBeLessThan(3e-6);
    expect(c.verdict).toBe("pass");
  });

  it("a hand offset of 20 µs shows up as an RMS difference and moves the alignment", () => {
    const c = compareStep(measured, simulated, { manualOffset: 2e-5 });
    expect(c.offset - c.autoOffset).toBeCloseTo(2e-5, 12);
    // Shifted by 20 µs the waveforms differ by about |dy/dt|·20 µs near the edge: several % of the step.
    expect(c.rows.find((r) => r.key === "rms")!.measured!).toBeGreaterThan(5);
  });

  it("the RMS window: a 20 µs misalignment hardly shows once the response has settled", () => {
    // After 2 ms the closed form is within e^{−ζω0·2ms} ≈ 4e−5 of its final value (§5a), so a shift changes almost
    // nothing there: what is left is the capture's noise, 0.4 %/√3 ≈ 0.23 % of the step (uniform noise, closed form).
    const c = compareStep(measured, simulated, { manualOffset: 2e-5, window: [2e-3, Infinity] });
    expect(c.window[0]).toBe(2e-3);
    expect(c.window[1]).toBeCloseTo(Math.min(3.2e-3, 3.5e-3 + c.offset), 12); // clipped to the overlap
    const rms = c.rows.find((r) => r.key === "rms")!.measured!;
    expect(rms).toBeGreaterThan(0.15);
    expect(rms).toBeLessThan(0.35);
  });

  it("a better-damped bench circuit fails against this simulation", () => {
    // ζ = 0.5 on the bench: overshoot 16.3 % (§5a table) against 60.5 % simulated
    const damped = sampled(-2e-4, 3.5e-3, 1e-6, (t) => amplitude * secondOrder(t - delay, 0.5));
    const c = compareStep(damped, simulated);
    const over = c.rows.find((r) => r.key === "overshoot")!;
    expect(c.measured.overshootPct).toBeCloseTo(16.3034, 1); // §5a table, ζ = 0.5
    expect(over.verdict).toBe("fail");
    expect(c.verdict).toBe("fail");
  });
});
