import { describe, expect, it } from "vitest";
import type { NetlistElement } from "@/lib/sim";
import { T300C, VT300, runTran } from "./helpers";

// A 50-section RC ladder ending in a diode, driven by a 0 → 1 V step. Regression for a pivot order chosen at DC and
// reused in transient, where C/h dominates: chained large multipliers once turned the far end into garbage.
describe("50-section RC ladder with a diode at the far end", () => {
  const N = 50;
  const elements: NetlistElement[] = [
    { kind: "vsource", name: "V1", nodes: ["n0", "0"], wave: { shape: "pulse", low: 0, high: 1, delay: 1e-6, rise: 1e-7, fall: 1e-7, width: 1, period: null } },
  ];
  for (let i = 0; i < N; i++) {
    elements.push({ kind: "resistor", name: `R${i}`, nodes: [`n${i}`, `n${i + 1}`], value: 10 });
    elements.push({ kind: "capacitor", name: `C${i}`, nodes: [`n${i + 1}`, "0"], value: 1e-9 });
  }
  elements.push({ kind: "diode", name: "D1", nodes: [`n${N}`, "0"], model: { Is: 1e-14 } });
  const r = runTran({ temperature: T300C, elements, analysis: { kind: "tran", tStop: 1e-3 }, options: { gmin: 0 } });

  it("stays within the source's range at every node and time (an RC network's step response is bounded by it)", () => {
    for (const name of ["n1", "n10", "n25", "n40", "n50"]) {
      for (const v of r.nodes[name]) {
        expect(v).toBeGreaterThanOrEqual(-1e-6);
        expect(v).toBeLessThanOrEqual(1 + 1e-6);
      }
    }
  });

  it("settles where the diode current through the 500 Ω ladder balances: v = 1 − 500·Is·(e^{v/Vt} − 1) (Shockley)", () => {
    let lo = 0, hi = 1; // bisection (common practice) on the monotone balance
    for (let k = 0; k < 200; k++) {
      const v = 0.5 * (lo + hi);
      if (1 - v - 500 * 1e-14 * Math.expm1(v / VT300) > 0) lo = v; else hi = v;
    }
    const last = r.time.length - 1;
    expect(r.nodes.n50[last]).toBeCloseTo(lo, 4);
    expect(r.stats.accepted).toBeLessThan(2000);
  });
});
