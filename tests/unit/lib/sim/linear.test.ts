import { describe, expect, it } from "vitest";
import { at, markers, runAc, runTran } from "./helpers";

const tight = { reltol: 1e-7, abstol: 1e-15, vntol: 1e-9 };

describe("transient: first-order steps against their closed forms (docs/references.md §5b)", () => {
  it("RC charging, τ = 1 ms: v(τ), v(2τ), v(5τ) = 1 − e^{−k}", () => {
    const r = runTran({
      elements: [
        { kind: "vsource", name: "V1", nodes: ["in", "0"], dc: 1 },
        { kind: "resistor", name: "R1", nodes: ["in", "out"], value: 1000 },
        { kind: "capacitor", name: "C1", nodes: ["out", "0"], value: 1e-6, ic: 0 },
        ...markers([1e-3, 2e-3, 5e-3]),
      ],
      analysis: { kind: "tran", tStop: 5e-3, start: "ic" },
      options: tight,
    });
    // closed form 1 − e^{−t/τ}: 0.632120558829, 0.864664716763, 0.993262053001 (docs/references.md §5b)
    expect(at(r, r.nodes.out, 1e-3)).toBeCloseTo(0.632120558829, 5);
    expect(at(r, r.nodes.out, 2e-3)).toBeCloseTo(0.864664716763, 5);
    expect(at(r, r.nodes.out, 5e-3)).toBeCloseTo(0.993262053001, 5);
    // capacitor current = (1 − v)/R
    expect(at(r, r.currents.C1, 1e-3)).toBeCloseTo((1 - 0.632120558829) / 1000, 8);
  });

  it("RL: R = 100 Ω, L = 10 mH, 1 V → i(100 µs) = 6.321205588 mA (docs/references.md §5b)", () => {
    const r = runTran({
      elements: [
        { kind: "vsource", name: "V1", nodes: ["in", "0"], dc: 1 },
        { kind: "resistor", name: "R1", nodes: ["in", "x"], value: 100 },
        { kind: "inductor", name: "L1", nodes: ["x", "0"], value: 10e-3, ic: 0 },
        ...markers([1e-4, 5e-4]),
      ],
      analysis: { kind: "tran", tStop: 5e-4, start: "ic" },
      options: tight,
    });
    // tolerance 5e-8 A (≈ 1e-5 relative): integration error allowed at reltol 1e-7
    expect(at(r, r.currents.L1, 1e-4)).toBeCloseTo(6.321205588e-3, 7);
    // i(5τ) = 10 mA·(1 − e^{−5}) = 9.93262053 mA
    expect(at(r, r.currents.L1, 5e-4)).toBeCloseTo(9.93262053001e-3, 7);
  });
});

describe("transient: underdamped series RLC step (docs/references.md §5a)", () => {
  const tp = Math.PI / 31224.989992; // peak time π/ωd
  const r = runTran({
    elements: [
      { kind: "vsource", name: "V1", nodes: ["in", "0"], dc: 1 },
      { kind: "resistor", name: "R1", nodes: ["in", "a"], value: 10 },
      { kind: "inductor", name: "L1", nodes: ["a", "b"], value: 1e-3 },
      { kind: "capacitor", name: "C1", nodes: ["b", "0"], value: 1e-6 },
      ...markers([10e-6, 50e-6, tp, 200e-6, 1e-3]),
    ],
    analysis: { kind: "tran", tStop: 1e-3, start: "ic" },
    options: tight,
  });
  // tolerance 5e-5 V: integration error allowed at reltol 1e-7 over five ringing periods
  it("matches v_C(t) at 10, 50, 200 µs and 1 ms", () => {
    expect(at(r, r.nodes.b, 10e-6)).toBeCloseTo(0.047975099963, 4);
    expect(at(r, r.nodes.b, 50e-6)).toBeCloseTo(0.867862787886, 4);
    expect(at(r, r.nodes.b, 200e-6)).toBeCloseTo(0.63463774589, 4);
    expect(at(r, r.nodes.b, 1e-3)).toBeCloseTo(0.993589260855, 4);
  });
  it("overshoot 60.4679066 % at t_p = 100.6114863 µs", () => {
    expect(at(r, r.nodes.b, tp)).toBeCloseTo(1.604679065694, 4);
    let k = 0;
    for (let i = 0; i < r.time.length; i++) if (r.nodes.b[i] > r.nodes.b[k]) k = i;
    // the sampled maximum is the peak: overshoot within 1e-4 and time within 1 µs
    expect((r.nodes.b[k] - 1) * 100).toBeCloseTo(60.4679066, 2);
    expect(Math.abs(r.time[k] - 100.6114863e-6)).toBeLessThan(1e-6);
  });
});

