import { describe, expect, it } from "vitest";
import {
  bandwidth3dB, dampingFromOvershoot, dampingFromPhaseMargin, loopMetrics, overshootFromDamping, phaseMarginFromDamping, stepMetrics,
} from "@/lib/design/metrics";
import { estimateRinging, matrixPencil } from "@/lib/design/ringing";

// Reference: docs/references.md §5a — second-order loop T = ωn²/(s(s+2ζωn)): PM = atan(2ζ/√(√(1+4ζ⁴)−2ζ²)),
// overshoot exp(−ζπ/√(1−ζ²)), ωc/ωn = √(√(1+4ζ⁴)−2ζ²) (Ogata / Nise; table computed with numpy).
const TABLE: [number, number, number, number][] = [
  [0.1, 11.4206, 72.9248, 0.99005],
  [0.2, 22.6023, 52.6621, 0.96083],
  [0.3, 33.2725, 37.2326, 0.914369],
  [0.4, 43.1176, 25.3827, 0.854373],
  [0.5, 51.8273, 16.3034, 0.786151],
  [0.6, 59.1873, 9.478, 0.715705],
  [Math.SQRT1_2, 65.5302, 4.3214, 0.643594],
  [0.8, 69.86, 1.5165, 0.586784],
];

describe("phase margin ↔ damping ↔ overshoot (second-order loop)", () => {
  it.each(TABLE)("ζ = %f: PM %f°, overshoot %f %%", (zeta, pm, os) => {
    expect(phaseMarginFromDamping(zeta)).toBeCloseTo(pm, 3);
    expect(overshootFromDamping(zeta)).toBeCloseTo(os, 3);
    expect(dampingFromPhaseMargin(pm)).toBeCloseTo(zeta, 4);
    expect(dampingFromOvershoot(os)).toBeCloseTo(zeta, 4);
  });
  it("PM 45° ⇔ ζ = 0.420448 and 5 % overshoot ⇔ ζ = 0.690107 (docs/references.md §5a)", () => {
    expect(dampingFromPhaseMargin(45)).toBeCloseTo(0.420448, 5);
    expect(dampingFromOvershoot(5)).toBeCloseTo(0.690107, 5);
  });
  it.each(TABLE)("loopMetrics on T(jω) with ζ = %f finds the table's PM and crossover", (zeta, pm, _os, wcOverWn) => {
    const wn = 2 * Math.PI * 1e4;
    const n = 801;
    const f = new Float64Array(n), re = new Float64Array(n), im = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      f[i] = 10 * 10 ** (i / 200); // 10 Hz … 100 kHz, 200 points per decade
      const w = 2 * Math.PI * f[i];
      // T = wn² / (jw (jw + 2ζwn)) = wn² / (−w² + j·2ζwn·w)
      const dr = -w * w, di = 2 * zeta * wn * w;
      const d2 = dr * dr + di * di;
      re[i] = (wn * wn * dr) / d2;
      im[i] = (-wn * wn * di) / d2;
    }
    const m = loopMetrics(f, re, im);
    expect(m.phaseMarginDeg!).toBeCloseTo(pm, 1);
    expect(m.crossoverHz! / 1e4).toBeCloseTo(wcOverWn, 3);
    // Phase never reaches −180°: no gain margin.
    expect(m.gainMarginDb).toBeNull();
  });
  it("gain margin of T = K/(1+s/ω)³ with K = 4: −180° at ω√3, |T| = K/8 there (closed form)", () => {
    const n = 601;
    const f = new Float64Array(n), re = new Float64Array(n), im = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      f[i] = 10 * 10 ** (i / 150);
      const x = f[i] / 1000;
      // (1 + jx)^3 = (1 − 3x²) + j(3x − x³)
      const dr = 1 - 3 * x * x, di = 3 * x - x ** 3;
      const d2 = dr * dr + di * di;
      re[i] = (4 * dr) / d2;
      im[i] = (-4 * di) / d2;
    }
    const m = loopMetrics(f, re, im);
    expect(m.phaseCrossoverHz! / 1000).toBeCloseTo(Math.sqrt(3), 2);
    expect(m.gainMarginDb!).toBeCloseTo(-20 * Math.log10(4 / 8), 1);
    // Modulus margin: the closed form |1 + 4/(1+jx)³| minimised on a dense grid (independent of the 150/decade grid).
    let best = Infinity;
    for (let x = 0.01; x < 100; x *= 1.0001) {
      const dr = 1 - 3 * x * x, di = 3 * x - x ** 3, d2 = dr * dr + di * di;
      best = Math.min(best, Math.hypot(1 + (4 * dr) / d2, (-4 * di) / d2));
    }
    expect(m.modulusMargin).toBeCloseTo(best, 3);
    expect(m.modulusMargin).toBeLessThanOrEqual(0.5); // |1 + T| at the −180° point is 1 − K/8 = 0.5
  });
});

