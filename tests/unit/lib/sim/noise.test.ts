import { describe, expect, it } from "vitest";
import { isSimError, simulate, type Netlist, type NetlistElement, type NoiseResult, type OpResult, type AcResult } from "@/lib/sim";

/**
 * The noise analysis (lib/sim/analysis/noise.ts) against outside references (docs/references.md §8): thermal noise
 * of a resistor and a divider (Johnson 1928; Nyquist 1928), kT/C of an RC low-pass (e.g. Horowitz & Hill, The Art of
 * Electronics, noise chapter), shot noise of a current-biased diode (Schottky 1918), an op-amp non-inverting stage
 * (Franco, Design with Operational Amplifiers, noise chapter — the expression recalled from memory, §8.4), and the
 * adjoint result against the direct sum of one-source AC solves written here (§8.5).
 * Constants: the 2019 SI exact values of k and q.
 */

const K = 1.380649e-23; // J/K, exact (2019 SI)
const Q = 1.602176634e-19; // C, exact (2019 SI)
const kelvin = (c: number) => c + 273.15;

function noise(n: Netlist): NoiseResult {
  const r = simulate(n);
  if (r.kind !== "noise") throw new Error(`expected noise, got ${r.kind}`);
  return r;
}
function ac(n: Netlist): AcResult {
  const r = simulate(n);
  if (r.kind !== "ac") throw new Error(`expected ac, got ${r.kind}`);
  return r;
}
function op(n: Netlist): OpResult {
  const r = simulate(n);
  if (r.kind !== "op") throw new Error(`expected op, got ${r.kind}`);
  return r;
}
function relErr(got: number, want: number): number { return Math.abs(got - want) / Math.abs(want); }

describe("thermal noise of resistors (Johnson 1928, Nyquist 1928: open-circuit density √(4kTR))", () => {
  it("one resistor: √(4kTR) at 27 °C and at −40 °C, flat over frequency", () => {
    for (const temperature of [27, -40]) {
      const r = noise({
        temperature,
        elements: [{ kind: "resistor", name: "R", nodes: ["a", "gnd"], value: 10e3 }],
        analysis: { kind: "noise", output: { node: "a" }, fStart: 1, fStop: 1e6, pointsPerDecade: 2 },
      });
      const want = Math.sqrt(4 * K * kelvin(temperature) * 10e3); // Johnson–Nyquist, §8.1
      for (let k = 0; k < r.freq.length; k++) expect(relErr(r.outputDensity[k], want)).toBeLessThan(1e-12);
      expect(r.outputUnit).toBe("V");
      // white density over [1 Hz, 1 MHz]: rms = density·√(band)
      expect(relErr(r.integrated.rms, want * Math.sqrt(1e6 - 1))).toBeLessThan(1e-9);
    }
  });

  it("a divider: √(4kT·R1∥R2) at the tap, each resistor's share, the input-referred density and the differential output", () => {
    const R1 = 3.3e3, R2 = 6.8e3;
    const elements: NetlistElement[] = [
      { kind: "vsource", name: "Vin", nodes: ["in", "gnd"], dc: 1, ac: 1 },
      { kind: "resistor", name: "Rtop", nodes: ["in", "tap"], value: R2 },
      { kind: "resistor", name: "Rbottom", nodes: ["tap", "gnd"], value: R1 },
    ];
    const r = noise({ elements, analysis: { kind: "noise", output: { node: "tap" }, input: "Vin", fStart: 10, fStop: 1e4, pointsPerDecade: 1 } });
    const T = kelvin(27);
    const want = Math.sqrt(4 * K * T * (R1 * R2) / (R1 + R2)); // §8.1: a divider's tap sees R1∥R2
    const gain = R1 / (R1 + R2);
    for (let k = 0; k < r.freq.length; k++) {
      expect(relErr(r.outputDensity[k], want)).toBeLessThan(1e-12);
      // each resistor's thermal current 4kT/R through R1∥R2: √(4kT/R)·R1∥R2
      expect(relErr(r.contributions.Rtop[k], Math.sqrt(4 * K * T / R2) * (R1 * R2) / (R1 + R2))).toBeLessThan(1e-12);
      expect(relErr(r.contributions.Rbottom[k], Math.sqrt(4 * K * T / R1) * (R1 * R2) / (R1 + R2))).toBeLessThan(1e-12);
      expect(relErr(r.inputReferredDensity![k], want / gain)).toBeLessThan(1e-12);
    }
    // the same tap measured against the source node: in − tap = (1 − gain)·Vin − tap noise; the noise is the same
    const d = noise({ elements, analysis: { kind: "noise", output: { node: "in", reference: "tap" }, fStart: 10, fStop: 1e4, pointsPerDecade: 1 } });
    expect(relErr(d.outputDensity[0], want)).toBeLessThan(1e-12);
    expect(d.inputReferredDensity).toBeNull();
  });

  it("noiseless elements add nothing; the vsource's current noise is the divider's 4kT/(R1+R2)", () => {
    const R1 = 1e3, R2 = 4e3;
    const r = noise({
      elements: [
        { kind: "vsource", name: "Vin", nodes: ["in", "gnd"], dc: 1 },
        { kind: "resistor", name: "Rtop", nodes: ["in", "tap"], value: R2 },
        { kind: "resistor", name: "Rbottom", nodes: ["tap", "gnd"], value: R1, noiseless: true },
      ],
      analysis: { kind: "noise", output: { current: "Vin" }, fStart: 100, fStop: 100, pointsPerDecade: 1 },
    });
    expect(Object.keys(r.contributions)).toEqual(["Rtop"]);
    expect(r.outputUnit).toBe("A");
    // Rtop's thermal current 4kT/R2 divides between the series path: short-circuit current noise of a series pair
    // R1 + R2 with only R2 noisy is √(4kT·R2)/(R1 + R2) (Thévenin form of §8.1)
    expect(relErr(r.outputDensity[0], Math.sqrt(4 * K * kelvin(27) * R2) / (R1 + R2))).toBeLessThan(1e-12);
  });
});

