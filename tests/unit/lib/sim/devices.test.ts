import { describe, expect, it } from "vitest";
import { T300C, VT300, runOp, runSweep } from "./helpers";

/** Lambert W (principal branch) by Halley's iteration — Corless et al., "On the Lambert W function", 1996. */
function lambertW(x: number): number {
  let w = x < 1 ? x : Math.log(x) - Math.log(Math.log(x));
  for (let i = 0; i < 100; i++) {
    const e = Math.exp(w);
    const f = w * e - x;
    const dw = f / (e * (w + 1) - ((w + 2) * f) / (2 * w + 2));
    w -= dw;
    if (Math.abs(dw) < 1e-15 * (1 + Math.abs(w))) break;
  }
  return w;
}
/** Diode + series resistor exact current (docs/references.md §1.5): I = (nVt/R)·W((Is·R/nVt)·e^{(V+Is·R)/nVt}) − Is */
function diodeSeriesCurrent(v: number, r: number, is: number, nvt: number): number {
  // evaluate the W argument in logs to avoid overflow: W(a·e^b) with ln-form iteration start
  const lnArg = Math.log((is * r) / nvt) + (v + is * r) / nvt;
  let w = lnArg - Math.log(lnArg);
  for (let i = 0; i < 100; i++) { const dw = (w + Math.log(w) - lnArg) / (1 + 1 / w); w -= dw; if (Math.abs(dw) < 1e-15 * w) break; }
  return (nvt / r) * (lnArg < 0 ? lambertW(Math.exp(lnArg)) : w) - is;
}

const exact = { reltol: 1e-10, vntol: 1e-12, abstol: 1e-18, gmin: 0 };

describe("diode (Shockley) against the Lambert-W closed form", () => {
  it("5 V through 1 kΩ, Is = 1e-14, n = 1, 300 K: I = 4.307456372506 mA, VD = 0.692543627494 V (docs/references.md §1.5)", () => {
    const r = runOp({
      temperature: T300C,
      elements: [
        { kind: "vsource", name: "V1", nodes: ["a", "0"], dc: 5 },
        { kind: "resistor", name: "R1", nodes: ["a", "d"], value: 1000 },
        { kind: "diode", name: "D1", nodes: ["d", "0"], model: { Is: 1e-14 } },
      ],
      analysis: { kind: "op" },
      options: exact,
    });
    expect(r.currents.D1).toBeCloseTo(4.307456372506e-3, 14);
    expect(r.nodes.d).toBeCloseTo(0.692543627494, 11);
    expect(r.currents.V1).toBeCloseTo(-4.307456372506e-3, 14); // source current flows from − to + inside: negative
    expect(r.devices.D1).toMatchObject({ kind: "diode" });
  });

  it("DC sweep 0.5–20 V matches the closed form at every point (n = 1.8, Is = 1e-9, Rs inside the model)", () => {
    const nvt = 1.8 * VT300;
    const r = runSweep({
      temperature: T300C,
      elements: [
        { kind: "vsource", name: "V1", nodes: ["a", "0"], dc: 0 },
        { kind: "resistor", name: "R1", nodes: ["a", "d"], value: 400 },
        { kind: "diode", name: "D1", nodes: ["d", "0"], model: { Is: 1e-9, n: 1.8, Rs: 100 } },
      ],
      analysis: { kind: "dcsweep", source: "V1", from: 0.5, to: 20, points: 40 },
      options: exact,
    });
    for (let k = 0; k < r.sweep.length; k++) {
      const i = diodeSeriesCurrent(r.sweep[k], 500, 1e-9, nvt);
      expect(Math.abs(r.currents.D1[k] - i)).toBeLessThan(1e-12 + 1e-9 * i);
    }
  });

  it("DC sweep of a current source: V = n·Vt·ln(1 + I/Is) (Shockley inverted) from 1 nA to 10 mA", () => {
    const r = runSweep({
      temperature: T300C,
      elements: [
        { kind: "isource", name: "I1", nodes: ["0", "d"], dc: 0 },
        { kind: "diode", name: "D1", nodes: ["d", "0"], model: { Is: 2e-15, n: 1.2 } },
      ],
      analysis: { kind: "dcsweep", source: "I1", from: 1e-9, to: 10e-3, points: 11 },
      options: exact,
    });
    for (let k = 0; k < r.sweep.length; k++) {
      expect(r.nodes.d[k]).toBeCloseTo(1.2 * VT300 * Math.log1p(r.sweep[k] / 2e-15), 9);
      // the source's current runs from nodes[0] (ground) through it to nodes[1]: its value
      expect(r.currents.I1[k]).toBe(r.sweep[k]);
    }
  });

  it("reverse breakdown: a 5.1 V (BV) diode in reverse clamps near −BV", () => {
    const r = runOp({
      elements: [
        { kind: "vsource", name: "V1", nodes: ["a", "0"], dc: 12 },
        { kind: "resistor", name: "R1", nodes: ["a", "k"], value: 1000 },
        { kind: "diode", name: "DZ", nodes: ["0", "k"], model: { Is: 1e-14, BV: 5.1 } },
      ],
      analysis: { kind: "op" },
      options: exact,
    });
    // breakdown current Is·e^{(Vr−BV)/Vt} = 6.9 mA ⇒ Vr = BV + Vt·ln(I/Is) ≈ 5.1 + 0.695 (Shockley form mirrored)
    const i = (12 - r.nodes.k) / 1000;
    const vt = (1.380649e-23 * 300.15) / 1.602176634e-19;
    expect(r.nodes.k).toBeCloseTo(5.1 + vt * Math.log(i / 1e-14), 6);
  });
});

