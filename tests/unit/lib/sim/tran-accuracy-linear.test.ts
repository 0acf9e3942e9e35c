/**
 * Transient accuracy by default on linear circuits: the netlist gives only tStop and tStep, and every accepted
 * point must agree with the closed-form solution within 0.2 % of the waveform's full scale (its range, max − min).
 * Closed forms: first- and second-order step and ramp responses by the Laplace transform (e.g. Ogata, "Modern
 * Control Engineering", ch. 5; Nilsson & Riedel, "Electric Circuits", chs. 7–8), derived in each test's comment.
 * Also the step-control contract of the README (the bounds tStep, maxStep and periodic sources put on the step).
 */
import { describe, expect, it } from "vitest";
import { runTran } from "./helpers";

const TOL = 0.002; // 0.2 % of full scale

/** Largest |engine − exact| over the accepted points, as a fraction of the exact waveform's range. */
function worstError(time: Float64Array, engine: Float64Array, exact: (t: number) => number): { err: number; at: number; fullScale: number } {
  const tStop = time[time.length - 1];
  let lo = Infinity, hi = -Infinity;
  for (let k = 0; k <= 20000; k++) { const v = exact((tStop * k) / 20000); lo = Math.min(lo, v); hi = Math.max(hi, v); }
  let err = 0, at = 0;
  for (let i = 0; i < time.length; i++) {
    const e = Math.abs(engine[i] - exact(time[i]));
    if (e > err) { err = e; at = time[i]; }
  }
  return { err: err / (hi - lo), at, fullScale: hi - lo };
}

function steps(time: Float64Array): { largest: number; smallest: number } {
  let largest = 0, smallest = Infinity;
  for (let i = 1; i < time.length; i++) { const h = time[i] - time[i - 1]; largest = Math.max(largest, h); smallest = Math.min(smallest, h); }
  return { largest, smallest };
}