describe("kT/C (standard result, e.g. Horowitz & Hill: an RC low-pass's total noise is √(kT/C), whatever R)", () => {
  it("integrated over four decades each side of the corner: √(kT/C) for 1 kΩ and 1 MΩ", () => {
    const C = 100e-12;
    for (const R of [1e3, 1e6]) {
      const fc = 1 / (2 * Math.PI * R * C);
      const r = noise({
        elements: [
          { kind: "vsource", name: "Vin", nodes: ["in", "gnd"], dc: 0, ac: 1 },
          { kind: "resistor", name: "R", nodes: ["in", "out"], value: R },
          { kind: "capacitor", name: "C", nodes: ["out", "gnd"], value: C },
        ],
        analysis: { kind: "noise", output: { node: "out" }, fStart: fc * 1e-4, fStop: fc * 1e4, pointsPerDecade: 100 },
      });
      const T = kelvin(27);
      // the band's exact value: ∫ 4kTR/(1 + (f/fc)²) df = (2kT/(πC))·(atan(f1/fc) − atan(f0/fc)) (§8.2); all
      // frequencies: kT/C
      const band = (2 * K * T / (Math.PI * C)) * (Math.atan(r.integrated.fStop / fc) - Math.atan(r.integrated.fStart / fc));
      expect(relErr(r.integrated.rms, Math.sqrt(band))).toBeLessThan(1e-4);
      expect(relErr(r.integrated.rms, Math.sqrt(K * T / C))).toBeLessThan(1e-3);
    }
  });
});

describe("shot noise of a current-biased diode (Schottky 1918: 2qI; rd = n·Vt/I, Shockley)", () => {
  it("√(2qI)·rd at low frequency for 1 mA and 10 µA", () => {
    for (const I of [1e-3, 10e-6]) {
      const n = 1.5;
      const r = noise({
        elements: [
          { kind: "isource", name: "Ibias", nodes: ["gnd", "a"], dc: I },
          { kind: "diode", name: "D", nodes: ["a", "gnd"], model: { Is: 1e-14, n, Cj0: 10e-12 } },
        ],
        analysis: { kind: "noise", output: { node: "a" }, fStart: 1, fStop: 10, pointsPerDecade: 1 },
      });
      const vt = (K * kelvin(27)) / Q;
      const rd = (n * vt) / I; // Shockley small-signal resistance (Is ≪ I)
      expect(relErr(r.outputDensity[0], Math.sqrt(2 * Q * I) * rd)).toBeLessThan(1e-6);
    }
  });
});

