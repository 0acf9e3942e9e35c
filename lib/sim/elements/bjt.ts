/**
 * Bipolar transistor, Ebers–Moll transport form (Ebers & Moll, Proc. IRE 42(12), 1954; transport form as in
 * Gray, Hurst, Lewis & Meyer, "Analysis and Design of Analog ICs", ch. 1 — REFERENCES §1.2), NPN and PNP:
 *   IT = Is·(e^{Vbe/Vt} − e^{Vbc/Vt})·(1 − Vbc/VA)       (forward Early effect as a Gummel–Poon q_b, §1.3)
 *   IC = IT − (Is/βR)(e^{Vbc/Vt} − 1),  IB = (Is/βF)(e^{Vbe/Vt} − 1) + (Is/βR)(e^{Vbc/Vt} − 1)
 * Charges: depletion Cj0/(1−V/Vj)^m linearised past Fc·Vj, diffusion τF·IF and τR·IR (Cdiff = τ·g), §1.4.
 * Optional series rb, rc, re through internal nodes; gmin across each junction; junction limiting (§1.5).
 */
import { Builder, Circuit, ELEMENTARY_CHARGE, Element, type DeviceInfo, MODE_TRAN, type NoiseSink, stampG } from "../circuit";
import { criticalVoltage, depletion, expLim, expLimSlope, junctionCeiling, pnjlim } from "./junction";
import { z } from "zod";
import { grading, name, noiseless, nonNegative, positive, three } from "../fields";
import { defineKind } from "../kind";
import { nodeOf } from "./linear";

export interface BjtModel {
  Is: number; betaF: number; betaR: number; VA: number | null;
  Cje0: number; Vje: number; mje: number; Cjc0: number; Vjc: number; mjc: number;
  tauF: number; tauR: number; rb: number; rc: number; re: number;
}

/** Terminal currents of the intrinsic transistor (normalised polarity), [IC, IB, IF, IR] */
export interface TransportCurrents { ic: number; ib: number; ie: number }

/**
 * The transport-model terminal currents for an NPN (for PNP pass Veb, Vcb and negate the results).
 * Exported so tests and the design layer can evaluate the published equations directly.
 */
export function transportCurrents(vbe: number, vbc: number, m: Pick<BjtModel, "Is" | "betaF" | "betaR" | "VA">, vt: number): TransportCurrents {
  const iF = m.Is * (Math.exp(vbe / vt) - 1);
  const iR = m.Is * (Math.exp(vbc / vt) - 1);
  const kq = m.VA === null ? 1 : 1 - vbc / m.VA;
  const it = (iF - iR) * kq;
  const ic = it - iR / m.betaR;
  const ib = iF / m.betaF + iR / m.betaR;
  return { ic, ib, ie: ic + ib };
}

const dep = new Float64Array(2);
const q4 = new Float64Array(4);
const t3 = new Float64Array(3);

export class Bjt extends Element {
  private readonly p: number;
  private c = 0; private b = 0; private e = 0;
  private ci = 0; private bi = 0; private ei = 0;
  // intrinsic 3×3 positions, rows/cols in order C', B', E'
  private pCC = 0; private pCB = 0; private pCE = 0; private pBC = 0; private pBB = 0; private pBE = 0;
  private pEC = 0; private pEB = 0; private pEE = 0;
  private rpos = new Int32Array(12);
  private sBE = 0; private sBC = 0;
  private vbe = 0; private vbc = 0;
  private vcrit = 0.6;
  private vmax = 1.5;
  // results of the last evaluation (normalised polarity)
  private IC = 0; private IB = 0; private gmBE = 0; private gcBC = 0; private gpi = 0; private gmu = 0;
  private iF = 0; private iR = 0; private gF = 0; private gR = 0;

