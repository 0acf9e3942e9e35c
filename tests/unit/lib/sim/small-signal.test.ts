import { describe, expect, it } from "vitest";
import type { NetlistElement } from "@/lib/sim";
import { T300C, VT300, runAc, runOp, runSweep, runTran } from "./helpers";
import { referenceSink } from "./fixtures/sink";

/**
 * Depletion capacitance (docs/references.md §1.4, Gray & Meyer; Nagel 1975): Cj0/(1 − V/Vj)^m below Fc·Vj (Fc = 0.5),
 * Cj0/(1−Fc)^{1+m}·(1 − Fc(1+m) + m·V/Vj) above.
 */
function cj(v: number, cj0: number, vj: number, m: number): number {
  const fc = 0.5;
  if (v < fc * vj) return cj0 / Math.pow(1 - v / vj, m);
  return (cj0 / Math.pow(1 - fc, 1 + m)) * (1 - fc * (1 + m) + (m * v) / vj);
}

describe("AC linearisation of the BJT: hybrid-π with Cπ = Cje(Vbe) + τF·gm and Cμ = Cjc(Vbc) (docs/references.md §1.3–1.4)", () => {
  it("short-circuit current gain h_fe(jω) = (gm − jωCμ)/(gπ + jω(Cπ + Cμ)) at 1 kHz … 1 GHz", () => {
    const model = { Is: 1e-15, betaF: 120, betaR: 1, Cje0: 2e-12, Vje: 0.75, mje: 0.33, Cjc0: 1e-12, Vjc: 0.75, mjc: 0.5, tauF: 0.3e-9 };
    const elements: NetlistElement[] = [
      { kind: "vsource", name: "VCC", nodes: ["c", "0"], dc: 5 },
      { kind: "isource", name: "IB", nodes: ["0", "b"], dc: 10e-6, ac: 1 },
      { kind: "bjt", name: "Q1", nodes: ["c", "b", "0"], model },
    ];
    const op = runOp({ temperature: T300C, elements, analysis: { kind: "op" }, options: { gmin: 0, reltol: 1e-10 } });
    const vbe = op.nodes.b, vbc = op.nodes.b - 5;
    const gm = (model.Is * Math.exp(vbe / VT300)) / VT300;
    const gpi = gm / model.betaF;
    const cpi = cj(vbe, model.Cje0, model.Vje, model.mje) + model.tauF * gm;
    const cmu = cj(vbc, model.Cjc0, model.Vjc, model.mjc);
    const ac = runAc({ temperature: T300C, elements, analysis: { kind: "ac", fStart: 1e3, fStop: 1e9, pointsPerDecade: 2 }, options: { gmin: 0, reltol: 1e-10 } });
    for (let k = 0; k < ac.freq.length; k++) {
      const w = 2 * Math.PI * ac.freq[k];
      // h = (gm − jωCμ)/(gπ + jωCt)
      const nr = gm, ni = -w * cmu, dr = gpi, di = w * (cpi + cmu);
      const den = dr * dr + di * di;
      const hr = (nr * dr + ni * di) / den, hi = (ni * dr - nr * di) / den;
      // collector current (into the collector) = −I(VCC); base drive is 1 A AC
      const icr = -ac.currents.VCC.re[k], ici = -ac.currents.VCC.im[k];
      expect(Math.abs(icr - hr)).toBeLessThan(1e-6 * Math.hypot(hr, hi));
      expect(Math.abs(ici - hi)).toBeLessThan(1e-6 * Math.hypot(hr, hi));
      // the element's own AC current (collector current) agrees with the source's
      expect(ac.currents.Q1.re[k]).toBeCloseTo(icr, 6);
    }
  });

  it("diode small-signal conductance I/(n·Vt) (derivative of the Shockley equation): AC divider against 1 kΩ", () => {
    const elements: NetlistElement[] = [
      { kind: "vsource", name: "V1", nodes: ["a", "0"], dc: 5, ac: 1 },
      { kind: "resistor", name: "R1", nodes: ["a", "d"], value: 1000 },
      { kind: "diode", name: "D1", nodes: ["d", "0"], model: { Is: 1e-14, n: 1.5 } },
    ];
    const op = runOp({ temperature: T300C, elements, analysis: { kind: "op" }, options: { gmin: 0, reltol: 1e-10 } });
    const gd = (op.currents.D1 + 1e-14) / (1.5 * VT300);
    const ac = runAc({ temperature: T300C, elements, analysis: { kind: "ac", fStart: 1e3, fStop: 1e3, pointsPerDecade: 1 }, options: { gmin: 0, reltol: 1e-10 } });
    expect(ac.nodes.d.re[0]).toBeCloseTo(1e-3 / (1e-3 + gd), 10);
  });
});

