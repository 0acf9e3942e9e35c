import { describe, expect, it } from "vitest";
import type { NetlistElement } from "@/lib/sim";
import { T300C, runAc, runOp } from "./helpers";

describe("op-amp second pole: a(s) = a0/((1 + s/ω1)(1 + s/ω2)) (docs/references.md §3.2, a0 = 1e5, ω1 = 1e4, ω2 = 1e6 rad/s)", () => {
  it("open-loop response at 100 Hz … 10 MHz", () => {
    const a0 = 1e5, w1 = 1e4, w2 = 1e6;
    const r = runAc({
      elements: [
        { kind: "vsource", name: "Vp", nodes: ["vcc", "0"], dc: 15 },
        { kind: "vsource", name: "Vin", nodes: ["in", "0"], ac: 1 },
        { kind: "opamp", name: "U1", nodes: ["in", "0", "out", "vcc", "0"], model: { Aol: a0, GBW: (a0 * w1) / (2 * Math.PI), fp2: w2 / (2 * Math.PI) } },
        { kind: "resistor", name: "RL", nodes: ["out", "0"], value: 1e4 },
      ],
      analysis: { kind: "ac", fStart: 100, fStop: 1e7, pointsPerDecade: 3 },
    });
    for (let k = 0; k < r.freq.length; k++) {
      const w = 2 * Math.PI * r.freq[k];
      // 1/((1 + jw/w1)(1 + jw/w2)) = 1/((1 − w²/(w1w2)) + jw(1/w1 + 1/w2))
      const dr = 1 - (w * w) / (w1 * w2), di = w * (1 / w1 + 1 / w2);
      const den = dr * dr + di * di;
      const er = (a0 * dr) / den, ei = (-a0 * di) / den;
      const mag = Math.hypot(er, ei);
      expect(Math.abs(r.nodes.out.re[k] - er)).toBeLessThan(1e-9 * mag);
      expect(Math.abs(r.nodes.out.im[k] - ei)).toBeLessThan(1e-9 * mag);
    }
  });
});

describe("BJT series resistances", () => {
  it("an emitter resistance inside the model equals the external RE of the Sedra/Smith example (docs/references.md §5d)", () => {
    const elements: NetlistElement[] = [
      { kind: "vsource", name: "VCC", nodes: ["vcc", "0"], dc: 15 },
      { kind: "resistor", name: "RB1", nodes: ["vcc", "b"], value: 100e3 },
      { kind: "resistor", name: "RB2", nodes: ["b", "0"], value: 50e3 },
      { kind: "resistor", name: "RC", nodes: ["vcc", "c"], value: 5e3 },
      { kind: "bjt", name: "Q1", nodes: ["c", "b", "0"], model: { Is: 1e-15, betaF: 100, betaR: 1, re: 3e3 } },
    ];
    const r = runOp({ temperature: T300C, elements, analysis: { kind: "op" }, options: { gmin: 0, reltol: 1e-10 } });
    expect(r.nodes.b).toBeCloseTo(4.575871628, 8);
    expect(r.nodes.c).toBeCloseTo(8.638074414, 8);
    expect(r.currents.Q1).toBeCloseTo(1.272385117e-3, 11);
  });
  it("a base resistance drops IB·rb (Ohm's law) and leaves IC = β·IB", () => {
    const r = runOp({
      temperature: T300C,
      elements: [
        { kind: "vsource", name: "VC", nodes: ["c", "0"], dc: 5 },
        { kind: "isource", name: "IB", nodes: ["0", "b"], dc: 20e-6 },
        { kind: "bjt", name: "Q1", nodes: ["c", "b", "0"], model: { Is: 1e-15, betaF: 150, rb: 500 } },
      ],
      analysis: { kind: "op" },
      options: { gmin: 0, reltol: 1e-10 },
    });
    const q = r.devices.Q1;
    if (q.kind !== "bjt") throw new Error("bjt");
    // IB = (Is/βF)(e^{Vb'e/Vt} − 1) ⇒ Vb'e = Vt·ln(1 + IB·βF/Is); terminal VBE = Vb'e + IB·rb
    const vt = (1.380649e-23 * 300) / 1.602176634e-19;
    expect(q.vbe).toBeCloseTo(vt * Math.log1p((20e-6 * 150) / 1e-15) + 20e-6 * 500, 9);
    expect(q.ic / q.ib).toBeCloseTo(150, 6);
  });
});

describe("MOSFET capacitances in AC (fixed Cgs, Cgd)", () => {
  it("drain at AC ground: gate current jω(Cgs + Cgd), drain current gm·vg − jωCgd·vg", () => {
    const model = { Vth: 1, K: 0.05, lambda: 0, Cgs: 200e-12, Cgd: 50e-12 };
    const r = runAc({
      elements: [
        { kind: "vsource", name: "VD", nodes: ["d", "0"], dc: 10 },
        { kind: "vsource", name: "VG", nodes: ["g", "0"], dc: 3, ac: 1 },
        { kind: "mosfet", name: "M1", nodes: ["d", "g", "0"], model },
      ],
      analysis: { kind: "ac", fStart: 1e3, fStop: 1e8, pointsPerDecade: 1 },
      options: { gmin: 0 },
    });
    const gm = 2 * 0.05 * (3 - 1); // saturation: gm = 2K(VGS − Vth)
    for (let k = 0; k < r.freq.length; k++) {
      const w = 2 * Math.PI * r.freq[k];
      // current into the gate = −I(VG); current into the drain = −I(VD)
      expect(-r.currents.VG.re[k]).toBeCloseTo(0, 12);
      expect(-r.currents.VG.im[k] / (w * 250e-12)).toBeCloseTo(1, 9);
      expect(-r.currents.VD.re[k]).toBeCloseTo(gm, 9);
      expect(-r.currents.VD.im[k] / (-w * 50e-12)).toBeCloseTo(1, 9);
      expect(r.currents.M1.re[k]).toBeCloseTo(gm, 9);
    }
  });
});