  constructor(name: string, private readonly nodeNames: readonly [string, string, string], polarity: "npn" | "pnp", private readonly model: BjtModel) {
    super(name, "bjt");
    this.p = polarity === "npn" ? 1 : -1;
  }
  setup(bd: Builder): void {
    this.c = nodeOf(bd, this.nodeNames[0]);
    this.b = nodeOf(bd, this.nodeNames[1]);
    this.e = nodeOf(bd, this.nodeNames[2]);
    this.ci = this.model.rc > 0 ? bd.internalNode(`${this.name}:collector`) : this.c;
    this.bi = this.model.rb > 0 ? bd.internalNode(`${this.name}:base`) : this.b;
    this.ei = this.model.re > 0 ? bd.internalNode(`${this.name}:emitter`) : this.e;
  }
  bind(c: Circuit): void {
    this.c = c.idx(this.c); this.b = c.idx(this.b); this.e = c.idx(this.e);
    this.ci = c.idx(this.ci); this.bi = c.idx(this.bi); this.ei = c.idx(this.ei);
    const C = this.ci, B = this.bi, E = this.ei;
    this.pCC = c.pos(C, C); this.pCB = c.pos(C, B); this.pCE = c.pos(C, E);
    this.pBC = c.pos(B, C); this.pBB = c.pos(B, B); this.pBE = c.pos(B, E);
    this.pEC = c.pos(E, C); this.pEB = c.pos(E, B); this.pEE = c.pos(E, E);
    const pairs: [number, number][] = [[this.c, this.ci], [this.b, this.bi], [this.e, this.ei]];
    pairs.forEach(([x, y], i) => {
      this.rpos[4 * i] = c.pos(x, x); this.rpos[4 * i + 1] = c.pos(x, y);
      this.rpos[4 * i + 2] = c.pos(y, x); this.rpos[4 * i + 3] = c.pos(y, y);
    });
    this.sBE = c.allocState(2);
    this.sBC = this.sBE + 1;
    this.vcrit = criticalVoltage(c.vt, this.model.Is);
    this.vmax = junctionCeiling(c.vt, this.model.Is);
  }

  /** Evaluate currents and conductances at normalised (vbe, vbc). */
  private evaluate(vbe: number, vbc: number, vt: number, gmin: number): void {
    const m = this.model;
    const eF = expLim(vbe / vt);
    const eR = expLim(vbc / vt);
    this.iF = m.Is * (eF - 1);
    this.iR = m.Is * (eR - 1);
    this.gF = (m.Is * expLimSlope(vbe / vt)) / vt;
    this.gR = (m.Is * expLimSlope(vbc / vt)) / vt;
    const kq = m.VA === null ? 1 : 1 - vbc / m.VA;
    const dkq = m.VA === null ? 0 : -1 / m.VA;
    const it = (this.iF - this.iR) * kq;
    this.IC = it - this.iR / m.betaR - gmin * vbc;
    this.IB = this.iF / m.betaF + this.iR / m.betaR + gmin * (vbe + vbc);
    this.gmBE = this.gF * kq;
    this.gcBC = -this.gR * kq + (this.iF - this.iR) * dkq - this.gR / m.betaR - gmin;
    this.gpi = this.gF / m.betaF + gmin;
    this.gmu = this.gR / m.betaR + gmin;
  }

