import { describe, expect, it } from "vitest";
import { stepMarks } from "@/lib/workbench/stepMarks";

describe("stepMarks", () => {
  it("finds the 10 %/90 % crossings of a first-order step at τ·ln(10/9) and τ·ln 10", () => {
    // closed form: y = 1 − e^(−t/τ) reaches 10 % at τ·ln(1/0.9) and 90 % at τ·ln(1/0.1)
    const tau = 1e-3, n = 20001;
    const t = new Float64Array(n), y = new Float64Array(n);
    for (let i = 0; i < n; i++) { t[i] = (i / (n - 1)) * 10e-3; y[i] = 1 - Math.exp(-t[i]! / tau); }
    const m = stepMarks(t, y, { initial: 0, final: 1 });
    expect(m.t10).toBeCloseTo(tau * Math.log(1 / 0.9), 6);
    expect(m.t90).toBeCloseTo(tau * Math.log(10), 6);
    expect(m.band).toEqual({ low: 0.99, high: 1.01 }); // ±1 % of the step (common practice)
  });

  it("takes the peak in the step's direction, also for a falling step", () => {
    const t = Float64Array.from([0, 1, 2, 3, 4, 5]);
    const y = Float64Array.from([1, 1, 0.2, -0.1, 0.05, 0]);
    const m = stepMarks(t, y, { initial: 1, final: 0 });
    expect(m.peak).toEqual({ t: 3, value: -0.1 });
  });

  it("marks nothing for a record without a step", () => {
    expect(stepMarks([0, 1], [1, 1], { initial: 1, final: 1 })).toEqual({ t10: null, t90: null, peak: null, band: null });
  });
});