/** Published transport-model equations (docs/references.md §1.2), NPN, written out here as the independent oracle. */
function transport(vbe: number, vbc: number, is: number, bf: number, br: number, vt: number, va: number | null) {
  const ef = Math.exp(vbe / vt), er = Math.exp(vbc / vt);
  const early = va === null ? 1 : 1 - vbc / va;
  const ic = is * (ef - er) * early - (is / br) * (er - 1);
  const ib = (is / bf) * (ef - 1) + (is / br) * (er - 1);
  return { ic, ib, ie: ic + ib };
}

describe("Ebers–Moll transport model: terminal currents in all four regions (docs/references.md §1.2)", () => {
  const model = { Is: 1e-15, betaF: 80, betaR: 2 };
  const cases: [string, number, number, string][] = [
    ["forward active", 0.68, -4, "active"],
    ["saturation", 0.72, 0.6, "saturation"],
    ["reverse active", -3, 0.66, "reverse"],
    ["cutoff", -0.5, -6, "cutoff"],
  ];
  for (const polarity of ["npn", "pnp"] as const) {
    it.each(cases)(`${polarity}: %s (Vbe = %f, Vbc = %f)`, (_label, vbe, vbc, region) => {
      const p = polarity === "npn" ? 1 : -1;
      const r = runOp({
        temperature: T300C,
        elements: [
          { kind: "vsource", name: "VB", nodes: ["b", "0"], dc: p * vbe },
          { kind: "vsource", name: "VC", nodes: ["c", "0"], dc: p * (vbe - vbc) },
          { kind: "bjt", name: "Q1", nodes: ["c", "b", "0"], polarity, model },
        ],
        analysis: { kind: "op" },
        options: exact,
      });
      const ref = transport(vbe, vbc, model.Is, model.betaF, model.betaR, VT300, null);
      const info = r.devices.Q1;
      if (info.kind !== "bjt") throw new Error("expected bjt info");
      const close = (a: number, b: number) => expect(Math.abs(a - b)).toBeLessThanOrEqual(1e-9 * Math.abs(b) + 1e-24);
      close(info.ic, p * ref.ic);
      close(info.ib, p * ref.ib);
      close(info.ie, p * ref.ie);
      // the sources deliver the terminal currents: current into the collector = −I(VC)
      close(-r.currents.VC, p * ref.ic);
      close(-r.currents.VB, p * ref.ib);
      expect(info.region).toBe(region);
    });
  }

  it("forward Early effect: IC·(1 − Vbc/VA) (Gummel–Poon q_b, docs/references.md §1.3) and r_o ≈ VA/IC", () => {
    const make = (vce: number) => runOp({
      temperature: T300C,
      elements: [
        { kind: "vsource", name: "VB", nodes: ["b", "0"], dc: 0.65 },
        { kind: "vsource", name: "VC", nodes: ["c", "0"], dc: vce },
        { kind: "bjt", name: "Q1", nodes: ["c", "b", "0"], model: { Is: 1e-14, betaF: 100, VA: 50 } },
      ],
      analysis: { kind: "op" },
      options: exact,
    });
    const r5 = make(5), r10 = make(10);
    const ref5 = transport(0.65, 0.65 - 5, 1e-14, 100, 1, VT300, 50);
    expect(Math.abs(-r5.currents.VC - ref5.ic)).toBeLessThan(1e-9 * ref5.ic);
    // output resistance from two points vs VA/IC (Sedra/Smith form; agrees to the Early-term linearity)
    const ro = 5 / (-r10.currents.VC + r5.currents.VC);
    const icFwd = 1e-14 * Math.exp(0.65 / VT300);
    expect(ro).toBeCloseTo(50 / icFwd, -1);
  });
});