  override loadStatic(m: Float64Array): void {
    const mod = this.model;
    if (mod.rc > 0) stampG(m, this.rpos[0], this.rpos[1], this.rpos[2], this.rpos[3], 1 / mod.rc);
    if (mod.rb > 0) stampG(m, this.rpos[4], this.rpos[5], this.rpos[6], this.rpos[7], 1 / mod.rb);
    if (mod.re > 0) stampG(m, this.rpos[8], this.rpos[9], this.rpos[10], this.rpos[11], 1 / mod.re);
  }
  load(c: Circuit): void {
    const m = c.mat;
    const mod = this.model;
    const x = c.x;
    const p = this.p;
    const vt = c.vt;
    const vbeRaw = p * (x[this.bi] - x[this.ei]);
    const vbcRaw = p * (x[this.bi] - x[this.ci]);
    const vbe = Math.min(pnjlim(vbeRaw, this.vbe, vt, this.vcrit), this.vmax);
    const vbc = Math.min(pnjlim(vbcRaw, this.vbc, vt, this.vcrit), this.vmax);
    // previous linearisation, for the current convergence test
    const ic0 = this.IC, ib0 = this.IB, gm0 = this.gmBE, gc0 = this.gcBC, gpi0 = this.gpi, gmu0 = this.gmu;
    const dbe = vbe - this.vbe, dbc = vbc - this.vbc;
    this.vbe = vbe;
    this.vbc = vbc;
    this.evaluate(vbe, vbc, vt, c.tol.gmin);
    if (vbe !== vbeRaw || vbc !== vbcRaw) c.noncon++;
    else {
      c.checkCurrent(this.IC, ic0 + gm0 * dbe + gc0 * dbc);
      c.checkCurrent(this.IB, ib0 + gpi0 * dbe + gmu0 * dbc);
    }
    const gm = this.gmBE, gc = this.gcBC;
    let gpi = this.gpi, gmu = this.gmu;
    let ceqC = p * (this.IC - gm * vbe - gc * vbc);
    let ceqB = p * (this.IB - this.gpi * vbe - this.gmu * vbc);
    let ceqE = -ceqC - ceqB;
    if (c.mode === MODE_TRAN && (mod.Cje0 > 0 || mod.Cjc0 > 0 || mod.tauF > 0 || mod.tauR > 0)) {
      depletion(vbe, mod.Cje0, mod.Vje, mod.mje, dep);
      const iBE = c.integrate(this.sBE, dep[0] + mod.tauF * this.iF);
      const gBE = c.ag0 * (dep[1] + mod.tauF * this.gF);
      depletion(vbc, mod.Cjc0, mod.Vjc, mod.mjc, dep);
      const iBC = c.integrate(this.sBC, dep[0] + mod.tauR * this.iR);
      const gBC = c.ag0 * (dep[1] + mod.tauR * this.gR);
      // capacitive currents flow B'→E' and B'→C'
      const eBE = p * (iBE - gBE * vbe);
      const eBC = p * (iBC - gBC * vbc);
      ceqB += eBE + eBC;
      ceqE -= eBE;
      ceqC -= eBC;
      gpi += gBE;
      gmu += gBC;
      // B'–E' and B'–C' capacitive conductances (added to the diode-like pi/mu terms below)
    }
    // Rows are KCL at C', B', E'; columns are v(C'), v(B'), v(E'). Jacobian is polarity-independent.
    m[this.pCB] += gm + gc; m[this.pCE] -= gm; m[this.pCC] -= gc;
    const gpiX = gpi - this.gpi; // capacitive parts only touch B–E / B–C pairs
    const gmuX = gmu - this.gmu;
    m[this.pBB] += this.gpi + this.gmu; m[this.pBE] -= this.gpi; m[this.pBC] -= this.gmu;
    m[this.pEB] -= gm + gc + this.gpi + this.gmu; m[this.pEE] += gm + this.gpi; m[this.pEC] += gc + this.gmu;
    if (gpiX !== 0) stampG(m, this.pBB, this.pBE, this.pEB, this.pEE, gpiX);
    if (gmuX !== 0) stampG(m, this.pBB, this.pBC, this.pCB, this.pCC, gmuX);
    c.rhs[this.ci] -= ceqC;
    c.rhs[this.bi] -= ceqB;
    c.rhs[this.ei] -= ceqE;
  }

  private charges(c: Circuit, out: Float64Array): void {
    const mod = this.model;
    const vbe = this.p * (c.x[this.bi] - c.x[this.ei]);
    const vbc = this.p * (c.x[this.bi] - c.x[this.ci]);
    this.evaluate(vbe, vbc, c.vt, c.tol.gmin);
    depletion(vbe, mod.Cje0, mod.Vje, mod.mje, dep);
    out[0] = dep[0] + mod.tauF * this.iF;
    out[1] = dep[1] + mod.tauF * this.gF;
    depletion(vbc, mod.Cjc0, mod.Vjc, mod.mjc, dep);
    out[2] = dep[0] + mod.tauR * this.iR;
    out[3] = dep[1] + mod.tauR * this.gR;
  }

  override initState(c: Circuit): void {
    const q = q4;
    this.charges(c, q);
    c.q1[this.sBE] = q[0]; c.q1[this.sBC] = q[2];
    c.i1[this.sBE] = 0; c.i1[this.sBC] = 0;
    this.vbe = this.p * (c.x[this.bi] - c.x[this.ei]);
    this.vbc = this.p * (c.x[this.bi] - c.x[this.ci]);
  }

  override loadCap(c: Circuit, cap: Float64Array): void {
    const q = q4;
    this.charges(c, q);
    stampG(cap, this.pBB, this.pBE, this.pEB, this.pEE, q[1]);
    stampG(cap, this.pBB, this.pBC, this.pCB, this.pCC, q[3]);
  }

  /** terminal currents [ic into C, ib into B, ie out of E] at c.x (real polarity, capacitive currents included) */
  private terminal(c: Circuit): Float64Array {
    const vbe = this.p * (c.x[this.bi] - c.x[this.ei]);
    const vbc = this.p * (c.x[this.bi] - c.x[this.ci]);
    this.evaluate(vbe, vbc, c.vt, c.tol.gmin);
    let ic = this.IC, ib = this.IB, ie = this.IC + this.IB;
    if (c.mode === MODE_TRAN) {
      const iBE = c.i0[this.sBE], iBC = c.i0[this.sBC];
      ic -= iBC; ib += iBE + iBC; ie += iBE;
    }
    t3[0] = this.p * ic; t3[1] = this.p * ib; t3[2] = this.p * ie;
    return t3;
  }

