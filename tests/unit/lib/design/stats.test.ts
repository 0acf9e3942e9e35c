import { describe, expect, it } from "vitest";
import { createRng, deviation, histogram, rngForRun, summarize } from "@/lib/design/stats";

describe("seeded random numbers", () => {
  it("repeats with the same seed and differs with another", () => {
    const a = createRng(42), b = createRng(42), c = createRng(43);
    const xa = [a(), a(), a()], xb = [b(), b(), b()], xc = [c(), c(), c()];
    expect(xa).toEqual(xb);
    expect(xa).not.toEqual(xc);
    for (const x of xa) expect(x >= 0 && x < 1).toBe(true);
  });
  it("per-run streams do not depend on how runs are split", () => {
    expect(rngForRun(7, 123)()).toBe(rngForRun(7, 123)());
    expect(rngForRun(7, 123)()).not.toBe(rngForRun(7, 124)());
  });
});

// Reference: first-order (delta-method) propagation of independent errors, k = Rb/(Rt+Rb):
// ∂k/∂Rt·Rt = −k(1−k), ∂k/∂Rb·Rb = k(1−k)  ⇒  σk ≈ k(1−k)·√2·σr for equal relative σr.
// Uniform on ±t: σr = t/√3. Normal with t at 3σ, truncated at ±3σ: variance factor
// 1 − 2·3·φ(3)/(2Φ(3)−1) = 0.973336 (truncated-normal variance, closed form; φ(3) = 0.00443185, Φ(3) = 0.99865010).
describe("Monte Carlo of a linear divider against the analytic standard deviation", () => {
  const runs = 40000;
  const tol = 0.01;
  const rt = 47e3, rb = 1e3;
  const k0 = rb / (rt + rb);
  function spread(distribution: "uniform" | "normal") {
    const rng = createRng(2024);
    const k = new Float64Array(runs);
    for (let i = 0; i < runs; i++) {
      const t = rt * (1 + deviation(rng, tol, distribution));
      const b = rb * (1 + deviation(rng, tol, distribution));
      k[i] = b / (t + b);
    }
    return summarize(k);
  }
  it("uniform tolerances", () => {
    const s = spread("uniform");
    const sigma = k0 * (1 - k0) * Math.SQRT2 * (tol / Math.sqrt(3));
    expect(s.mean / k0 - 1).toBeLessThan(3 * sigma / k0 / Math.sqrt(runs) + 1e-5);
    expect(Math.abs(s.std / sigma - 1)).toBeLessThan(0.02); // sampling error of σ at N = 40 000 ≈ 0.4 %
  });
  it("normal tolerances, truncated at 3σ", () => {
    const s = spread("normal");
    const sigma = k0 * (1 - k0) * Math.SQRT2 * (tol / 3) * Math.sqrt(0.973336);
    expect(Math.abs(s.std / sigma - 1)).toBeLessThan(0.02);
    // Every draw stays within the tolerance: k within the worst-case corners.
    const kLow = (rb * (1 - tol)) / (rt * (1 + tol) + rb * (1 - tol));
    const kHigh = (rb * (1 + tol)) / (rt * (1 - tol) + rb * (1 + tol));
    expect(s.min).toBeGreaterThanOrEqual(kLow);
    expect(s.max).toBeLessThanOrEqual(kHigh);
  });
});

describe("summaries", () => {
  it("mean, sample σ and histogram of a known set", () => {
    // Reference: hand arithmetic — 2,4,4,4,5,5,7,9: mean 5, sample variance 32/7.
    const s = summarize([2, 4, 4, 4, 5, 5, 7, 9, Number.NaN]);
    expect(s.count).toBe(8);
    expect(s.mean).toBe(5);
    expect(s.std).toBeCloseTo(Math.sqrt(32 / 7), 12);
    const h = histogram([0, 1, 2, 3], 2);
    expect([...h.counts]).toEqual([2, 2]);
    expect([...h.edges]).toEqual([0, 1.5, 3]);
  });
});
