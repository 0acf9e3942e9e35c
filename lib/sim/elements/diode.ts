/**
 * Junction diode: Shockley equation I = Is·(e^{V/(n·Vt)} − 1) (W. Shockley, Bell Syst. Tech. J. 28, 1949), optional
 * reverse breakdown at BV (exponential knee), depletion + diffusion (tau·I) charge, series Rs, gmin across the junction.
 */
import { Builder, Circuit, ELEMENTARY_CHARGE, Element, type DeviceInfo, MODE_TRAN, type NoiseSink, stampG } from "../circuit";
import { criticalVoltage, depletion, expLim, expLimSlope, junctionCeiling, pnjlim } from "./junction";
import { z } from "zod";
import { grading, name, noiseless, nonNegative, positive, two } from "../fields";
import { defineKind } from "../kind";
import { nodeOf } from "./linear";

export interface DiodeModel { Is: number; n: number; Rs: number; Cj0: number; Vj: number; m: number; tau: number; BV: number | null }

const scratch = new Float64Array(2);

export class Diode extends Element {
  private a = 0; private k = 0; private ai = 0;
  private paa = 0; private pai = 0; private pia = 0; private pii = 0;
  private jaa = 0; private jak = 0; private jka = 0; private jkk = 0;
  private s = 0;
  private vd = 0;
  private iPrev = 0;
  private gPrev = 0;
  private nvt = 0.025;
  private vcrit = 0.6;
  private vmax = 1.5;
  constructor(name: string, private readonly nodeNames: readonly [string, string], private readonly model: DiodeModel) {
    super(name, "diode");
  }
  setup(b: Builder): void {
    this.a = nodeOf(b, this.nodeNames[0]);
    this.k = nodeOf(b, this.nodeNames[1]);
    this.ai = this.model.Rs > 0 ? b.internalNode(`${this.name}:anode`) : this.a;
  }
  bind(c: Circuit): void {
    this.a = c.idx(this.a); this.k = c.idx(this.k); this.ai = c.idx(this.ai);
    this.paa = c.pos(this.a, this.a); this.pai = c.pos(this.a, this.ai); this.pia = c.pos(this.ai, this.a); this.pii = c.pos(this.ai, this.ai);
    this.jaa = c.pos(this.ai, this.ai); this.jak = c.pos(this.ai, this.k); this.jka = c.pos(this.k, this.ai); this.jkk = c.pos(this.k, this.k);
    this.s = c.allocState(1);
    this.nvt = this.model.n * c.vt;
    this.vcrit = criticalVoltage(this.nvt, this.model.Is);
    this.vmax = junctionCeiling(this.nvt, this.model.Is);
  }
  /** junction current (A) and conductance (S) at vd; conductance left in scratch[1] */
  private iv(vd: number, gmin: number): number {
    const { Is, BV } = this.model;
    const nvt = this.nvt;
    let i = Is * (expLim(vd / nvt) - 1) + gmin * vd;
    let g = (Is * expLimSlope(vd / nvt)) / nvt + gmin;
    if (BV !== null) {
      const x = -(vd + BV) / nvt;
      i -= Is * expLim(x);
      g += (Is * expLimSlope(x)) / nvt;
    }
    scratch[1] = g;
    return i;
  }
  override loadStatic(m: Float64Array): void {
    if (this.model.Rs > 0) stampG(m, this.paa, this.pai, this.pia, this.pii, 1 / this.model.Rs);
  }
  load(c: Circuit): void {
    const m = c.mat;
    const mod = this.model;
    let vd = c.x[this.ai] - c.x[this.k];
    const raw = vd;
    if (mod.BV !== null && vd < Math.min(0, -mod.BV + 10 * this.nvt)) {
      const vr = pnjlim(-(vd + mod.BV), -(this.vd + mod.BV), this.nvt, this.vcrit);
      vd = -(vr + mod.BV);
    } else {
      vd = Math.min(pnjlim(vd, this.vd, this.nvt, this.vcrit), this.vmax);
    }
    const i = this.iv(vd, c.tol.gmin);
    let g = scratch[1];
    if (vd !== raw) c.noncon++;
    else c.checkCurrent(i, this.iPrev + this.gPrev * (vd - this.vd));
    this.vd = vd;
    this.iPrev = i;
    this.gPrev = g;
    let ceq = i - g * vd;
    if (c.mode === MODE_TRAN && (mod.Cj0 > 0 || mod.tau > 0)) {
      depletion(vd, mod.Cj0, mod.Vj, mod.m, scratch);
      const gd = (mod.Is * expLimSlope(vd / this.nvt)) / this.nvt;
      const q = scratch[0] + mod.tau * mod.Is * (expLim(vd / this.nvt) - 1);
      const cap = scratch[1] + mod.tau * gd;
      const iq = c.integrate(this.s, q);
      const geq = c.ag0 * cap;
      g += geq;
      ceq += iq - geq * vd;
    }
    stampG(m, this.jaa, this.jak, this.jka, this.jkk, g);
    c.rhs[this.ai] -= ceq;
    c.rhs[this.k] += ceq;
  }
  private charge(vd: number): number {
    depletion(vd, this.model.Cj0, this.model.Vj, this.model.m, scratch);
    return scratch[0] + this.model.tau * this.model.Is * (expLim(vd / this.nvt) - 1);
  }
  override initState(c: Circuit): void {
    const vd = c.x[this.ai] - c.x[this.k];
    this.vd = vd;
    c.q1[this.s] = this.charge(vd);
    c.i1[this.s] = 0;
  }
  override loadCap(c: Circuit, cap: Float64Array): void {
    const vd = c.x[this.ai] - c.x[this.k];
    depletion(vd, this.model.Cj0, this.model.Vj, this.model.m, scratch);
    const C = scratch[1] + (this.model.tau * this.model.Is * expLimSlope(vd / this.nvt)) / this.nvt;
    stampG(cap, this.jaa, this.jak, this.jka, this.jkk, C);
  }
  override current(c: Circuit): number {
    const i = this.iv(c.x[this.ai] - c.x[this.k], c.tol.gmin);
    return c.mode === MODE_TRAN ? i + c.i0[this.s] : i;
  }
  private acG = 0;
  private acC = 0;
  override acPrepare(c: Circuit): void {
    const vd = c.x[this.ai] - c.x[this.k];
    this.iv(vd, c.tol.gmin);
    this.acG = scratch[1];
    depletion(vd, this.model.Cj0, this.model.Vj, this.model.m, scratch);
    this.acC = scratch[1] + (this.model.tau * this.model.Is * expLimSlope(vd / this.nvt)) / this.nvt;
  }
  /** shot noise 2q·|I| across the junction (Schottky 1918; gmin's current left out), thermal noise 4kT/Rs */
  override noise(c: Circuit, sink: NoiseSink): void {
    const vd = c.x[this.ai] - c.x[this.k];
    const i = this.iv(vd, 0);
    sink.add(this.ai, this.k, 1, 2 * ELEMENTARY_CHARGE * Math.abs(i), 0);
    if (this.model.Rs > 0) sink.add(this.a, this.ai, 1, (4 * c.kT) / this.model.Rs, 0);
  }
  override acCurrent(_c: Circuit, xr: Float64Array, xi: Float64Array, w: number, out: Float64Array): void {
    const g = this.acG, C = this.acC;
    const vr = xr[this.ai] - xr[this.k];
    const vi = xi[this.ai] - xi[this.k];
    out[0] = g * vr - w * C * vi;
    out[1] = g * vi + w * C * vr;
  }
  override info(c: Circuit): DeviceInfo {
    const id = this.current(c);
    const vd = c.x[this.a] - c.x[this.k];
    return { kind: "diode", id, vd, power: id * vd };
  }
}

export const diodeKind = defineKind("diode", z.object({
  kind: z.literal("diode"), name, nodes: two, noiseless,
  model: z.strictObject({
    Is: positive().default(1e-14), n: positive().default(1), Rs: nonNegative().default(0),
    Cj0: nonNegative().default(0), Vj: positive().default(0.7), m: grading().default(0.5),
    tau: nonNegative().default(0), BV: positive().nullable().default(null),
  }).prefault({}),
}), {
  create: (e) => new Diode(e.name, e.nodes, e.model),
  dcPaths: (e) => [[e.nodes[0], e.nodes[1]]],
});
