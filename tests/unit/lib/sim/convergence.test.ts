import { describe, expect, it } from "vitest";
import type { Netlist } from "@/lib/sim";
import { buildCircuit } from "@/lib/sim/compile";
import { parseNetlist } from "@/lib/sim/netlist";
import { solveDc } from "@/lib/sim/analysis/newton";
import { T300C, VT300, runOp } from "./helpers";

function solveWith(n: Netlist) {
  const c = buildCircuit(parseNetlist(n));
  c.deadline = performance.now() + 20_000;
  solveDc(c, "test");
  return c;
}

/** Bisection (common practice) for a monotone decreasing f on [lo, hi]. */
function bisect(f: (x: number) => number, lo: number, hi: number): number {
  for (let i = 0; i < 200; i++) {
    const mid = 0.5 * (lo + hi);
    if (f(mid) > 0) lo = mid; else hi = mid;
  }
  return 0.5 * (lo + hi);
}

describe("DC continuation when plain Newton–Raphson runs out of iterations", () => {
  // Newton is capped at 4 iterations per solve so that the fallbacks must carry the solution.
  const diodeString: Netlist = {
    temperature: T300C,
    elements: [
      { kind: "vsource", name: "V1", nodes: ["a", "0"], dc: 100 },
      { kind: "resistor", name: "R1", nodes: ["a", "d1"], value: 10 },
      { kind: "diode", name: "D1", nodes: ["d1", "d2"] },
      { kind: "diode", name: "D2", nodes: ["d2", "d3"] },
      { kind: "diode", name: "D3", nodes: ["d3", "0"] },
    ],
    analysis: { kind: "op" },
    options: { maxNewton: 4, reltol: 1e-6, gmin: 0 },
  };

  it("three diodes from 100 V through 10 Ω: solved by source stepping, matches I = (100 − 3·Vt·ln(1 + I/Is))/10", () => {
    const c = solveWith(diodeString);
    expect(c.dcMethod).toBe("source");
    // fixed point of the closed form (a contraction: dI'/dI = −3Vt/(10·I) ≪ 1)
    let i = 10;
    for (let k = 0; k < 100; k++) i = (100 - 3 * VT300 * Math.log1p(i / 1e-14)) / 10;
    const r = runOp(diodeString);
    expect(r.currents.D1).toBeCloseTo(i, 5);
    expect(r.nodes.d3).toBeCloseTo(VT300 * Math.log1p(i / 1e-14), 5);
  });

  it("with the default iteration budget the same circuit converges by plain Newton to the same answer", () => {
    const c = solveWith({ ...diodeString, options: { reltol: 1e-6, gmin: 0 } });
    expect(c.dcMethod).toBe("newton");
  });

  it("cross-coupled BJT latch (symmetric state): solved by gmin stepping, matches the bisection solution of its KCL", () => {
    const latch: Netlist = {
      temperature: T300C,
      elements: [
        { kind: "vsource", name: "V1", nodes: ["vcc", "0"], dc: 5 },
        { kind: "resistor", name: "R1", nodes: ["vcc", "c1"], value: 1000 },
        { kind: "resistor", name: "R2", nodes: ["vcc", "c2"], value: 1000 },
        { kind: "resistor", name: "R3", nodes: ["c1", "b2"], value: 10000 },
        { kind: "resistor", name: "R4", nodes: ["c2", "b1"], value: 10000 },
        { kind: "bjt", name: "Q1", nodes: ["c1", "b1", "0"] },
        { kind: "bjt", name: "Q2", nodes: ["c2", "b2", "0"] },
      ],
      analysis: { kind: "op" },
      options: { maxNewton: 4, gmin: 0 },
    };
    const c = solveWith(latch);
    expect(c.dcMethod).toBe("gmin");
    // Oracle: symmetric KCL with the transport equations (docs/references.md §1.2), Is = 1e-14, βF = 100, βR = 1.
    const is = 1e-14, vt = VT300;
    const ic = (vb: number, vc: number) => is * (Math.exp(vb / vt) - Math.exp((vb - vc) / vt)) - is * (Math.exp((vb - vc) / vt) - 1);
    const ib = (vb: number, vc: number) => (is / 100) * (Math.exp(vb / vt) - 1) + is * (Math.exp((vb - vc) / vt) - 1);
    const vcOf = (vb: number) => bisect((vc) => (5 - vc) / 1000 - ic(vb, vc) - (vc - vb) / 1e4, vb - 0.5, 5);
    const vb = bisect((v) => (vcOf(v) - v) / 1e4 - ib(v, vcOf(v)), 0, 1);
    const r = runOp(latch);
    expect(r.nodes.b1).toBeCloseTo(vb, 5);
    expect(r.nodes.c1).toBeCloseTo(vcOf(vb), 5);
  });

  it("op-amp + MOSFET sink into a high-voltage diode string: plain Newton cycles between the rails, the damped stage converges to the regulated point", () => {
    // Regulation closed form: the loop holds v(sense) = Vref − vout/Aol (op-amp with finite gain), so I ≈ Vref/Rs =
    // 1.5 A, and the square law gives VGS = Vth + √(I/K) (Shichman & Hodges 1968).
    const sink: Netlist = {
      elements: [
        { kind: "vsource", name: "VREF", nodes: ["ref", "0"], dc: 0.3 },
        { kind: "vsource", name: "VCC", nodes: ["vcc", "0"], dc: 12 },
        { kind: "opamp", name: "U1", nodes: ["ref", "inv", "oa", "vcc", "0"], model: { Aol: 2e5, GBW: 1e6, Rout: 40, slewRate: 5e5, swingHigh: 1.2, swingLow: 0.05, Iout: 0.025 } },
        { kind: "resistor", name: "RG", nodes: ["oa", "g"], value: 100 },
        { kind: "capacitor", name: "CC", nodes: ["oa", "inv"], value: 2.2e-9 },
        { kind: "resistor", name: "RFB", nodes: ["s", "inv"], value: 10e3 },
        { kind: "resistor", name: "RS", nodes: ["s", "0"], value: 0.2 },
        { kind: "mosfet", name: "M1", nodes: ["d", "g", "s"], model: { Vth: 3.5, K: 3, lambda: 0 } },
        { kind: "vsource", name: "VL", nodes: ["vl", "0"], dc: 48 },
        { kind: "diode", name: "DLED", nodes: ["vl", "k"], model: { Is: 5e-20, n: 26 } },
        { kind: "resistor", name: "RL", nodes: ["k", "d"], value: 6.8 },
      ],
      analysis: { kind: "op" },
      options: { reltol: 1e-6 },
    };
    const c = solveWith(sink);
    expect(c.dcMethod).toBe("damped");
    const r = runOp(sink);
    // finite gain: the gate draws no current, so the op-amp output equals its internal node and vd = v(g)/Aol
    expect(r.nodes.s).toBeCloseTo(0.3 - r.nodes.g / 2e5, 8);
    const i = r.nodes.s / 0.2;
    expect(r.currents.M1).toBeCloseTo(i, 7);
    expect(i).toBeCloseTo(1.5, 3);
    expect(r.nodes.g - r.nodes.s).toBeCloseTo(3.5 + Math.sqrt(i / 3), 6);
  });
});