describe("BJT bias worked examples", () => {
  it("Sedra/Smith voltage-divider bias with the transport model (docs/references.md §5d, example 1 oracle)", () => {
    const r = runOp({
      temperature: T300C,
      elements: [
        { kind: "vsource", name: "VCC", nodes: ["vcc", "0"], dc: 15 },
        { kind: "resistor", name: "RB1", nodes: ["vcc", "b"], value: 100e3 },
        { kind: "resistor", name: "RB2", nodes: ["b", "0"], value: 50e3 },
        { kind: "resistor", name: "RC", nodes: ["vcc", "c"], value: 5e3 },
        { kind: "resistor", name: "RE", nodes: ["e", "0"], value: 3e3 },
        { kind: "bjt", name: "Q1", nodes: ["c", "b", "e"], model: { Is: 1e-15, betaF: 100, betaR: 1 } },
      ],
      analysis: { kind: "op" },
      options: exact,
    });
    expect(r.nodes.b).toBeCloseTo(4.575871628, 8);
    expect(r.nodes.e).toBeCloseTo(3.855326905, 8);
    expect(r.nodes.c).toBeCloseTo(8.638074414, 8);
    expect(r.currents.Q1).toBeCloseTo(1.272385117e-3, 11);
    const q = r.devices.Q1;
    if (q.kind !== "bjt") throw new Error("bjt");
    expect(q.vbe).toBeCloseTo(0.720544723, 8);
    expect(q.region).toBe("active");
    // textbook hand solution with VBE = 0.7 V (I_C = 1.28 mA, V_C = 8.6 V) within its rounding
    expect(q.ic * 1e3).toBeCloseTo(1.28, 1);
    expect(r.nodes.c).toBeCloseTo(8.6, 1);
  });

  it("op-amp + NPN current sink, op-amp as a VCVS (docs/references.md §5d current-sink DC oracle)", () => {
    const r = runOp({
      temperature: T300C,
      elements: [
        { kind: "vsource", name: "Vref", nodes: ["ref", "0"], dc: 1 },
        { kind: "vcvs", name: "A1", nodes: ["o", "0"], control: ["ref", "inn"], gain: 1e5 },
        { kind: "resistor", name: "RF", nodes: ["e", "inn"], value: 10e3 },
        { kind: "resistor", name: "RB", nodes: ["o", "b"], value: 1e3 },
        { kind: "bjt", name: "Q1", nodes: ["c", "b", "e"], model: { Is: 1e-14, betaF: 100, betaR: 1 } },
        { kind: "resistor", name: "Rs", nodes: ["e", "0"], value: 10 },
        { kind: "resistor", name: "RL", nodes: ["vl", "c"], value: 50 },
        { kind: "vsource", name: "VL", nodes: ["vl", "0"], dc: 12 },
      ],
      analysis: { kind: "op" },
      options: exact,
    });
    expect(r.nodes.o).toBeCloseTo(2.763629642, 8);
    expect(r.nodes.b).toBeCloseTo(1.773557995, 8);
    expect(r.nodes.e).toBeCloseTo(0.999972364, 8);
    expect(r.nodes.c).toBeCloseTo(7.049641764, 8);
    expect(r.currents.Q1).toBeCloseTo(99.00716472e-3, 10);
    const q = r.devices.Q1;
    if (q.kind !== "bjt") throw new Error("bjt");
    expect(q.vbe).toBeCloseTo(0.773585631, 8);
    expect(q.power).toBeCloseTo(0.5997265, 6);
  });

  it("the same sink with the engine's op-amp model (Aol 1e5, ideal otherwise) gives the same operating point", () => {
    const r = runOp({
      temperature: T300C,
      elements: [
        { kind: "vsource", name: "Vref", nodes: ["ref", "0"], dc: 1 },
        { kind: "vsource", name: "Vcc", nodes: ["vcc", "0"], dc: 15 },
        { kind: "opamp", name: "U1", nodes: ["ref", "inn", "o", "vcc", "0"], model: { Aol: 1e5, GBW: 1e6 } },
        { kind: "resistor", name: "RF", nodes: ["e", "inn"], value: 10e3 },
        { kind: "resistor", name: "RB", nodes: ["o", "b"], value: 1e3 },
        { kind: "bjt", name: "Q1", nodes: ["c", "b", "e"], model: { Is: 1e-14, betaF: 100, betaR: 1 } },
        { kind: "resistor", name: "Rs", nodes: ["e", "0"], value: 10 },
        { kind: "resistor", name: "RL", nodes: ["vl", "c"], value: 50 },
        { kind: "vsource", name: "VL", nodes: ["vl", "0"], dc: 12 },
      ],
      analysis: { kind: "op" },
      options: exact,
    });
    expect(r.nodes.o).toBeCloseTo(2.763629642, 8);
    expect(r.currents.Q1).toBeCloseTo(99.00716472e-3, 10);
    // the op-amp's output current is the base current, and it is drawn from the vcc pin
    expect(r.currents.U1).toBeCloseTo((2.763629642 - 1.773557995) / 1e3, 9);
    expect(-r.currents.Vcc).toBeCloseTo(r.currents.U1, 9);
  });
});