describe("transient accuracy by default against closed forms (0.2 % of full scale)", () => {
  it("sine into RC over 40 periods (1 kHz, ωRC = 1), tStep = 25 samples per period", () => {
    const A = 1, f = 1e3, R = 1e3, C = 1 / (2 * Math.PI * f * R);
    const tStop = 40 / f;
    const r = runTran({
      elements: [
        { kind: "vsource", name: "V1", nodes: ["in", "gnd"], wave: { shape: "sine", amplitude: A, freq: f } },
        { kind: "resistor", name: "R1", nodes: ["in", "out"], value: R },
        { kind: "capacitor", name: "C1", nodes: ["out", "gnd"], value: C },
      ],
      analysis: { kind: "tran", tStop, tStep: tStop / 1000 },
    });
    // Closed form, v(0) = 0: v(t) = A/(1 + x²)·[sin ωt − x·cos ωt + x·e^{−t/τ}], τ = RC, x = ωτ
    // (steady state A/√(1+x²)·sin(ωt − atan x) plus the transient term that starts it at zero).
    const w = 2 * Math.PI * f, tau = R * C, x = w * tau;
    const exact = (t: number) => (A / (1 + x * x)) * (Math.sin(w * t) - x * Math.cos(w * t) + x * Math.exp(-t / tau));
    const e = worstError(r.time, r.nodes.out, exact);
    expect(e.fullScale).toBeGreaterThan((2 * A) / Math.SQRT2); // at least the steady-state swing 2A/√(1 + x²) (closed form above)
    expect(e.err, `worst at t = ${e.at}`).toBeLessThan(TOL);
  });

  // Scaled down to 0.1 mV the inductor's voltage peaks near a hundred times vntol, the floor of its truncation-error
  // tolerance (a voltage: lib/sim/circuit.ts stateAbsTol); at 1 V the relative term rules. The same 0.2 % holds.
  it.each([1, 1e-3, 1e-4])("pulse train of %s V into a series RLC (ζ ≈ 0.16, rings each edge), capacitor voltage and loop current", (H) => {
    const R = 10, L = 1e-3, C = 1e-6;
    const delay = 1e-4, rise = 1e-5, fall = 1e-5, width = 4e-4, period = 1e-3;
    const tStop = 5e-3;
    const r = runTran({
      elements: [
        { kind: "vsource", name: "V1", nodes: ["in", "gnd"], wave: { shape: "pulse", low: 0, high: H, delay, rise, fall, width, period } },
        { kind: "resistor", name: "R1", nodes: ["in", "a"], value: R },
        { kind: "inductor", name: "L1", nodes: ["a", "b"], value: L },
        { kind: "capacitor", name: "C1", nodes: ["b", "gnd"], value: C },
      ],
      analysis: { kind: "tran", tStop, tStep: tStop / 500 },
    });
    // v_C/v_in = ω0²/(s² + 2ζω0·s + ω0²), ω0 = 1/√(LC), ζ = (R/2)·√(C/L), α = ζω0, ωd = ω0·√(1 − ζ²).
    // Unit-ramp response (partial fractions of ω0²/(s²(s² + 2ζω0 s + ω0²))):
    //   r(t) = t − 2ζ/ω0 + e^{−αt}·[(2ζ/ω0)·cos ωd t + ((2ζ² − 1)/ωd)·sin ωd t]
    // and its derivative, the unit-step response s(t) = 1 − e^{−αt}·[cos ωd t + (α/ωd)·sin ωd t].
    // The trapezoidal pulse is a sum of ramps starting at its corners (slope changes ±H/rise, ∓H/fall), so
    // v_C = Σ Δm·r(t − t_k) and the loop current i = C·dv_C/dt = C·Σ Δm·s(t − t_k).
    const w0 = 1 / Math.sqrt(L * C), z = (R / 2) * Math.sqrt(C / L), a = z * w0, wd = w0 * Math.sqrt(1 - z * z);
    const ramp = (t: number) => (t <= 0 ? 0 : t - (2 * z) / w0 + Math.exp(-a * t) * (((2 * z) / w0) * Math.cos(wd * t) + ((2 * z * z - 1) / wd) * Math.sin(wd * t)));
    const step = (t: number) => (t <= 0 ? 0 : 1 - Math.exp(-a * t) * (Math.cos(wd * t) + (a / wd) * Math.sin(wd * t)));
    const corners: [number, number][] = [];
    for (let k = 0; delay + k * period < tStop; k++) {
      const t0 = delay + k * period;
      corners.push([t0, H / rise], [t0 + rise, -H / rise], [t0 + rise + width, -H / fall], [t0 + rise + width + fall, H / fall]);
    }
    const vc = (t: number) => corners.reduce((s, [tk, dm]) => s + dm * ramp(t - tk), 0);
    const il = (t: number) => C * corners.reduce((s, [tk, dm]) => s + dm * step(t - tk), 0);
    const ev = worstError(r.time, r.nodes.b, vc);
    const ei = worstError(r.time, r.currents.L1, il);
    expect(ev.fullScale).toBeGreaterThan(1.5 * H); // overshoot ≈ e^{−πζ/√(1−ζ²)} ≈ 60 % (second-order closed form)
    expect(ev.err, `capacitor voltage, worst at t = ${ev.at}`).toBeLessThan(TOL);
    expect(ei.err, `loop current, worst at t = ${ei.at}`).toBeLessThan(TOL);
  });

  it("piecewise-linear drive into RC (ramps, a hold, a near-step, a slow return)", () => {
    const R = 1e3, C = 1e-7, tau = R * C;
    const pts: [number, number][] = [[0, 0], [1e-4, 0], [1.5e-4, 2], [4e-4, 2], [4.01e-4, -1], [7e-4, 0.25]];
    const tStop = 1e-3;
    const r = runTran({
      elements: [
        { kind: "vsource", name: "V1", nodes: ["in", "gnd"], wave: { shape: "piecewise", points: pts } },
        { kind: "resistor", name: "R1", nodes: ["in", "out"], value: R },
        { kind: "capacitor", name: "C1", nodes: ["out", "gnd"], value: C },
      ],
      analysis: { kind: "tran", tStop, tStep: tStop / 200 },
    });
    // RC low-pass unit-ramp response r(t) = t − τ·(1 − e^{−t/τ}); the wave is Σ Δm_k·ramp(t − t_k) over its
    // corners, Δm_k the change of slope at corner k (the value holds after the last point).
    const corners: [number, number][] = [];
    let prevSlope = 0;
    for (let k = 0; k < pts.length; k++) {
      const slope = k + 1 < pts.length ? (pts[k + 1][1] - pts[k][1]) / (pts[k + 1][0] - pts[k][0]) : 0;
      corners.push([pts[k][0], slope - prevSlope]);
      prevSlope = slope;
    }
    const ramp = (t: number) => (t <= 0 ? 0 : t - tau * (1 - Math.exp(-t / tau)));
    const exact = (t: number) => corners.reduce((s, [tk, dm]) => s + dm * ramp(t - tk), 0);
    const e = worstError(r.time, r.nodes.out, exact);
    expect(e.err, `worst at t = ${e.at}`).toBeLessThan(TOL);
  });

  it("resistive divider under a sine with a coarse tStep (5 per period): no peak is stepped over", () => {
    const A = 1, f = 1e3, tStop = 10 / f;
    const r = runTran({
      elements: [
        { kind: "vsource", name: "V1", nodes: ["in", "gnd"], wave: { shape: "sine", amplitude: A, freq: f } },
        { kind: "resistor", name: "R1", nodes: ["in", "out"], value: 1e3 },
        { kind: "resistor", name: "R2", nodes: ["out", "gnd"], value: 3e3 },
      ],
      analysis: { kind: "tran", tStop, tStep: tStop / 50 },
    });
    // divider: v(out) = A·R2/(R1 + R2)·sin ωt; every period's largest sample within 0.2 % of the peak A·3/4
    const peak = (A * 3) / 4;
    for (let k = 0; k < 10; k++) {
      let top = -Infinity, bottom = Infinity;
      for (let i = 0; i < r.time.length; i++) {
        if (r.time[i] < k / f || r.time[i] > (k + 1) / f) continue;
        top = Math.max(top, r.nodes.out[i]);
        bottom = Math.min(bottom, r.nodes.out[i]);
      }
      expect(top, `period ${k}`).toBeGreaterThan(peak * (1 - TOL));
      expect(bottom, `period ${k}`).toBeLessThan(-peak * (1 - TOL));
    }
  });
});

