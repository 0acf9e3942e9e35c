import { describe, expect, it } from "vitest";
import type { NetlistElement } from "@/lib/sim";
import { runAc, runOp, runTran } from "./helpers";

const supplies: NetlistElement[] = [
  { kind: "vsource", name: "Vp", nodes: ["vcc", "0"], dc: 15 },
  { kind: "vsource", name: "Vn", nodes: ["vee", "0"], dc: -15 },
];

function nonInverting(noiseGain: number, f: number) {
  const rg = 1000;
  const rf = rg * (noiseGain - 1);
  const elements: NetlistElement[] = [
    ...supplies,
    { kind: "vsource", name: "Vin", nodes: ["in", "0"], ac: 1 },
    { kind: "opamp", name: "U1", nodes: ["in", "inn", "out", "vcc", "vee"], model: { Aol: 1e5, GBW: 1e6 } },
  ];
  if (noiseGain === 1) elements.push({ kind: "resistor", name: "Rf", nodes: ["out", "inn"], value: 1e-3 });
  else elements.push(
    { kind: "resistor", name: "Rf", nodes: ["out", "inn"], value: rf },
    { kind: "resistor", name: "Rg", nodes: ["inn", "0"], value: rg },
  );
  return runAc({ elements, analysis: { kind: "ac", fStart: f, fStop: f, pointsPerDecade: 1 } });
}

describe("op-amp macro model: single pole Aol/(1 + s/ωp)", () => {
  it("open loop: exactly A0/(1 + jf/fa), fa = GBW/Aol = 10 Hz, at 1 Hz, 10 Hz, 1 kHz, 1 MHz", () => {
    for (const f of [1, 10, 1e3, 1e6]) {
      const r = runAc({
        elements: [
          ...supplies,
          { kind: "vsource", name: "Vin", nodes: ["in", "0"], ac: 1e-6 },
          { kind: "opamp", name: "U1", nodes: ["in", "0", "out", "vcc", "vee"], model: { Aol: 1e5, GBW: 1e6 } },
          { kind: "resistor", name: "RL", nodes: ["out", "0"], value: 1e3 },
        ],
        analysis: { kind: "ac", fStart: f, fStop: f, pointsPerDecade: 1 },
      });
      const x = f / 10;
      const den = 1 + x * x;
      expect(r.nodes.out.re[0] / 1e-6).toBeCloseTo(1e5 / den, 6);
      expect(r.nodes.out.im[0] / 1e-6).toBeCloseTo((-1e5 * x) / den, 6);
    }
  });

  // docs/references.md §5c: f−3dB = fa(1 + A0/NG), DC gain A0/(1 + A0/NG); ≈ GBW/NG (Mancini ch. 8)
  const table: [number, number, number][] = [[1, 1000010, 0.99999], [10, 100010, 9.9990001], [100, 10010, 99.9000999]];
  it.each(table)("non-inverting amplifier, noise gain %d: −3 dB at %d Hz, DC gain %f", (ng, f3, g0) => {
    const rg = nonInverting(ng, 1e-3);
    const dc = Math.hypot(rg.nodes.out.re[0], rg.nodes.out.im[0]);
    // the NG = 1 follower uses a 1 mΩ feedback resistor: its loading is below 1e-9
    expect(dc).toBeCloseTo(g0, ng === 1 ? 5 : 6);
    const r = nonInverting(ng, f3);
    const mag = Math.hypot(r.nodes.out.re[0], r.nodes.out.im[0]);
    expect(mag / dc).toBeCloseTo(Math.SQRT1_2, 6);
    // phase −45° at the closed-loop pole
    expect(Math.atan2(r.nodes.out.im[0], r.nodes.out.re[0])).toBeCloseTo(-Math.PI / 4, 5);
  });

  it("infinite input impedance and no input current without Ib", () => {
    const r = runOp({
      elements: [
        ...supplies,
        { kind: "vsource", name: "Vin", nodes: ["src", "0"], dc: 2 },
        { kind: "resistor", name: "Rsrc", nodes: ["src", "in"], value: 1e6 },
        { kind: "opamp", name: "U1", nodes: ["in", "out", "out", "vcc", "vee"], model: { Aol: 1e5, GBW: 1e6 } },
      ],
      analysis: { kind: "op" },
    });
    expect(r.nodes.in).toBeCloseTo(2, 14);
    expect(r.currents.Vin).toBeCloseTo(0, 18);
  });

  it("offset voltage and bias current: follower output = Vos − Ib·Rsrc (closed form, A0 → large)", () => {
    const r = runOp({
      elements: [
        ...supplies,
        { kind: "resistor", name: "Rsrc", nodes: ["in", "0"], value: 100e3 },
        { kind: "opamp", name: "U1", nodes: ["in", "out", "out", "vcc", "vee"], model: { Aol: 1e7, GBW: 1e6, Vos: 1e-3, Ib: 100e-9 } },
      ],
      analysis: { kind: "op" },
      options: { reltol: 1e-9 },
    });
    expect(r.nodes.out).toBeCloseTo(1e-3 - 100e-9 * 100e3, 6);
  });
});