describe("op-amp non-inverting stage (Franco, noise chapter, recalled from memory: §8.4)", () => {
  // eno² = (1 + R2/R1)²·[en² + in²·Rs² + 4kT·Rs + in²·(R1∥R2)² + 4kT·(R1∥R2)], en and in with 1/f corners
  const Rs = 2e3, R1 = 1e3, R2 = 9e3;
  const en = 8e-9, fce = 100, inoise = 2e-12, fci = 1e3;
  const stage = (f: number): Netlist => ({
    elements: [
      { kind: "vsource", name: "Vsig", nodes: ["sig", "gnd"], dc: 0, ac: 1 },
      { kind: "vsource", name: "Vpos", nodes: ["vcc", "gnd"], dc: 15 },
      { kind: "vsource", name: "Vneg", nodes: ["vee", "gnd"], dc: -15 },
      { kind: "resistor", name: "Rsource", nodes: ["sig", "inp"], value: Rs },
      { kind: "resistor", name: "Rground", nodes: ["inn", "gnd"], value: R1 },
      { kind: "resistor", name: "Rfeedback", nodes: ["out", "inn"], value: R2 },
      {
        kind: "opamp", name: "U1", nodes: ["inp", "inn", "out", "vcc", "vee"],
        // open-loop gain 1e8 with its pole at 10 Hz: loop gain ≥ 1e5 at the test frequencies, so the ideal expression holds to ~1e-5
        model: { Aol: 1e8, GBW: 1e9, noiseVoltage: en, noiseVoltageCorner: fce, noiseCurrent: inoise, noiseCurrentCorner: fci },
      },
    ],
    analysis: { kind: "noise", output: { node: "out" }, input: "Vsig", fStart: f, fStop: f, pointsPerDecade: 1 },
  });
  it("output and input-referred density at 10 Hz, 1 kHz and 100 kHz", () => {
    const T = kelvin(27);
    const rp = (R1 * R2) / (R1 + R2);
    const gain = 1 + R2 / R1;
    for (const f of [10, 1e3, 1e5]) {
      const r = noise(stage(f));
      const en2 = en * en * (1 + fce / f), in2 = inoise * inoise * (1 + fci / f);
      const want = gain * Math.sqrt(en2 + in2 * Rs * Rs + 4 * K * T * Rs + in2 * rp * rp + 4 * K * T * rp);
      expect(relErr(r.outputDensity[0], want)).toBeLessThan(1e-4);
      expect(relErr(r.inputReferredDensity![0], want / gain)).toBeLessThan(1e-4);
      expect(relErr(r.contributions.U1[0], gain * Math.sqrt(en2 + in2 * Rs * Rs + in2 * rp * rp))).toBeLessThan(1e-4);
      expect(relErr(r.contributions.Rsource[0], gain * Math.sqrt(4 * K * T * Rs))).toBeLessThan(1e-4);
    }
  });
});

describe("adjoint result equals the direct sum over sources, one AC solve per source (§8.5)", () => {
  // a common-emitter stage with an emitter bypass and junction capacitances, so the transfers vary with frequency
  const base: NetlistElement[] = [
    { kind: "vsource", name: "Vcc", nodes: ["vcc", "gnd"], dc: 12 },
    { kind: "vsource", name: "Vsig", nodes: ["sig", "gnd"], dc: 0, ac: 1 },
    { kind: "resistor", name: "Rsig", nodes: ["sig", "bin"], value: 600 },
    { kind: "capacitor", name: "Cin", nodes: ["bin", "b"], value: 1e-6 },
    { kind: "resistor", name: "Rb1", nodes: ["vcc", "b"], value: 47e3 },
    { kind: "resistor", name: "Rb2", nodes: ["b", "gnd"], value: 10e3 },
    { kind: "vsource", name: "Vmeter", nodes: ["vcc", "rc"], dc: 0 },
    { kind: "resistor", name: "Rc", nodes: ["rc", "c"], value: 3.3e3 },
    { kind: "resistor", name: "Re", nodes: ["e", "gnd"], value: 1e3 },
    { kind: "capacitor", name: "Ce", nodes: ["e", "gnd"], value: 10e-6 },
    { kind: "bjt", name: "Q1", nodes: ["c", "b", "e"], model: { betaF: 150, VA: 60, Cje0: 8e-12, Cjc0: 3e-12, tauF: 4e-10 } },
  ];
  // every noise source as [name of its element, node the current enters, node it leaves, density A²/Hz]
  function sources(o: OpResult): [string, string, string, number][] {
    const T = kelvin(27);
    const list: [string, string, string, number][] = [];
    for (const e of base) if (e.kind === "resistor") list.push([e.name, e.nodes[0], e.nodes[1], (4 * K * T) / e.value]);
    const q1 = o.devices.Q1;
    if (q1.kind !== "bjt") throw new Error("Q1 is not a BJT");
    list.push(["Q1", "c", "e", 2 * Q * Math.abs(q1.ic)], ["Q1", "b", "e", 2 * Q * Math.abs(q1.ib)]);
    return list;
  }
  const freqs = [20, 2e3, 2e5, 2e7];

  for (const [label, output, read] of [
    ["collector voltage", { node: "c" }, (a: AcResult, k: number) => [a.nodes.c.re[k], a.nodes.c.im[k]]],
    ["collector current through Vmeter", { current: "Vmeter" }, (a: AcResult, k: number) => [a.currents.Vmeter.re[k], a.currents.Vmeter.im[k]]],
  ] as const) {
    it(`${label}: total and per-element densities at 20 Hz, 2 kHz, 200 kHz and 20 MHz`, () => {
      const o = op({ elements: base, analysis: { kind: "op" } });
      expect(o.devices.Q1.kind === "bjt" && o.devices.Q1.region).toBe("active");
      const quiet = base.map((e) => (e.kind === "vsource" ? { ...e, ac: 0 } : e));
      for (const f of freqs) {
        const r = noise({ elements: base, analysis: { kind: "noise", output, fStart: f, fStop: f, pointsPerDecade: 1 } });
        const perElement = new Map<string, number>();
        let total = 0;
        for (const [name, into, from, s] of sources(o)) {
          // a zero-DC current source with AC 1 A from `from` into `into`: the operating point is unchanged
          const a = ac({
            elements: [...quiet, { kind: "isource", name: "Iprobe", nodes: [from, into], dc: 0, ac: 1 }],
            analysis: { kind: "ac", fStart: f, fStop: f, pointsPerDecade: 1 },
          });
          const [hr, hi] = read(a, 0);
          const p = (hr * hr + hi * hi) * s;
          perElement.set(name, (perElement.get(name) ?? 0) + p);
          total += p;
        }
        expect(relErr(r.outputDensity[0], Math.sqrt(total))).toBeLessThan(1e-6);
        for (const [name, p] of perElement) expect(relErr(r.contributions[name][0], Math.sqrt(p))).toBeLessThan(1e-6);
        expect(Object.keys(r.contributions).sort()).toEqual([...perElement.keys()].sort());
      }
    });
  }
});