// Reference: the Routh–Hurwitz criterion. (1 + s)³ + K = s³ + 3s² + 3s + 1 + K is stable iff 3·3 > 1 + K, i.e.
// K < 8; s(1 + s/a)(1 + s/b) + K, times ab: s³ + (a+b)s² + ab·s + abK, is stable iff K < a + b, and its −180°
// point is ω = √(ab) with |T| = K/(a+b) there (Ogata, Modern Control Engineering, Routh's stability criterion).
describe("closed-loop stability from the loop gain (Nyquist: T(jω) encircles −1)", () => {
  const grid = (tf: (w: number) => [number, number]) => {
    const n = 900;
    const f = new Float64Array(n), re = new Float64Array(n), im = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      f[i] = 10 ** (i / 150); // 1 Hz … 1 MHz
      [re[i], im[i]] = tf(2 * Math.PI * f[i]);
    }
    return loopMetrics(f, re, im);
  };
  const div = (nr: number, ni: number, dr: number, di: number): [number, number] => {
    const d2 = dr * dr + di * di;
    return [(nr * dr + ni * di) / d2, (ni * dr - nr * di) / d2];
  };
  const cube = (K: number) => grid((w) => {
    const x = w / (2 * Math.PI * 1000);
    return div(K, 0, 1 - 3 * x * x, 3 * x - x ** 3);
  });
  it.each([[2, false], [7, false], [9, true], [16, true]] as const)("K/(1 + s/ω)³ with K = %d: unstable = %s (K < 8 is stable)", (K, unstable) => {
    const m = cube(K);
    expect(m.unstable).toBe(unstable);
    expect(m.gainMarginDb!).toBeCloseTo(20 * Math.log10(8 / K), 1);
  });
  it.each([[0.5, false], [0.9, false], [1.2, true], [3, true]] as const)("K/(s(1 + s/a)(1 + s/b)), K = %f·(a + b): unstable = %s", (k, unstable) => {
    const a = 2 * Math.PI * 1e3, b = 2 * Math.PI * 1e4, K = k * (a + b);
    const m = grid((w) => {
      // jω(1 + jω/a)(1 + jω/b) = jω·(1 − ω²/ab + jω(1/a + 1/b)) = −ω²(1/a + 1/b) + jω(1 − ω²/ab)
      return div(K, 0, -w * w * (1 / a + 1 / b), w * (1 - (w * w) / (a * b)));
    });
    expect(m.unstable).toBe(unstable);
    expect(m.phaseCrossoverHz! * 2 * Math.PI).toBeCloseTo(Math.sqrt(a * b), -1);
    expect(m.gainMarginDb!).toBeCloseTo(-20 * Math.log10(k), 1);
    // an unstable loop's margins all fail, whatever the modulus margin's number says
    if (unstable) expect(m.phaseMarginDeg!).toBeLessThan(0);
  });
});

describe("bandwidth", () => {
  it("−3 dB of a single pole is its pole frequency (closed form)", () => {
    const n = 401;
    const f = new Float64Array(n), mag = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      f[i] = 10 ** (1 + i / 100);
      mag[i] = 20 * Math.log10(2 / Math.sqrt(1 + (f[i] / 1234) ** 2));
    }
    expect(bandwidth3dB(f, mag)! / 1234).toBeCloseTo(1, 3);
  });
});