describe("reference sink (fixture): consistency of the analyses", () => {
  it("AC command→load transconductance at 0.01 Hz equals the slope of two operating points (dI/dV identity)", () => {
    const dv = 1e-3;
    const hi = runOp(referenceSink({ kind: "op" }, 5 + dv)).currents.pass;
    const lo = runOp(referenceSink({ kind: "op" }, 5 - dv)).currents.pass;
    const slope = (hi - lo) / (2 * dv);
    // (0.01 Hz: far below the loop's crossover, so the AC value is the DC derivative)
    const ac = runAc(referenceSink({ kind: "ac", fStart: 0.01, fStop: 0.01, pointsPerDecade: 1 }));
    expect(ac.currents.pass.re[0]).toBeCloseTo(slope, 5);
    // ≈ (1/48)/0.1 · α: 1 kΩ/(47 kΩ + 1 kΩ) divider over the 0.1 Ω sense, times IC/IE
    expect(slope).toBeGreaterThan(0.2);
    expect(slope).toBeLessThan(0.2084);
  });

  it("the transient settles to the operating point of its final inputs (command 5 V, load step on)", () => {
    const tr = runTran(referenceSink({ kind: "tran", tStop: 10e-3 }));
    const n = referenceSink({ kind: "op" });
    const sw = n.elements.find((e) => e.name === "step-switch");
    if (!sw || sw.kind !== "switch") throw new Error("fixture");
    sw.schedule = [[0, "on"]];
    const op = runOp(n);
    const last = tr.time.length - 1;
    expect(tr.time[last]).toBe(10e-3);
    expect(tr.currents.pass[last] / op.currents.pass).toBeCloseTo(1, 4);
    expect(tr.nodes.out[last]).toBeCloseTo(op.nodes.out, 3);
    // sense current ≈ Vcmd·(1k/48k)/0.1 Ω = 1.0417 A (the loop's purpose; within the op-amp's finite gain)
    expect(tr.currents.sense[last]).toBeCloseTo(5 / 48 / 0.1, 3);
    // the command step (0.2 ms) and the switch event (1 ms, 1 µs transition) are breakpoints
    expect(Array.from(tr.time)).toContain(2e-4);
    expect(Array.from(tr.time)).toContain(1e-3);
    expect(tr.stats.accepted).toBe(last);
  });

  it("op-amp info reports the output stage, and the transistor's power is IC·VCE + IB·VBE", () => {
    const op = runOp(referenceSink({ kind: "op" }));
    const q = op.devices.pass, u = op.devices.amplifier;
    if (q.kind !== "bjt" || u.kind !== "opamp") throw new Error("device info");
    expect(q.region).toBe("active");
    expect(q.power).toBeCloseTo(q.ic * q.vce + q.ib * q.vbe, 12);
    expect(q.ie).toBeCloseTo(q.ic + q.ib, 12);
    expect(u.vout).toBe(op.nodes.out);
    expect(u.iout).toBeCloseTo(q.ib, 8); // within the Newton tolerance (reltol 1e-3 of the update)
    expect(u.limiting).toBe(false);
  });

  it("a DC sweep of the command (each point continuing from the last) equals separate operating points", () => {
    const sweep = runSweep(referenceSink({ kind: "dcsweep", source: "command", from: 0, to: 5, points: 11 }));
    for (const k of [0, 3, 7, 10]) {
      const op = runOp(referenceSink({ kind: "op" }, sweep.sweep[k]));
      expect(sweep.currents.pass[k]).toBeCloseTo(op.currents.pass, 6);
      expect(sweep.nodes.out[k]).toBeCloseTo(op.nodes.out, 4);
    }
    // the op-amp's internal stage cannot go below 1.2 V, so at zero command the sink still conducts (a property of
    // this design): the output sits at that floor less the base current's drop across Rout = 40 Ω
    const u = runOp(referenceSink({ kind: "op" }, 0)).devices.amplifier;
    if (u.kind !== "opamp") throw new Error("opamp");
    expect(u.limiting).toBe(true);
    expect(sweep.nodes.out[0] + 40 * u.iout).toBeGreaterThan(1.2);
    expect(sweep.nodes.out[0] + 40 * u.iout).toBeLessThan(1.25);
    expect(sweep.currents.pass[0]).toBeGreaterThan(0.1);
  });
});