describe("MOSFET channel noise (8kT·gm/3, van der Ziel; §8.3)", () => {
  it("a common-source stage: drain noise current √(8kT·gm/3)·RD at the drain, gm = 2K(Vgs − Vth)", () => {
    const Kp = 0.02, Vth = 1.5, Vgs = 2, RD = 1e3; // Id = 5 mA, VDS = 5 V: saturation
    const r = noise({
      elements: [
        { kind: "vsource", name: "Vdd", nodes: ["vdd", "gnd"], dc: 10 },
        { kind: "vsource", name: "Vg", nodes: ["g", "gnd"], dc: Vgs },
        { kind: "resistor", name: "RD", nodes: ["vdd", "d"], value: RD, noiseless: true },
        { kind: "mosfet", name: "M1", nodes: ["d", "g", "gnd"], model: { Vth, K: Kp } },
      ],
      analysis: { kind: "noise", output: { node: "d" }, fStart: 1e3, fStop: 1e3, pointsPerDecade: 1 },
    });
    // square law id = K·(Vgs − Vth)² in saturation (the engine's §1-style model, lambda 0): gm = 2K·Vov
    const gm = 2 * Kp * (Vgs - Vth);
    expect(relErr(r.outputDensity[0], Math.sqrt((8 * K * kelvin(27) * gm) / 3) * RD)).toBeLessThan(1e-6);
  });
});

describe("invalid noise specs name the field", () => {
  const el: NetlistElement[] = [{ kind: "resistor", name: "R", nodes: ["a", "gnd"], value: 1 }, { kind: "vsource", name: "V", nodes: ["a", "gnd"], dc: 0 }];
  const cases: [Netlist["analysis"], string][] = [
    [{ kind: "noise", output: { node: "nowhere" }, fStart: 1, fStop: 10 }, 'field "output.node"'],
    [{ kind: "noise", output: { node: "a", reference: "b" }, fStart: 1, fStop: 10 }, 'field "output.reference"'],
    [{ kind: "noise", output: { current: "R" }, fStart: 1, fStop: 10 }, 'field "output.current"'],
    [{ kind: "noise", output: { node: "a" }, input: "R", fStart: 1, fStop: 10 }, 'field "input"'],
    [{ kind: "noise", output: { node: "a" }, fStart: 10, fStop: 1 }, 'field "analysis.fStop"'],
    [{ kind: "noise", output: { node: "a" }, fStart: 0, fStop: 1 }, 'field "analysis.fStart"'],
  ];
  for (const [analysis, field] of cases) {
    it(`${JSON.stringify(analysis)} → ${field}`, () => {
      try {
        simulate({ elements: el, analysis });
        expect.unreachable();
      } catch (e) {
        expect(isSimError(e) && e.code).toBe("invalid");
        expect((e as Error).message).toContain(field);
      }
    });
  }
});