// Reference: docs/references.md §5a series RLC, R = 10 Ω, L = 1 mH, C = 1 µF, 1 V step:
// vC(t) = 1 − e^{−ζω0t}[cos ωd t + ζ/√(1−ζ²) sin ωd t], overshoot 60.4679066 %, tp = 100.6114863 µs.
describe("step metrics on the analytic series-RLC step", () => {
  const w0 = 31622.776602, zeta = 0.158113883, wd = 31224.989992;
  const vc = (t: number) => (t < 0 ? 0 : 1 - Math.exp(-zeta * w0 * t) * (Math.cos(wd * t) + (zeta / Math.sqrt(1 - zeta * zeta)) * Math.sin(wd * t)));
  const tStep = 100e-6;
  // Non-uniform sampling, as a variable-step transient produces: denser early.
  const times: number[] = [];
  for (let t = 0; t <= 3e-3; t += t < 0.6e-3 ? 0.4e-6 : 1.1e-6) times.push(t);
  const t = Float64Array.from(times);
  const y = Float64Array.from(times, (x) => vc(x - tStep));
  const m = stepMetrics(t, y, tStep, { initial: 0, final: 1, target: 1 });

  it("overshoot and peak time match the second-order formulas", () => {
    expect(m.overshootPct).toBeCloseTo(60.4679066, 2);
    expect(m.peakTime! * 1e6).toBeCloseTo(100.6114863, 1);
    expect(m.steadyStateError).toBe(0);
  });
  it("rise and settling times match a dense root search on the closed form", () => {
    // Independent reference: the same closed form evaluated on a 1 ns grid.
    const dense = (level: number) => { for (let x = 0; x < 1e-3; x += 1e-9) if (vc(x) >= level) return x; return NaN; };
    expect(m.riseTime!).toBeCloseTo(dense(0.9) - dense(0.1), 7);
    const lastOut = (band: number) => { let last = 0; for (let x = 0; x < 2.9e-3; x += 1e-9) if (Math.abs(vc(x) - 1) > band) last = x; return last; };
    expect(m.settlingTime1pct! * 1e6).toBeCloseTo(lastOut(0.01) * 1e6, 0);
    expect(m.settlingTime01pct! * 1e6).toBeCloseTo(lastOut(0.001) * 1e6, 0);
  });
  it("ringing frequency and damping: pencil, FFT and peak spacing agree with ωd and ζ", () => {
    const fd = wd / (2 * Math.PI); // 4969.6 Hz
    expect(m.ringing.pencilHz! / fd).toBeCloseTo(1, 3);
    expect(m.ringing.pencilDamping!).toBeCloseTo(zeta, 3);
    expect(m.ringing.peakSpacingHz! / fd).toBeCloseTo(1, 2);
    expect(m.ringing.logDecrementDamping!).toBeCloseTo(zeta, 2);
    expect(Math.abs(m.ringing.fftHz! / fd - 1)).toBeLessThan(0.05);
  });
  it("a first-order step has no overshoot and rise time τ·ln 9 (docs/references.md §5b)", () => {
    const tau = 1e-4;
    const tt = Float64Array.from({ length: 5001 }, (_, i) => i * 2e-7);
    const yy = Float64Array.from(tt, (x) => 1 - Math.exp(-x / tau));
    const r = stepMetrics(tt, yy, 0, { initial: 0, final: 1 });
    expect(r.overshootPct).toBe(0);
    expect(r.riseTime! / tau).toBeCloseTo(Math.log(9), 4);
    expect(r.ringing.frequencyHz).toBeNull();
    // Settling to 1 %: e^{−t/τ} = 0.01 ⇒ t = τ·ln 100.
    expect(r.settlingTime1pct! / tau).toBeCloseTo(Math.log(100), 3);
  });
});

describe("matrix pencil", () => {
  it("recovers two damped modes from their sum (Hua & Sarkar 1990)", () => {
    const dt = 1e-6;
    const x = Float64Array.from({ length: 300 }, (_, n) => {
      const t = n * dt;
      return 2 * Math.exp(-3000 * t) * Math.cos(2 * Math.PI * 20e3 * t) + 0.5 * Math.exp(-8000 * t);
    });
    const modes = matrixPencil(x, dt);
    const osc = modes.find((m) => m.im > 0)!;
    const real = modes.find((m) => m.im === 0 || Math.abs(m.im) < 1)!;
    expect(osc.im / (2 * Math.PI)).toBeCloseTo(20e3, 0);
    expect(osc.re).toBeCloseTo(-3000, 0);
    expect(real.re).toBeCloseTo(-8000, 0);
    expect(osc.amplitude).toBeCloseTo(2, 3);
  });
  it("estimateRinging reports nothing for a tail that does not ring", () => {
    const t = Float64Array.from({ length: 200 }, (_, i) => i * 1e-5);
    const y = Float64Array.from(t, (x) => 1 - Math.exp(-x / 2e-4));
    const r = estimateRinging(t, y, 1, 0);
    expect(r.peakSpacingHz).toBeNull();
    expect(r.pencilHz).toBeNull();
  });
});