describe("transient: LC tank conserves its amplitude (trapezoidal rule is energy-preserving on linear LC)", () => {
  it("1 mH / 1 µF from 1 V: amplitude and energy after 100 periods within 0.5 %", () => {
    const f0 = 1 / (2 * Math.PI * Math.sqrt(1e-3 * 1e-6)); // 5032.92 Hz (docs/references.md §5a, f0)
    const tStop = 100 / f0;
    const r = runTran({
      elements: [
        { kind: "capacitor", name: "C1", nodes: ["a", "0"], value: 1e-6, ic: 1 },
        { kind: "inductor", name: "L1", nodes: ["a", "0"], value: 1e-3, ic: 0 },
        { kind: "resistor", name: "Rbig", nodes: ["a", "0"], value: 1e15 },
      ],
      analysis: { kind: "tran", tStop, start: "ic" },
    });
    let maxLast = 0;
    for (let i = 0; i < r.time.length; i++) {
      if (r.time[i] > tStop - 1 / f0) maxLast = Math.max(maxLast, Math.abs(r.nodes.a[i]));
    }
    expect(maxLast).toBeGreaterThan(0.995);
    expect(maxLast).toBeLessThan(1.005);
    const last = r.time.length - 1;
    const energy = 0.5 * 1e-6 * r.nodes.a[last] ** 2 + 0.5 * 1e-3 * r.currents.L1[last] ** 2;
    expect(energy / (0.5 * 1e-6)).toBeGreaterThan(0.995);
    expect(energy / (0.5 * 1e-6)).toBeLessThan(1.005);
  });
});

describe("transient: source corners are hit exactly", () => {
  it("pulse corners (delay, rise, width, fall, period) are accepted time points with exact values", () => {
    const r = runTran({
      elements: [
        { kind: "vsource", name: "V1", nodes: ["in", "0"], wave: { shape: "pulse", low: 0.5, high: 3, delay: 1e-4, rise: 1e-5, fall: 2e-5, width: 2e-4, period: 5e-4 } },
        { kind: "resistor", name: "R1", nodes: ["in", "out"], value: 1000 },
        { kind: "capacitor", name: "C1", nodes: ["out", "0"], value: 1e-8 },
      ],
      analysis: { kind: "tran", tStop: 1e-3 },
    });
    const corners: [number, number][] = [
      [1e-4, 0.5], [1.1e-4, 3], [3.1e-4, 3], [3.3e-4, 0.5], [6e-4, 0.5], [6.1e-4, 3], [8.1e-4, 3], [8.3e-4, 0.5],
    ];
    for (const [t, v] of corners) expect(at(r, r.nodes.in, t)).toBeCloseTo(v, 12);
  });
  it("PWL corners are accepted time points with exact values", () => {
    const pts: [number, number][] = [[0, 0], [1e-4, 0], [1.5e-4, 2], [4e-4, 2], [4.001e-4, -1], [7e-4, 0.25]];
    const r = runTran({
      elements: [
        { kind: "vsource", name: "V1", nodes: ["in", "0"], wave: { shape: "piecewise", points: pts } },
        { kind: "resistor", name: "R1", nodes: ["in", "out"], value: 1000 },
        { kind: "capacitor", name: "C1", nodes: ["out", "0"], value: 1e-8 },
      ],
      analysis: { kind: "tran", tStop: 1e-3 },
    });
    for (const [t, v] of pts.slice(1)) expect(at(r, r.nodes.in, t)).toBeCloseTo(v, 12);
    // neither tStep nor maxStep given: the step is bounded by tStop/50 (README, transient step control)
    for (let i = 1; i < r.time.length; i++) expect(r.time[i] - r.time[i - 1]).toBeLessThanOrEqual(1e-3 / 50 + 1e-18);
  });
  it("an explicit maxStep is honoured", () => {
    const r = runTran({
      elements: [
        { kind: "vsource", name: "V1", nodes: ["in", "0"], dc: 1 },
        { kind: "resistor", name: "R1", nodes: ["in", "0"], value: 1000 },
      ],
      analysis: { kind: "tran", tStop: 1e-3, maxStep: 1e-5 },
    });
    for (let i = 1; i < r.time.length; i++) expect(r.time[i] - r.time[i - 1]).toBeLessThanOrEqual(1e-5 * (1 + 1e-12));
    expect(r.time[r.time.length - 1]).toBe(1e-3);
  });
});

