import { describe, expect, it } from "vitest";
import { compile, type NetlistElement } from "@/lib/sim";
import { T300C, VT300 } from "./helpers";

/**
 * docs/references.md §6: a small-signal example of the sink loop, [DERIVED] there (a model of our own, not a published
 * oracle): op-amp A0 = 1e5, GBW = 1 MHz (ideal output, optional 2nd pole); NPN at IC = 0.1 A, β = 100
 * (gm = 3.868173 S, rπ = 25.852 Ω at 300 K); RB = 1 kΩ, Rs = 1 Ω, RF = 10 kΩ, CF; loop broken at the op-amp output
 * (exact, since the output is an ideal source): T = −v(op-amp output)/v(injected).
 */
function loop(opts: { cf: number; fp2: number | null; tauF: number; cmu: number; load: boolean }) {
  const is = 1e-14;
  const vbe = VT300 * Math.log1p(0.1 / is);
  const vdrv = vbe + 0.1 / 100 * 1000 + 0.101 * 1; // VBE + IB·RB + IE·Rs
  const elements: NetlistElement[] = [
    { kind: "vsource", name: "Vdrv", nodes: ["drv", "0"], dc: vdrv, ac: 1 },
    { kind: "resistor", name: "RB", nodes: ["drv", "b"], value: 1000 },
    { kind: "bjt", name: "Q1", nodes: ["c", "b", "e"], model: { Is: is, betaF: 100, betaR: 1, tauF: opts.tauF, Cjc0: opts.cmu, mjc: 0 } },
    { kind: "resistor", name: "Rs", nodes: ["e", "0"], value: 1 },
    { kind: "resistor", name: "RF", nodes: ["e", "inn"], value: 10e3 },
    { kind: "vsource", name: "Vcc", nodes: ["vcc", "0"], dc: 30 },
    { kind: "opamp", name: "U1", nodes: ["0", "inn", "ao", "vcc", "0"], model: { Aol: 1e5, GBW: 1e6, fp2: opts.fp2 } },
    { kind: "resistor", name: "Rao", nodes: ["ao", "0"], value: 1e3 },
  ];
  if (opts.cf > 0) elements.push({ kind: "capacitor", name: "CF", nodes: ["drv", "inn"], value: opts.cf });
  if (opts.load) {
    // collector load 10 Ω + 1 mH to a 12 V rail (docs/references.md §6 case E/F)
    elements.push(
      { kind: "vsource", name: "Vl", nodes: ["vl", "0"], dc: 12 },
      { kind: "resistor", name: "RL", nodes: ["vl", "cl"], value: 10 },
      { kind: "inductor", name: "LL", nodes: ["cl", "c"], value: 1e-3 },
    );
  } else {
    elements.push({ kind: "vsource", name: "Vc", nodes: ["c", "0"], dc: 12 });
  }
  const c = compile({ temperature: T300C, elements, analysis: { kind: "op" }, options: { gmin: 0, reltol: 1e-9 } });
  const T = (f: number) => {
    const r = c.run({}, { kind: "ac", fStart: f, fStop: f, pointsPerDecade: 1 });
    if (r.kind !== "ac") throw new Error("ac");
    return { re: -r.nodes.ao.re[0], im: -r.nodes.ao.im[0] };
  };
  /** frequency where |T| crosses 1 (bisection on log f), and the phase margin there */
  const crossover = () => {
    let lo = 1e2, hi = 1e8;
    for (let i = 0; i < 60; i++) {
      const mid = Math.sqrt(lo * hi);
      const t = T(mid);
      if (Math.hypot(t.re, t.im) > 1) lo = mid; else hi = mid;
    }
    const f = Math.sqrt(lo * hi);
    const t = T(f);
    let pm = 180 + (Math.atan2(t.im, t.re) * 180) / Math.PI;
    if (pm > 180) pm -= 360; // phase below −180° (an unstable loop) reads as a negative margin
    return { f, pm };
  };
  return { T, crossover };
}

describe("loop gain of the sink loop, broken at the op-amp output (docs/references.md §6, derived values)", () => {
  it("low-frequency |T| = A0·(β+1)Rs/(RB + rπ + (β+1)Rs) = 8963.02", () => {
    const t = loop({ cf: 0, fp2: null, tauF: 0, cmu: 0, load: false }).T(1e-3);
    expect(Math.hypot(t.re, t.im)).toBeCloseTo(8963.02, 1);
  });
  const cases: [string, { cf: number; fp2: number | null; tauF: number; cmu: number; load: boolean }, number, number][] = [
    ["A: no device capacitance, CF = 10 nF", { cf: 10e-9, fp2: null, tauF: 0, cmu: 0, load: false }, 999999, 90.08],
    ["B: as A, CF = 0", { cf: 0, fp2: null, tauF: 0, cmu: 0, load: false }, 89630.2, 90.01],
    ["C: 2nd pole 5 MHz, τF = 1 ns, CF = 0", { cf: 0, fp2: 5e6, tauF: 1e-9, cmu: 0, load: false }, 89504.3, 86.15],
    ["D: as C, CF = 10 nF", { cf: 10e-9, fp2: 5e6, tauF: 1e-9, cmu: 0, load: false }, 981222, 78.98],
    ["E: as C + Cμ = 30 pF, inductive collector load, CF = 0 (unstable)", { cf: 0, fp2: 5e6, tauF: 1e-9, cmu: 30e-12, load: true }, 126125, -83.7],
    ["F: as E, CF = 10 nF", { cf: 10e-9, fp2: 5e6, tauF: 1e-9, cmu: 30e-12, load: true }, 981280, 78.99],
  ];
  it.each(cases)("case %s: crossover and phase margin", (_name, opts, fc, pm) => {
    const r = loop(opts).crossover();
    expect(r.f / fc).toBeCloseTo(1, 4);
    expect(r.pm).toBeCloseTo(pm, 1);
  });
});
