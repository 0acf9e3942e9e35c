import { describe, expect, it } from "vitest";
import { runTran } from "./helpers";

describe("regenerative switching: op-amp Schmitt trigger", () => {
  // Non-inverting feedback R1 = 10 kΩ (to ground), R2 = 30 kΩ (from the output); output saturates at ±11 V
  // (±12 V rails, 1 V swing limits). Thresholds: ±Vsat·R1/(R1 + R2) = ±2.75 V (comparator with hysteresis,
  // e.g. Sedra & Smith, "bistable multivibrators").
  const r = runTran({
    elements: [
      { kind: "vsource", name: "Vp", nodes: ["vcc", "0"], dc: 12 },
      { kind: "vsource", name: "Vn", nodes: ["vee", "0"], dc: -12 },
      { kind: "vsource", name: "Vin", nodes: ["in", "0"], wave: { shape: "sine", amplitude: 5, freq: 1e3 } },
      { kind: "opamp", name: "U1", nodes: ["fb", "in", "out", "vcc", "vee"], model: { Aol: 1e5, GBW: 1e6, swingHigh: 1, swingLow: 1, slewRate: 10e6 } },
      { kind: "resistor", name: "R1", nodes: ["fb", "0"], value: 10e3 },
      { kind: "resistor", name: "R2", nodes: ["out", "fb"], value: 30e3 },
    ],
    analysis: { kind: "tran", tStop: 3e-3 },
  });

  it("saturates at the swing limits", () => {
    let lo = Infinity, hi = -Infinity;
    for (const v of r.nodes.out) { lo = Math.min(lo, v); hi = Math.max(hi, v); }
    expect(hi).toBeCloseTo(11, 1);
    expect(lo).toBeCloseTo(-11, 1);
  });

  it("leaves each rail when the input crosses ±2.75 V (the output starts to move within 0.1 V of input travel)", () => {
    const starts: number[] = [];
    for (let i = 1; i < r.time.length; i++) {
      const a = r.nodes.out[i - 1], b = r.nodes.out[i];
      if (a > 10.5 && b <= 10.5 && r.time[i] > 1e-4) starts.push(r.nodes.in[i]);
      if (a < -10.5 && b >= -10.5 && r.time[i] > 1e-4) starts.push(r.nodes.in[i]);
    }
    expect(starts.length).toBeGreaterThanOrEqual(5);
    for (const v of starts) {
      expect(Math.abs(v)).toBeGreaterThan(2.75);
      expect(Math.abs(v)).toBeLessThan(2.85);
    }
  });
});
