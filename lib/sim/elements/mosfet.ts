/**
 * MOSFET, square law (H. Shichman & D. A. Hodges, IEEE JSSC SC-3(3), 1968):
 *   saturation (VDS ≥ VGS−Vth): ID = K·(VGS−Vth)²·(1+λ·VDS)
 *   triode:                      ID = K·(2(VGS−Vth)·VDS − VDS²)·(1+λ·VDS)
 * Symmetric (drain and source swap when VDS < 0), N and P channel, fixed Cgs and Cgd, gmin from drain to source.
 */
import { Builder, Circuit, Element, type DeviceInfo, MODE_TRAN, type NoiseSink, stampG } from "../circuit";
import { z } from "zod";
import { finite, name, noiseless, nonNegative, positive, three } from "../fields";
import { defineKind } from "../kind";
import { nodeOf } from "./linear";

export interface MosfetModel { Vth: number; K: number; lambda: number; Cgs: number; Cgd: number }

/** Drain current and derivatives of the square law in normal mode (vds ≥ 0): writes [id, gm, gds]. */
export function squareLaw(vgs: number, vds: number, m: MosfetModel, out: Float64Array): void {
  const vov = vgs - m.Vth;
  if (vov <= 0) { out[0] = 0; out[1] = 0; out[2] = 0; return; }
  const cl = 1 + m.lambda * vds;
  if (vds >= vov) {
    out[0] = m.K * vov * vov * cl;
    out[1] = 2 * m.K * vov * cl;
    out[2] = m.K * vov * vov * m.lambda;
  } else {
    const f = 2 * vov * vds - vds * vds;
    out[0] = m.K * f * cl;
    out[1] = 2 * m.K * vds * cl;
    out[2] = m.K * (2 * vov - 2 * vds) * cl + m.K * f * m.lambda;
  }
}

const sq = new Float64Array(3);

/*
 * Newton step limiting for the square law, after the MOSFET practice described by T. Quarles, "Analysis of
 * performance and convergence issues for circuit simulation", UCB ERL M89/42, 1989 [from memory]: the gate voltage
 * may move by about twice its overdrive (plus 2 V) per iteration and turns a device on only to Vth + 0.5 V at a time;
 * a large VDS may at most triple, a small one grow to 4 V or fall to −0.5 V.
 */
function limitGate(vNew: number, vOld: number, vth: number): number {
  const span = 2 * Math.abs(vOld - vth) + 2;
  const d = vNew - vOld;
  if (vOld >= vth) {
    if (d > span) return vOld + span;
    if (vOld >= vth + 3.5) {
      if (d < -span / 2 - 2) return Math.max(vOld - span / 2 - 2, vth + 2);
    } else if (d < 0) {
      return Math.max(vNew, vth - 0.5);
    }
    return vNew;
  }
  if (d < -span) return vOld - span;
  if (d > 0 && vNew > vth + 0.5) return vth + 0.5;
  return vNew;
}
function limitDrain(vNew: number, vOld: number): number {
  if (vOld >= 3.5) {
    if (vNew > vOld) return Math.min(vNew, 3 * vOld + 2);
    if (vNew < 3.5) return Math.max(vNew, 2);
    return vNew;
  }
  if (vNew > vOld) return Math.min(vNew, 4);
  return Math.max(vNew, -0.5);
}