describe("disturbance metrics (load or supply step)", () => {
  it("deviation and recovery refer to the final value; checked against the closed form on a dense grid", () => {
    // y = 1 − 0.2·e^{−t/τ}·cos(ωt) after the disturbance at t0: largest deviation 20 % of the final value at t0.
    const tau = 50e-6, w = 2 * Math.PI * 40e3, t0 = 100e-6;
    const f = (t: number) => (t < t0 ? 1 : 1 - 0.2 * Math.exp(-(t - t0) / tau) * Math.cos(w * (t - t0)));
    const t = Float64Array.from({ length: 20001 }, (_, i) => i * 0.05e-6);
    const y = Float64Array.from(t, f);
    const m = stepMetrics(t, y, t0, { final: 1, disturbance: true });
    // Sampled every 50 ns, the first sample after t0 already sits 0.05 µs into the decay: 20·e^{−0.001} ≈ 19.98 %.
    expect(m.overshootPct).toBeCloseTo(20, 1);
    expect(m.peakTime!).toBeLessThan(0.1e-6);
    expect(m.riseTime).toBeNull();
    let last = 0;
    for (let x = t0; x < 1e-3; x += 1e-9) if (Math.abs(f(x) - 1) > 0.01) last = x;
    expect(m.settlingTime1pct! * 1e6).toBeCloseTo((last - t0) * 1e6, 1);
    // Ringing of the recovery: ωd = ω, ζ = (1/τ)/√((1/τ)² + ω²).
    expect(m.ringing.pencilHz! / 40e3).toBeCloseTo(1, 3);
    expect(m.ringing.pencilDamping!).toBeCloseTo(1 / tau / Math.hypot(1 / tau, w), 3);
  });
});

describe("loop margins with several gain crossovers", () => {
  // T(s) = (ωc/s) · (s² + 2ζz·ωz·s + ωz²)/(s² + 2ζp·ωz·s + ωz²) · 1/(1 + s/ωp): an integrator crossing 0 dB at
  // ωc, then a lightly damped pole pair above it (a load resonance) whose peak lifts |T| through 0 dB and back, so
  // |T| = 1 three times and the first crossing (PM ≈ 90°) is not the one that matters. Oracle: the closed form of T evaluated at crossings found by bisection on |T| − 1 (common practice: the
  // margin that matters is the smallest one).
  const wc = 2 * Math.PI * 1e4, wz = 2 * Math.PI * 1e5, zz = 0.7, zp = 0.01, wp = 2 * Math.PI * 1e7;
  function T(w: number): [number, number] {
    const mul = (a: [number, number], b: [number, number]): [number, number] => [a[0] * b[0] - a[1] * b[1], a[0] * b[1] + a[1] * b[0]];
    const div = (a: [number, number], b: [number, number]): [number, number] => {
      const d = b[0] * b[0] + b[1] * b[1];
      return [(a[0] * b[0] + a[1] * b[1]) / d, (a[1] * b[0] - a[0] * b[1]) / d];
    };
    const integ: [number, number] = [0, -wc / w];
    const notch = div([wz * wz - w * w, 2 * zz * wz * w], [wz * wz - w * w, 2 * zp * wz * w]);
    const pole = div([1, 0], [1, w / wp]);
    return mul(mul(integ, notch), pole);
  }
  const mag = (w: number) => Math.hypot(...T(w));
  it("reports the smallest phase margin and where it occurs", () => {
    const n = 2000;
    const freq = new Float64Array(n), re = new Float64Array(n), im = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      freq[i] = 10 ** (2 + (5 * i) / (n - 1));
      [re[i], im[i]] = T(2 * Math.PI * freq[i]);
    }
    const expected: { f: number; pm: number }[] = [];
    for (let i = 1; i < n; i++) {
      let a = 2 * Math.PI * freq[i - 1], b = 2 * Math.PI * freq[i];
      if ((mag(a) >= 1) === (mag(b) >= 1)) continue;
      for (let k = 0; k < 100; k++) {
        const m = Math.sqrt(a * b);
        if ((mag(m) >= 1) === (mag(a) >= 1)) a = m; else b = m;
      }
      const [x, y] = T(a);
      expected.push({ f: a / (2 * Math.PI), pm: 180 + (Math.atan2(y, x) * 180) / Math.PI });
    }
    expect(expected.length).toBe(3);
    // The first (downward) crossing is not the worst one here: a first-crossing rule would miss the margin.
    expect(expected[0].pm).toBeGreaterThan(Math.min(...expected.map((e) => e.pm)) + 10);
    const worst = expected.reduce((p, q) => (q.pm < p.pm ? q : p));
    const m = loopMetrics(freq, re, im);
    expect(m.phaseMarginDeg!).toBeCloseTo(worst.pm, 0);
    expect(m.crossoverHz! / worst.f).toBeCloseTo(1, 2);
  });
});