describe("op-amp macro model: limits", () => {
  it("output swing stops 1.2 V from the positive rail (smooth clamp, within 20 mV) and reports limiting", () => {
    const r = runOp({
      elements: [
        ...supplies,
        { kind: "vsource", name: "Vin", nodes: ["in", "0"], dc: 20 },
        { kind: "opamp", name: "U1", nodes: ["in", "out", "out", "vcc", "vee"], model: { swingHigh: 1.2, swingLow: 1.5 } },
        { kind: "resistor", name: "RL", nodes: ["out", "0"], value: 10e3 },
      ],
      analysis: { kind: "op" },
    });
    expect(Math.abs(r.nodes.out - 13.8)).toBeLessThan(0.02);
    expect(r.devices.U1).toMatchObject({ kind: "opamp", limiting: true });
  });

  it("output swing stops 1.5 V from the negative rail; the rail current is the load current", () => {
    const r = runOp({
      elements: [
        ...supplies,
        { kind: "vsource", name: "Vin", nodes: ["in", "0"], dc: -20 },
        { kind: "opamp", name: "U1", nodes: ["in", "out", "out", "vcc", "vee"], model: { swingHigh: 1.2, swingLow: 1.5 } },
        { kind: "resistor", name: "RL", nodes: ["out", "0"], value: 1e3 },
      ],
      analysis: { kind: "op" },
    });
    expect(Math.abs(r.nodes.out + 13.5)).toBeLessThan(0.02);
    // sinking: the load current enters the out pin and leaves by the vee pin into Vn's + terminal (Kirchhoff);
    // the vcc pin carries ~nothing
    expect(r.currents.Vn).toBeCloseTo(-r.nodes.out / 1e3, 9);
    expect(r.currents.U1).toBeCloseTo(r.nodes.out / 1e3, 9);
    expect(Math.abs(r.currents.Vp)).toBeLessThan(1e-9);
  });

  it("output current limit: a 10 Ω load gets at most Iout = 25 mA", () => {
    const r = runOp({
      elements: [
        ...supplies,
        { kind: "vsource", name: "Vin", nodes: ["in", "0"], dc: 5 },
        { kind: "opamp", name: "U1", nodes: ["in", "out", "out", "vcc", "vee"], model: { Rout: 1, Iout: 25e-3 } },
        { kind: "resistor", name: "RL", nodes: ["out", "0"], value: 10 },
      ],
      analysis: { kind: "op" },
    });
    expect(r.currents.U1).toBeLessThanOrEqual(25e-3);
    expect(r.currents.U1).toBeGreaterThan(24.9e-3);
    expect(r.devices.U1).toMatchObject({ limiting: true });
  });

  it("Rout: a follower's output impedance is Rout/(1 + Aol) (negative feedback, closed form)", () => {
    const r = runOp({
      elements: [
        ...supplies,
        { kind: "vsource", name: "Vin", nodes: ["in", "0"], dc: 1 },
        { kind: "opamp", name: "U1", nodes: ["in", "out", "out", "vcc", "vee"], model: { Aol: 1e3, Rout: 100 } },
        { kind: "resistor", name: "RL", nodes: ["out", "0"], value: 100 },
      ],
      analysis: { kind: "op" },
      options: { reltol: 1e-9 },
    });
    // v = Aol(1 − v)·RL/(RL + Rout) ⇒ v = Aol·k/(1 + Aol·k), k = 1/2
    expect(r.nodes.out).toBeCloseTo(500 / 501, 9);
  });

  it("slew rate: a follower driven by a 0 → 5 V step rises at SR = 1 V/µs", () => {
    const r = runTran({
      elements: [
        ...supplies,
        { kind: "vsource", name: "Vin", nodes: ["in", "0"], wave: { shape: "pulse", low: 0, high: 5, delay: 1e-6, rise: 1e-9, fall: 1e-9, width: 1e-3, period: null } },
        { kind: "opamp", name: "U1", nodes: ["in", "out", "out", "vcc", "vee"], model: { Aol: 1e5, GBW: 10e6, slewRate: 1e6 } },
        { kind: "resistor", name: "RL", nodes: ["out", "0"], value: 10e3 },
      ],
      analysis: { kind: "tran", tStop: 10e-6, maxStep: 20e-9 },
    });
    const cross = (level: number) => {
      for (let i = 1; i < r.time.length; i++) {
        if (r.nodes.out[i - 1] < level && r.nodes.out[i] >= level) {
          const f = (level - r.nodes.out[i - 1]) / (r.nodes.out[i] - r.nodes.out[i - 1]);
          return r.time[i - 1] + f * (r.time[i] - r.time[i - 1]);
        }
      }
      return NaN;
    };
    const slope = (3.5 - 1.5) / (cross(3.5) - cross(1.5));
    expect(slope / 1e6).toBeCloseTo(1, 1);
    // and it settles at the input
    expect(r.nodes.out[r.time.length - 1]).toBeCloseTo(5, 3);
  });
});