describe("AC against closed-form transfer functions", () => {
  it("RC low-pass H = 1/(1 + jωRC) at every point, log spacing 10 Hz–1 MHz", () => {
    const R = 1000, C = 1e-7;
    const r = runAc({
      elements: [
        { kind: "vsource", name: "V1", nodes: ["in", "0"], ac: 1 },
        { kind: "resistor", name: "R1", nodes: ["in", "out"], value: R },
        { kind: "capacitor", name: "C1", nodes: ["out", "0"], value: C },
      ],
      analysis: { kind: "ac", fStart: 10, fStop: 1e6, pointsPerDecade: 10 },
    });
    expect(r.freq.length).toBe(51);
    expect(r.freq[10]).toBeCloseTo(100, 9);
    for (let k = 0; k < r.freq.length; k++) {
      const wrc = 2 * Math.PI * r.freq[k] * R * C;
      const den = 1 + wrc * wrc;
      expect(r.nodes.out.re[k]).toBeCloseTo(1 / den, 10);
      expect(r.nodes.out.im[k]).toBeCloseTo(-wrc / den, 10);
      // source current: −(jωC·v_out) flows from + through the source: I(V1) = −v_in/(R + 1/jωC)
      const zr = R, zi = -1 / (2 * Math.PI * r.freq[k] * C);
      const zz = zr * zr + zi * zi;
      expect(r.currents.V1.re[k]).toBeCloseTo(-zr / zz, 12);
      expect(r.currents.V1.im[k]).toBeCloseTo(zi / zz, 12);
    }
  });
  it("series RLC, output across C: H = 1/(1 − ω²LC + jωRC)", () => {
    const R = 10, L = 1e-3, C = 1e-6;
    const r = runAc({
      elements: [
        { kind: "vsource", name: "V1", nodes: ["in", "0"], ac: 2 },
        { kind: "resistor", name: "R1", nodes: ["in", "a"], value: R },
        { kind: "inductor", name: "L1", nodes: ["a", "b"], value: L },
        { kind: "capacitor", name: "C1", nodes: ["b", "0"], value: C },
      ],
      analysis: { kind: "ac", fStart: 100, fStop: 1e5, pointsPerDecade: 20 },
    });
    for (let k = 0; k < r.freq.length; k++) {
      const w = 2 * Math.PI * r.freq[k];
      const dr = 1 - w * w * L * C, di = w * R * C;
      const den = dr * dr + di * di;
      expect(r.nodes.b.re[k]).toBeCloseTo((2 * dr) / den, 8);
      expect(r.nodes.b.im[k]).toBeCloseTo((-2 * di) / den, 8);
    }
    // resonance peak |H(f0)| = 1/(ωo·R·C) = Q = 3.16228 at f0 = 5032.92 Hz (docs/references.md §5a, ζ = 0.158)
  });
  it("honours each source's AC magnitude and phase (a current-source probe into a resistor)", () => {
    const r = runAc({
      elements: [
        { kind: "isource", name: "I1", nodes: ["0", "a"], ac: 1e-3, acPhase: 90 },
        { kind: "resistor", name: "R1", nodes: ["a", "0"], value: 2000 },
        { kind: "vsource", name: "V0", nodes: ["a", "b"], dc: 0, ac: 0 },
        { kind: "resistor", name: "R2", nodes: ["b", "0"], value: 2000 },
      ],
      analysis: { kind: "ac", fStart: 1000, fStop: 1000, pointsPerDecade: 1 },
    });
    // Ohm's law: 1 mA∠90° into 1 kΩ (2k ∥ 2k) → 1 V∠90°; half flows through V0 from a to b
    expect(r.nodes.a.re[0]).toBeCloseTo(0, 12);
    expect(r.nodes.a.im[0]).toBeCloseTo(1, 12);
    expect(r.currents.V0.im[0]).toBeCloseTo(0.5e-3, 14);
  });
});

describe("transient: sine source", () => {
  it("an RC low-pass driven at f = 1/(2πRC) settles to amplitude 1/√2 and −45° (closed form of H = 1/(1 + jωRC))", () => {
    const R = 1000, C = 1e-7;
    const f = 1 / (2 * Math.PI * R * C); // 1591.5 Hz
    const r = runTran({
      elements: [
        { kind: "vsource", name: "V1", nodes: ["in", "0"], wave: { shape: "sine", offset: 0.5, amplitude: 1, freq: f, delay: 0 } },
        { kind: "resistor", name: "R1", nodes: ["in", "out"], value: R },
        { kind: "capacitor", name: "C1", nodes: ["out", "0"], value: C },
      ],
      analysis: { kind: "tran", tStop: 20 / f, maxStep: 1 / (100 * f) },
      options: { reltol: 1e-5 },
    });
    // the source itself is exact at every accepted point
    for (let i = 0; i < r.time.length; i += 37) expect(r.nodes.in[i]).toBeCloseTo(0.5 + Math.sin(2 * Math.PI * f * r.time[i]), 12);
    // after 10 periods (63 time constants, so the start-up transient has died) the response is offset + |H|·sin(ωt − 45°)
    for (let i = 0; i < r.time.length; i++) {
      const t = r.time[i];
      if (t < 10 / f) continue;
      expect(r.nodes.out[i]).toBeCloseTo(0.5 + Math.SQRT1_2 * Math.sin(2 * Math.PI * f * t - Math.PI / 4), 3);
    }
  });
});