describe("step-control contract (README, engine: tran)", () => {
  const rc = [
    { kind: "vsource" as const, name: "V1", nodes: ["in", "gnd"] as [string, string], dc: 1 },
    { kind: "resistor" as const, name: "R1", nodes: ["in", "out"] as [string, string], value: 1e3 },
    { kind: "capacitor" as const, name: "C1", nodes: ["out", "gnd"] as [string, string], value: 1e-9 },
  ];
  it("with only tStop and tStep, tStep bounds every step", () => {
    const r = runTran({ elements: rc, analysis: { kind: "tran", tStop: 1e-3, tStep: 1e-5 } });
    expect(steps(r.time).largest).toBeLessThanOrEqual(1e-5 * (1 + 1e-9));
    expect(r.time[r.time.length - 1]).toBe(1e-3);
  });
  it("with only tStop, tStop/50 bounds every step", () => {
    const r = runTran({ elements: rc, analysis: { kind: "tran", tStop: 1e-3 } });
    expect(steps(r.time).largest).toBeLessThanOrEqual((1e-3 / 50) * (1 + 1e-9));
  });
  it("a given maxStep replaces the tStep bound (the caller sets the step budget)", () => {
    const r = runTran({ elements: rc, analysis: { kind: "tran", tStop: 1e-3, tStep: 1e-6, maxStep: 5e-5 } });
    const s = steps(r.time);
    expect(s.largest).toBeLessThanOrEqual(5e-5 * (1 + 1e-9));
    expect(s.largest).toBeGreaterThan(1e-6 * 10); // nothing to resolve after the first microseconds: steps grow past tStep
  });
  it("a sine bounds the step to 1/64 of its period, and a pulse train to 1/16, even under a larger maxStep", () => {
    const sine = runTran({
      elements: [{ kind: "vsource", name: "V1", nodes: ["in", "gnd"], wave: { shape: "sine", amplitude: 1, freq: 1e3 } }, { kind: "resistor", name: "R1", nodes: ["in", "gnd"], value: 1e3 }],
      analysis: { kind: "tran", tStop: 5e-3, maxStep: 1e-3 },
    });
    expect(steps(sine.time).largest).toBeLessThanOrEqual((1e-3 / 64) * (1 + 1e-9));
    const pulse = runTran({
      elements: [
        { kind: "vsource", name: "V1", nodes: ["in", "gnd"], wave: { shape: "pulse", low: 0, high: 1, width: 4e-4, period: 1e-3 } },
        { kind: "resistor", name: "R1", nodes: ["in", "gnd"], value: 1e3 },
      ],
      analysis: { kind: "tran", tStop: 5e-3, maxStep: 1e-3 },
    });
    expect(steps(pulse.time).largest).toBeLessThanOrEqual((1e-3 / 16) * (1 + 1e-9));
  });
});