  /** The element's current: collector current (into the collector terminal). */
  override current(c: Circuit): number { return this.terminal(c)[0]; }

  private acGm = 0; private acGc = 0; private acCbc = 0;
  override acPrepare(c: Circuit): void {
    this.charges(c, q4); // also evaluates the small-signal conductances at the OP
    this.acGm = this.gmBE; this.acGc = this.gcBC; this.acCbc = q4[3];
  }
  /**
   * Shot noise 2q·|IC| from collector to emitter and 2q·|IB| from base to emitter of the intrinsic transistor
   * (Schottky 1918; the hybrid-π noise model of Gray, Hurst, Lewis & Meyer, ch. 11), thermal noise of rb, rc, re.
   */
  override noise(c: Circuit, sink: NoiseSink): void {
    const vbe = this.p * (c.x[this.bi] - c.x[this.ei]);
    const vbc = this.p * (c.x[this.bi] - c.x[this.ci]);
    this.evaluate(vbe, vbc, c.vt, 0);
    const q2 = 2 * ELEMENTARY_CHARGE;
    sink.add(this.ci, this.ei, 1, q2 * Math.abs(this.IC), 0);
    sink.add(this.bi, this.ei, 1, q2 * Math.abs(this.IB), 0);
    const m = this.model, kT4 = 4 * c.kT;
    if (m.rb > 0) sink.add(this.b, this.bi, 1, kT4 / m.rb, 0);
    if (m.rc > 0) sink.add(this.c, this.ci, 1, kT4 / m.rc, 0);
    if (m.re > 0) sink.add(this.e, this.ei, 1, kT4 / m.re, 0);
  }
  override acCurrent(_c: Circuit, xr: Float64Array, xi: Float64Array, w: number, out: Float64Array): void {
    const vbeR = xr[this.bi] - xr[this.ei], vbeI = xi[this.bi] - xi[this.ei];
    const vbcR = xr[this.bi] - xr[this.ci], vbcI = xi[this.bi] - xi[this.ci];
    // ic = gm·vbe + gc·vbc − jωCbc·vbc
    out[0] = this.acGm * vbeR + this.acGc * vbcR + w * this.acCbc * vbcI;
    out[1] = this.acGm * vbeI + this.acGc * vbcI - w * this.acCbc * vbcR;
  }

  override info(c: Circuit): DeviceInfo {
    const t = this.terminal(c);
    const ic = t[0], ib = t[1], ie = t[2];
    const vbe = c.x[this.b] - c.x[this.e];
    const vce = c.x[this.c] - c.x[this.e];
    const vbeN = this.p * (c.x[this.bi] - c.x[this.ei]);
    const vbcN = this.p * (c.x[this.bi] - c.x[this.ci]);
    // "on" thresholds are common practice for silicon (0.5 V for B–E, 0.4 V for B–C)
    const beOn = vbeN > 0.5, bcOn = vbcN > 0.4;
    const region = beOn ? (bcOn ? "saturation" : "active") : bcOn ? "reverse" : "cutoff";
    return { kind: "bjt", ic, ib, ie, vbe, vce, power: ic * vce + ib * vbe, region };
  }
}

export const bjtKind = defineKind("bjt", z.object({
  kind: z.literal("bjt"), name, nodes: three, noiseless,
  polarity: z.enum(["npn", "pnp"]).default("npn"),
  model: z.strictObject({
    Is: positive().default(1e-14), betaF: positive().default(100), betaR: positive().default(1),
    VA: positive().nullable().default(null),
    Cje0: nonNegative().default(0), Vje: positive().default(0.75), mje: grading().default(0.33),
    Cjc0: nonNegative().default(0), Vjc: positive().default(0.75), mjc: grading().default(0.33),
    tauF: nonNegative().default(0), tauR: nonNegative().default(0),
    rb: nonNegative().default(0), rc: nonNegative().default(0), re: nonNegative().default(0),
  }).prefault({}),
}), {
  create: (e) => new Bjt(e.name, e.nodes, e.polarity, e.model),
  // base–emitter and base–collector junctions (gmin keeps each conducting at DC)
  dcPaths: (e) => [[e.nodes[1], e.nodes[2]], [e.nodes[1], e.nodes[0]]],
});