describe("MOSFET square law (Shichman & Hodges 1968)", () => {
  const model = { Vth: 1.5, K: 0.02, lambda: 0.01 };
  const run = (vgs: number, vds: number, polarity: "n" | "p" = "n") => {
    const p = polarity === "n" ? 1 : -1;
    return runOp({
      elements: [
        { kind: "vsource", name: "VG", nodes: ["g", "0"], dc: p * vgs },
        { kind: "vsource", name: "VD", nodes: ["d", "0"], dc: p * vds },
        { kind: "mosfet", name: "M1", nodes: ["d", "g", "0"], polarity, model },
      ],
      analysis: { kind: "op" },
      options: exact,
    });
  };
  it("saturation: ID = K(VGS−Vth)²(1+λVDS)", () => {
    const r = run(3, 6);
    expect(-r.currents.VD).toBeCloseTo(0.02 * 1.5 ** 2 * (1 + 0.06), 12);
    expect(r.devices.M1).toMatchObject({ region: "saturation" });
  });
  it("triode: ID = K(2(VGS−Vth)VDS − VDS²)(1+λVDS)", () => {
    const r = run(4, 0.8);
    expect(-r.currents.VD).toBeCloseTo(0.02 * (2 * 2.5 * 0.8 - 0.64) * (1 + 0.008), 12);
    expect(r.devices.M1).toMatchObject({ region: "triode" });
  });
  it("cutoff: no drain current (only gmin = 0 here)", () => {
    const r = run(1, 5);
    expect(r.currents.VD).toBeCloseTo(0, 15);
    expect(r.devices.M1).toMatchObject({ region: "cutoff" });
  });
  it("P-channel mirrors N-channel", () => {
    const r = run(3, 6, "p");
    expect(r.currents.VD).toBeCloseTo(0.02 * 1.5 ** 2 * (1 + 0.06), 12);
  });
  it("source follower settles at ID = K(VG − VS − Vth)² through RS (closed form of the quadratic)", () => {
    const r = runOp({
      elements: [
        { kind: "vsource", name: "VDD", nodes: ["d", "0"], dc: 12 },
        { kind: "vsource", name: "VG", nodes: ["g", "0"], dc: 5 },
        { kind: "mosfet", name: "M1", nodes: ["d", "g", "s"], model: { Vth: 2, K: 0.5 } },
        { kind: "resistor", name: "RS", nodes: ["s", "0"], value: 100 },
      ],
      analysis: { kind: "op" },
      options: exact,
    });
    // K·R·u² + u − (VG − Vth) = 0 with u = VGS − Vth
    const u = (-1 + Math.sqrt(1 + 4 * 0.5 * 100 * 3)) / (2 * 0.5 * 100);
    expect(r.nodes.s).toBeCloseTo(5 - 2 - u, 10);
  });
});