export class Mosfet extends Element {
  private readonly p: number;
  private d = 0; private g = 0; private s = 0;
  private pdd = 0; private pdg = 0; private pds = 0; private psd = 0; private psg = 0; private pss = 0;
  private gg = 0; private pgs = 0; private psgC = 0; private pgd = 0; private pdgC = 0;
  private st = 0;
  private vgs = 0; private vds = 0;
  private id = 0; private Gg = 0; private Gd = 0;
  constructor(name: string, private readonly nodeNames: readonly [string, string, string], polarity: "n" | "p", private readonly model: MosfetModel) {
    super(name, "mosfet");
    this.p = polarity === "n" ? 1 : -1;
  }
  setup(b: Builder): void {
    this.d = nodeOf(b, this.nodeNames[0]);
    this.g = nodeOf(b, this.nodeNames[1]);
    this.s = nodeOf(b, this.nodeNames[2]);
  }
  bind(c: Circuit): void {
    const d = (this.d = c.idx(this.d)), g = (this.g = c.idx(this.g)), s = (this.s = c.idx(this.s));
    this.pdd = c.pos(d, d); this.pdg = c.pos(d, g); this.pds = c.pos(d, s);
    this.psd = c.pos(s, d); this.psg = c.pos(s, g); this.pss = c.pos(s, s);
    this.gg = c.pos(g, g); this.pgs = c.pos(g, s); this.psgC = c.pos(s, g); this.pgd = c.pos(g, d); this.pdgC = c.pos(d, g);
    this.st = c.allocState(2);
  }
  /** normalised drain current and its derivatives wrt vgs, vds (both modes) */
  private evaluate(vgs: number, vds: number): void {
    if (vds >= 0) {
      squareLaw(vgs, vds, this.model, sq);
      this.id = sq[0]; this.Gg = sq[1]; this.Gd = sq[2];
    } else {
      squareLaw(vgs - vds, -vds, this.model, sq);
      this.id = -sq[0]; this.Gg = -sq[1]; this.Gd = sq[1] + sq[2];
    }
  }
  load(c: Circuit): void {
    const m = c.mat, x = c.x, p = this.p;
    let vgs = p * (x[this.g] - x[this.s]);
    let vds = p * (x[this.d] - x[this.s]);
    const vgsL = limitGate(vgs, this.vgs, this.model.Vth);
    const vdsL = this.vds >= 0 ? limitDrain(vds, this.vds) : -limitDrain(-vds, -this.vds);
    if (vgsL !== vgs || vdsL !== vds) { vgs = vgsL; vds = vdsL; c.noncon++; }
    const id0 = this.id, gg0 = this.Gg, gd0 = this.Gd;
    const dgs = vgs - this.vgs, dds = vds - this.vds;
    this.vgs = vgs; this.vds = vds;
    this.evaluate(vgs, vds);
    c.checkCurrent(this.id, id0 + gg0 * dgs + gd0 * dds);
    const gmin = c.tol.gmin;
    const Gg = this.Gg, Gd = this.Gd + gmin;
    const id = this.id + gmin * vds;
    m[this.pdg] += Gg; m[this.pdd] += Gd; m[this.pds] -= Gg + Gd;
    m[this.psg] -= Gg; m[this.psd] -= Gd; m[this.pss] += Gg + Gd;
    const ceq = p * (id - Gg * vgs - Gd * vds);
    c.rhs[this.d] -= ceq;
    c.rhs[this.s] += ceq;
    if (c.mode === MODE_TRAN) {
      const { Cgs, Cgd } = this.model;
      if (Cgs > 0) {
        const v = x[this.g] - x[this.s];
        const i = c.integrate(this.st, Cgs * v);
        const geq = c.ag0 * Cgs;
        stampG(m, this.gg, this.pgs, this.psgC, this.pss, geq);
        c.rhs[this.g] -= i - geq * v; c.rhs[this.s] += i - geq * v;
      }
      if (Cgd > 0) {
        const v = x[this.g] - x[this.d];
        const i = c.integrate(this.st + 1, Cgd * v);
        const geq = c.ag0 * Cgd;
        stampG(m, this.gg, this.pgd, this.pdgC, this.pdd, geq);
        c.rhs[this.g] -= i - geq * v; c.rhs[this.d] += i - geq * v;
      }
    }
  }
  override initState(c: Circuit): void {
    c.q1[this.st] = this.model.Cgs * (c.x[this.g] - c.x[this.s]);
    c.q1[this.st + 1] = this.model.Cgd * (c.x[this.g] - c.x[this.d]);
    c.i1[this.st] = 0; c.i1[this.st + 1] = 0;
  }
  override loadCap(_c: Circuit, cap: Float64Array): void {
    stampG(cap, this.gg, this.pgs, this.psgC, this.pss, this.model.Cgs);
    stampG(cap, this.gg, this.pgd, this.pdgC, this.pdd, this.model.Cgd);
  }
  /** The element's current: drain current (into the drain terminal). */
  override current(c: Circuit): number {
    const p = this.p;
    const vgs = p * (c.x[this.g] - c.x[this.s]);
    const vds = p * (c.x[this.d] - c.x[this.s]);
    this.evaluate(vgs, vds);
    let i = p * (this.id + c.tol.gmin * vds);
    if (c.mode === MODE_TRAN) i -= c.i0[this.st + 1];
    return i;
  }
  override acPrepare(c: Circuit): void {
    const p = this.p;
    this.evaluate(p * (c.x[this.g] - c.x[this.s]), p * (c.x[this.d] - c.x[this.s]));
  }
  /** channel thermal noise 8kT·gm/3 from drain to source (long-channel saturation value; van der Ziel 1962) */
  override noise(c: Circuit, sink: NoiseSink): void {
    const p = this.p;
    this.evaluate(p * (c.x[this.g] - c.x[this.s]), p * (c.x[this.d] - c.x[this.s]));
    sink.add(this.d, this.s, 1, (8 * c.kT * Math.abs(this.Gg)) / 3, 0);
  }
  override acCurrent(_c: Circuit, xr: Float64Array, xi: Float64Array, w: number, out: Float64Array): void {
    const vgsR = xr[this.g] - xr[this.s], vgsI = xi[this.g] - xi[this.s];
    const vdsR = xr[this.d] - xr[this.s], vdsI = xi[this.d] - xi[this.s];
    const vgdR = xr[this.g] - xr[this.d], vgdI = xi[this.g] - xi[this.d];
    const wc = w * this.model.Cgd;
    out[0] = this.Gg * vgsR + this.Gd * vdsR + wc * vgdI;
    out[1] = this.Gg * vgsI + this.Gd * vdsI - wc * vgdR;
  }
  override info(c: Circuit): DeviceInfo {
    const id = this.current(c);
    const vgs = c.x[this.g] - c.x[this.s];
    const vds = c.x[this.d] - c.x[this.s];
    const vov = this.p * vgs - this.model.Vth;
    const vdsN = Math.abs(vds);
    const region = vov <= 0 ? "cutoff" : vdsN >= vov ? "saturation" : "triode";
    return { kind: "mosfet", id, vgs, vds, power: id * vds, region };
  }
}

export const mosfetKind = defineKind("mosfet", z.object({
  kind: z.literal("mosfet"), name, nodes: three, noiseless,
  polarity: z.enum(["n", "p"]).default("n"),
  model: z.strictObject({
    Vth: finite().default(2), K: positive().default(1), lambda: nonNegative().default(0),
    Cgs: nonNegative().default(0), Cgd: nonNegative().default(0),
  }).prefault({}),
}), {
  create: (e) => new Mosfet(e.name, e.nodes, e.polarity, e.model),
  // drain–source channel (the gate has no DC path)
  dcPaths: (e) => [[e.nodes[0], e.nodes[2]]],
});
