import { describe, expect, it } from "vitest";
import { runTran } from "./helpers";

/** Depletion charge Cj0·Vj/(1−m)·[1 − (1 − V/Vj)^{1−m}] (docs/references.md §1.4, valid below Fc·Vj). */
const qj = (v: number, cj0: number, vj: number, m: number) => ((cj0 * vj) / (1 - m)) * (1 - Math.pow(1 - v / vj, 1 - m));

describe("nonlinear junction charge is conserved in transient (charges integrated, not C·dv/dt; docs/references.md §1.4)", () => {
  it("a diode's depletion capacitance charged to −5 V: ∫ i dt = Q(−5 V) − Q(0)", () => {
    const model = { Is: 1e-14, Cj0: 10e-12, Vj: 0.7, m: 0.5 };
    const r = runTran({
      elements: [
        { kind: "vsource", name: "V1", nodes: ["in", "0"], wave: { shape: "pwl", points: [[0, 0], [1e-7, 0], [2e-7, -5]] } },
        { kind: "resistor", name: "R1", nodes: ["in", "a"], value: 10e3 },
        { kind: "diode", name: "D1", nodes: ["a", "0"], model },
      ],
      analysis: { kind: "tran", tStop: 5e-6 },
      options: { gmin: 0, reltol: 1e-6 },
    });
    let q = 0;
    for (let i = 1; i < r.time.length; i++) q += 0.5 * (r.currents.D1[i] + r.currents.D1[i - 1]) * (r.time[i] - r.time[i - 1]);
    const expected = qj(-5, model.Cj0, model.Vj, model.m) - qj(0, model.Cj0, model.Vj, model.m);
    expect(r.nodes.a[r.time.length - 1]).toBeCloseTo(-5, 6);
    expect(q / expected).toBeCloseTo(1, 3);
  });

  it("a BJT's base charge (Cje + Cjc + τF·IF) returns to zero over a pulse: net base charge ≈ 0", () => {
    const r = runTran({
      elements: [
        { kind: "vsource", name: "VCC", nodes: ["vcc", "0"], dc: 10 },
        { kind: "resistor", name: "RC", nodes: ["vcc", "c"], value: 1e3 },
        { kind: "vsource", name: "VIN", nodes: ["in", "0"], wave: { shape: "pulse", low: 0, high: 3, delay: 1e-6, rise: 10e-9, fall: 10e-9, width: 2e-6, period: null } },
        { kind: "resistor", name: "RB", nodes: ["in", "b"], value: 10e3 },
        { kind: "bjt", name: "Q1", nodes: ["c", "b", "0"], model: { Is: 1e-15, betaF: 100, Cje0: 5e-12, Cjc0: 2e-12, tauF: 1e-9 } },
      ],
      analysis: { kind: "tran", tStop: 20e-6 },
      options: { reltol: 1e-5 },
    });
    // the transistor switched on (saturated) during the pulse and back off afterwards
    let vmin = Infinity;
    for (let i = 0; i < r.time.length; i++) vmin = Math.min(vmin, r.nodes.c[i]);
    expect(vmin).toBeLessThan(0.3);
    expect(r.nodes.c[r.time.length - 1]).toBeCloseTo(10, 3);
    // Charge balance at the base: the current into the base minus the static (recombination) base current of the
    // transport equations (docs/references.md §1.2, evaluated here from the node voltages) is dQ/dt of the junction and
    // diffusion charges; over the pulse it rises to the stored charge and returns to zero, because the charges are
    // functions of the (equal) initial and final junction voltages.
    const vt = (1.380649e-23 * 300.15) / 1.602176634e-19;
    const is = 1e-15;
    const ibStatic = (k: number) => {
      const vb = r.nodes.b[k], vc = r.nodes.c[k];
      return (is / 100) * (Math.exp(vb / vt) - 1) + is * (Math.exp((vb - vc) / vt) - 1);
    };
    const dq = (k: number) => (r.nodes.in[k] - r.nodes.b[k]) / 10e3 - ibStatic(k);
    let q = 0, qMax = 0;
    for (let i = 1; i < r.time.length; i++) {
      q += 0.5 * (dq(i) + dq(i - 1)) * (r.time[i] - r.time[i - 1]);
      qMax = Math.max(qMax, q);
    }
    // stored charge is at least the collector-junction swing: Cjc·ΔVbc ≈ 2 pF × 10 V
    expect(qMax).toBeGreaterThan(10e-12);
    expect(Math.abs(q)).toBeLessThan(0.02 * qMax);
  });
});
