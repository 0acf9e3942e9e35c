/**
 * Transient accuracy by default on diode, switch and transistor circuits: the netlist gives only tStop and tStep,
 * and every accepted point must agree with an independent reference within 0.2 % of the waveform's full scale
 * (its range, max − min). The references are integrated IN THESE TESTS by a fine fixed-step classic RK4 (rk4.ts),
 * with the same device equations and parameters as the netlist; they share no code with the engine.
 * The temperature is pinned at 300 K (Vt = 25.852000 mV, 2019 SI constants; docs in REFERENCES §1.2) and the
 * engine's gmin is set to 0 so both sides solve exactly the same equations.
 */
import { describe, expect, it } from "vitest";
import { rk4, solveMonotonic, stateAt, type Rhs } from "./rk4";
import { runTran, T300C, VT300 } from "./helpers";

const TOL = 0.002; // 0.2 % of full scale

/** Largest |engine − reference| over the engine's accepted points, as a fraction of the reference's range. */
function worstError(time: Float64Array, engine: Float64Array, reference: (t: number) => number, samples = 4000): { err: number; at: number; fullScale: number } {
  const tStop = time[time.length - 1];
  let lo = Infinity, hi = -Infinity;
  for (let k = 0; k <= samples; k++) { const v = reference((tStop * k) / samples); lo = Math.min(lo, v); hi = Math.max(hi, v); }
  const fullScale = hi - lo;
  let err = 0, at = 0;
  for (let i = 0; i < time.length; i++) {
    const e = Math.abs(engine[i] - reference(time[i]));
    if (e > err) { err = e; at = time[i]; }
  }
  return { err: err / fullScale, at, fullScale };
}

describe("transient accuracy by default against RK4 references integrated in the test (0.2 % of full scale)", () => {
  it("half-wave rectifier: 5 V 1 kHz sine, diode, 1 kΩ ∥ 1 µF load, 10 ms (every peak and every turn-on)", () => {
    const Is = 1e-14, n = 1, R = 1e3, C = 1e-6, A = 5, f = 1e3;
    const tStop = 10e-3;
    const r = runTran({
      temperature: T300C,
      elements: [
        { kind: "vsource", name: "V1", nodes: ["in", "gnd"], wave: { shape: "sine", amplitude: A, freq: f } },
        { kind: "diode", name: "D1", nodes: ["in", "out"], model: { Is, n } },
        { kind: "resistor", name: "RL", nodes: ["out", "gnd"], value: R },
        { kind: "capacitor", name: "CL", nodes: ["out", "gnd"], value: C },
      ],
      analysis: { kind: "tran", tStop, tStep: tStop / 500 },
      options: { gmin: 0 },
    });
    // Reference: C·dv/dt = Is·(exp((vin − v)/(n·Vt)) − 1) − v/R, v(0) = 0 (vin(0) = 0), RK4 with 20 ns steps.
    const nvt = n * VT300;
    const rhs: Rhs = (t, y, dy) => {
      const vin = A * Math.sin(2 * Math.PI * f * t);
      dy[0] = (Is * (Math.exp((vin - y[0]) / nvt) - 1) - y[0] / R) / C;
    };
    const ref = rk4(rhs, [0], tStop, 500_000);
    const w = worstError(r.time, r.nodes.out, (t) => stateAt(ref, rhs, t, 0));
    expect(w.fullScale).toBeGreaterThan(3); // the load charges to several volts each period
    expect(w.err, `worst at t = ${w.at}`).toBeLessThan(TOL);
  });

  it("a device charge alone sets the step: reverse-biased diode (depletion charge only, no capacitor) behind 10 kΩ, 1 MHz sine", () => {
    const Is = 1e-14, n = 1, Cj0 = 10e-12, Vj = 0.7, m = 0.5, R = 10e3, off = -2, A = 1.5, f = 1e6;
    const tStop = 10e-6;
    const r = runTran({
      temperature: T300C,
      elements: [
        { kind: "vsource", name: "V1", nodes: ["in", "gnd"], dc: off, wave: { shape: "sine", offset: off, amplitude: A, freq: f } },
        { kind: "resistor", name: "R1", nodes: ["in", "k"], value: R },
        { kind: "diode", name: "D1", nodes: ["k", "gnd"], model: { Is, n, Cj0, Vj, m } },
      ],
      analysis: { kind: "tran", tStop, tStep: tStop / 500 },
      options: { gmin: 0 },
    });
    // Reference: the junction stays below Fc·Vj (reverse biased), so its charge is the depletion charge with
    // C(v) = Cj0/(1 − v/Vj)^m (REFERENCES §1.4) and (vin − v)/R = Is·(e^{v/(n·Vt)} − 1) + C(v)·dv/dt;
    // v(0) is the DC point with vin = −2 V (bisection on the monotonic KCL), RK4 with 1 ns steps.
    const nvt = n * VT300;
    const kcl = (vin: number, v: number) => (vin - v) / R - Is * (Math.exp(v / nvt) - 1);
    const rhs: Rhs = (t, y, dy) => {
      const vin = off + A * Math.sin(2 * Math.PI * f * t);
      dy[0] = kcl(vin, y[0]) / (Cj0 / Math.pow(1 - y[0] / Vj, m));
    };
    let lo = -5, hi = 0;
    for (let k = 0; k < 200; k++) { const mid = 0.5 * (lo + hi); if (kcl(off, mid) > 0) lo = mid; else hi = mid; }
    const ref = rk4(rhs, [0.5 * (lo + hi)], tStop, 10_000);
    const w = worstError(r.time, r.nodes.k, (t) => stateAt(ref, rhs, t, 0));
    expect(w.fullScale).toBeGreaterThan(1); // the RC corner (≈ 1/(2π·10 kΩ·5 pF) ≈ 3 MHz) passes most of the 3 V swing
    expect(w.err, `worst at t = ${w.at}`).toBeLessThan(TOL);
  });

  it("clamp-diode coil turn-off: 12 V, 24 Ω + 10 mH coil (1 kΩ across it), switch opens at 1 ms, current freewheels through the diode", () => {
    const Vs = 12, Rc = 24, L = 10e-3, Rp = 1e3, Is = 1e-14, n = 1, ron = 0.01, roff = 1e9, tr = 1e-6, tOff = 1e-3;
    const tStop = 3e-3;
    const r = runTran({
      temperature: T300C,
      elements: [
        { kind: "vsource", name: "VS", nodes: ["vs", "gnd"], dc: Vs },
        { kind: "resistor", name: "Rcoil", nodes: ["vs", "m"], value: Rc },
        { kind: "inductor", name: "Lcoil", nodes: ["m", "sw"], value: L },
        { kind: "resistor", name: "Rpar", nodes: ["m", "sw"], value: Rp },
        { kind: "switch", name: "S1", nodes: ["sw", "gnd"], ron, roff, transition: tr, schedule: [[0, "on"], [tOff, "off"]] },
        { kind: "diode", name: "Dclamp", nodes: ["sw", "vs"], model: { Is, n } },
      ],
      analysis: { kind: "tran", tStop, tStep: tStop / 500 },
      options: { gmin: 0 },
    });
    // Reference. The switch's conductance follows its documented law: on from t = 0, then the resistance moves
    // log-linearly from ron to roff over `transition` after tOff (README, `switch`).
    const gsw = (t: number) => {
      if (t < tOff) return 1 / ron;
      if (t >= tOff + tr) return 1 / roff;
      return Math.exp(-(Math.log(ron) + (Math.log(roff) - Math.log(ron)) * ((t - tOff) / tr)));
    };
    const nvt = n * VT300;
    const ga = 1 / Rc + 1 / Rp;
    /** node voltages [v(m), v(sw)] from the coil current iL by KCL at m and sw (v(sw) by a monotonic root) */
    const nodes = (t: number, iL: number, out: Float64Array) => {
      const g = gsw(t);
      const vm = (v: number) => (Vs / Rc - iL + v / Rp) / ga;
      const kcl = (v: number) => iL + (vm(v) - v) / Rp - g * v - Is * (Math.exp((v - Vs) / nvt) - 1);
      const dkcl = (v: number) => (1 / (Rp * ga) - 1) / Rp - g - (Is / nvt) * Math.exp((v - Vs) / nvt);
      const vsw = solveMonotonic(kcl, dkcl, -100, Vs + 2, out[1]);
      out[0] = vm(vsw);
      out[1] = vsw;
    };
    const nv = new Float64Array(2);
    const rhs: Rhs = (t, y, dy) => { nodes(t, y[0], nv); dy[0] = (nv[0] - nv[1]) / L; };
    // initial state: the switch on, DC: the coil current is Vs/(Rc + ron) (the inductor shorts Rpar)
    const ref = rk4(rhs, [Vs / (Rc + ron)], tStop, 300_000); // 10 ns steps
    const iRef = (t: number) => stateAt(ref, rhs, t, 0);
    const vRef = (t: number) => { nodes(t, iRef(t), nv); return nv[1]; };
    const wi = worstError(r.time, r.currents.Lcoil, iRef);
    const wv = worstError(r.time, r.nodes.sw, vRef);
    expect(wi.fullScale).toBeGreaterThan(0.45); // the coil current decays from 0.5 A to zero
    expect(wv.fullScale).toBeGreaterThan(12); // the switch node is clamped one diode drop above the supply
    expect(wi.err, `coil current, worst at t = ${wi.at}`).toBeLessThan(TOL);
    expect(wv.err, `switch node, worst at t = ${wv.at}`).toBeLessThan(TOL);
  });

  it("emitter follower (transport-model NPN, no capacitances), 1 kΩ ∥ 100 nF emitter load, 2 V 10 kHz sine on 5 V", () => {
    const Is = 1e-14, betaF = 100, betaR = 1, Vcc = 10, Rb = 1e3, RE = 1e3, CE = 100e-9, off = 5, A = 2, f = 1e4;
    const tStop = 1e-3;
    const r = runTran({
      temperature: T300C,
      elements: [
        { kind: "vsource", name: "VCC", nodes: ["vcc", "gnd"], dc: Vcc },
        { kind: "vsource", name: "VIN", nodes: ["in", "gnd"], dc: off, wave: { shape: "sine", offset: off, amplitude: A, freq: f } },
        { kind: "resistor", name: "RB", nodes: ["in", "b"], value: Rb },
        { kind: "bjt", name: "Q1", nodes: ["vcc", "b", "e"], polarity: "npn", model: { Is, betaF, betaR } },
        { kind: "resistor", name: "RE", nodes: ["e", "gnd"], value: RE },
        { kind: "capacitor", name: "CE", nodes: ["e", "gnd"], value: CE },
      ],
      analysis: { kind: "tran", tStop, tStep: tStop / 500 },
      options: { gmin: 0 },
    });
    // Reference: the transport model (REFERENCES §1.2), IC = Is(e^{vbe/Vt} − e^{vbc/Vt}) − (Is/βR)(e^{vbc/Vt} − 1),
    // IB = (Is/βF)(e^{vbe/Vt} − 1) + (Is/βR)(e^{vbc/Vt} − 1); the base node from KCL (vin − vb)/Rb = IB;
    // CE·dve/dt = IC + IB − ve/RE.
    const vt = VT300;
    const ib = (vb: number, ve: number) => (Is / betaF) * (Math.exp((vb - ve) / vt) - 1) + (Is / betaR) * (Math.exp((vb - Vcc) / vt) - 1);
    const dib = (vb: number, ve: number) => (Is / (betaF * vt)) * Math.exp((vb - ve) / vt) + (Is / (betaR * vt)) * Math.exp((vb - Vcc) / vt);
    let vbGuess = off;
    const base = (vin: number, ve: number) => {
      vbGuess = solveMonotonic((v) => (vin - v) / Rb - ib(v, ve), (v) => -1 / Rb - dib(v, ve), Math.min(vin, ve) - 10, vin + 1, vbGuess);
      return vbGuess;
    };
    const emitter = (vin: number, ve: number) => {
      const vb = base(vin, ve);
      const ebe = Math.exp((vb - ve) / vt), ebc = Math.exp((vb - Vcc) / vt);
      const ic = Is * (ebe - ebc) - (Is / betaR) * (ebc - 1);
      return ic + ib(vb, ve);
    };
    const vinAt = (t: number) => off + A * Math.sin(2 * Math.PI * f * t);
    const rhs: Rhs = (t, y, dy) => { dy[0] = (emitter(vinAt(t), y[0]) - y[0] / RE) / CE; };
    // initial state: the DC operating point with vin = 5 V, IE(ve) = ve/RE (bisection: IE − ve/RE falls with ve)
    let lo = 0, hi = off;
    for (let k = 0; k < 200; k++) { const mid = 0.5 * (lo + hi); if (emitter(off, mid) - mid / RE > 0) lo = mid; else hi = mid; }
    const ref = rk4(rhs, [0.5 * (lo + hi)], tStop, 100_000); // 10 ns steps
    const w = worstError(r.time, r.nodes.e, (t) => stateAt(ref, rhs, t, 0));
    expect(w.fullScale).toBeGreaterThan(2.5); // follows most of the 4 V swing (it cuts off on the falling slope)
    expect(w.err, `worst at t = ${w.at}`).toBeLessThan(TOL);
  });
});
