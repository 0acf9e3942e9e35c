/**
 * Op-amp macro model, a behavioural reduction of the Boyle–Cohn–Pederson–Solomon structure (IEEE JSSC SC-9(6),
 * 1974; REFERENCES §3.1–3.2):
 *   vd = v(inp) − v(inn) + Vos drives a transconductance (1 S, or Imax·tanh(vd/Imax) with Imax = SR·C1 for the slew
 *   limit) into an internal node x loaded by G1 = 1/Aol and C1 = 1/(2π·GBW): vx = Aol·vd/(1 + s/ωp),
 *   ωp = 2π·GBW/Aol. Optional second pole: unit-gain stage into node y with C2 = 1/(2π·fp2).
 *   Output swing: smooth (softplus) clamps hold vx between vee+swingLow and vcc−swingHigh (they also stop wind-up).
 *   Output: ideal follower (Rout = 0, no current limit) or Norton iout = Ilim·tanh(u/(Rout·Ilim)), u = v(x|y) − v(out).
 *   The output current is drawn from the vcc pin when sourcing and from the vee pin when sinking (smooth split).
 *   Bias current Ib flows into each input.
 *   Noise (noise analysis only): an input voltage noise en in series with vd (white density noiseVoltage, V/√Hz, with
 *   a 1/f corner noiseVoltageCorner: en²(f) = noiseVoltage²·(1 + corner/f)) and an uncorrelated current noise in from
 *   each input to ground (noiseCurrent, A/√Hz, corner noiseCurrentCorner) — the usual op-amp noise model (Franco,
 *   "Design with Operational Amplifiers", noise chapter).
 * With Rout = 0, fp2 = null and no limits this is exactly Aol/(1 + s/ωp) with infinite input impedance.
 */
import { Builder, Circuit, Element, type DeviceInfo, MODE_TRAN, type NoiseSink } from "../circuit";
import { z } from "zod";
import { finite, name, node, noiseless, nonNegative, positive } from "../fields";
import { GROUND } from "../ground";
import { defineKind } from "../kind";
import { nodeOf } from "./linear";

export interface OpampModel {
  Aol: number; GBW: number; fp2: number | null; Rout: number; slewRate: number | null; Vos: number; Ib: number;
  swingHigh: number | null; swingLow: number | null; Iout: number | null;
  noiseVoltage: number; noiseVoltageCorner: number; noiseCurrent: number; noiseCurrentCorner: number;
}

/** clamp conductance (S) and knee width (V) of the swing limits */
const G_CLAMP = 1e3;
const W_CLAMP = 5e-3;
/** V beyond the swing limits at which the internal node is linearised at most (Newton limiting) */
const X_WINDOW = 0.2;
/** smoothing current (A) of the supply-pin split */
const EPS_SPLIT = 1e-6;

/**
 * Step limiting for a saturating (tanh) branch, in the spirit of junction limiting (Nagel 1975): a Newton step from
 * one saturated side lands far out on the other (the slope there is nearly zero), and the next comes back further
 * still; such a crossing is cut to the middle of the linear range. Returns the limited value; the caller flags non-convergence.
 */
function crossLimit(uNew: number, uOld: number, U: number): number {
  if ((uOld > U && uNew < -2 * U) || (uOld < -U && uNew > 2 * U)) return 0;
  return uNew;
}


/** softplus ln(1 + e^z) and its slope σ(z) from one exponential; slope left in `slope`. */
let slope = 0;
function softplus(z: number): number {
  const e = Math.exp(-Math.abs(z));
  slope = z >= 0 ? 1 / (1 + e) : e / (1 + e);
  return (z > 0 ? z : 0) + Math.log1p(e);
}

export class Opamp extends Element {
  private inp = 0; private inn = 0; private out = 0; private vcc = 0; private vee = 0;
  private nx = 0; private ny = 0; private k = -1;
  private readonly g1: number;
  private readonly c1: number;
  private readonly c2: number;
  private readonly imax: number;
  private readonly ideal: boolean;
  private readonly rout: number;
  private sx = 0; private sy = 0;
  // positions
  private pxInp = 0; private pxInn = 0; private pxx = 0; private pxVcc = 0; private pxVee = 0;
  private pyx = 0; private pyy = 0;
  private pOutK = 0; private pKOut = 0; private pKs = 0;
  private pOutOut = 0; private pOutS = 0;
  private pCccK = 0; private pCcOut = 0; private pCcS = 0; private pEeK = 0; private pEeOut = 0; private pEeS = 0;
  private src = 0; // index of the node the output follows (x or y)
  // previous linearisation of each nonlinear branch (value, slope, controlling voltage) for the convergence test
  private dI = 0; private dG = 1; private dV = 0;
  private hI = 0; private hG = 0; private hV = 0;
  private lI = 0; private lG = 0; private lV = 0;
  private oI = 0; private oG = 0; private oV = 0;

  constructor(name: string, private readonly nodeNames: readonly [string, string, string, string, string], private readonly model: OpampModel) {
    super(name, "opamp");
    this.g1 = 1 / model.Aol;
    this.c1 = 1 / (2 * Math.PI * model.GBW);
    this.c2 = model.fp2 === null ? 0 : 1 / (2 * Math.PI * model.fp2);
    this.imax = model.slewRate === null ? Infinity : model.slewRate * this.c1;
    this.ideal = model.Rout === 0 && model.Iout === null;
    this.rout = model.Rout > 0 ? model.Rout : 1e-3;
  }
  setup(b: Builder): void {
    const [a, bb, o, p, n] = this.nodeNames;
    this.inp = nodeOf(b, a); this.inn = nodeOf(b, bb); this.out = nodeOf(b, o);
    this.vcc = nodeOf(b, p); this.vee = nodeOf(b, n);
    this.nx = b.internalNode(`${this.name}:gain`);
    this.ny = this.model.fp2 === null ? this.nx : b.internalNode(`${this.name}:pole2`);
    if (this.ideal) this.k = b.branch(`opamp "${this.name}" output`);
  }
  bind(c: Circuit): void {
    this.inp = c.idx(this.inp); this.inn = c.idx(this.inn); this.out = c.idx(this.out);
    this.vcc = c.idx(this.vcc); this.vee = c.idx(this.vee);
    this.nx = c.idx(this.nx); this.ny = c.idx(this.ny);
    const x = this.nx;
    this.src = this.ny;
    this.pxInp = c.pos(x, this.inp); this.pxInn = c.pos(x, this.inn); this.pxx = c.pos(x, x);
    this.pxVcc = c.pos(x, this.vcc); this.pxVee = c.pos(x, this.vee);
    this.pyx = c.pos(this.ny, x); this.pyy = c.pos(this.ny, this.ny);
    const s = this.src;
    if (this.ideal) {
      this.k = c.idx(this.k);
      this.pOutK = c.pos(this.out, this.k); this.pKOut = c.pos(this.k, this.out); this.pKs = c.pos(this.k, s);
      this.pCccK = c.pos(this.vcc, this.k); this.pEeK = c.pos(this.vee, this.k);
    } else {
      this.pOutOut = c.pos(this.out, this.out); this.pOutS = c.pos(this.out, s);
      this.pCcOut = c.pos(this.vcc, this.out); this.pCcS = c.pos(this.vcc, s);
      this.pEeOut = c.pos(this.vee, this.out); this.pEeS = c.pos(this.vee, s);
    }
    this.sx = c.allocState(2);
    this.sy = this.sx + 1;
  }

  /** output current (A, out of the op-amp into the out pin) at u = v(x|y) − v(out) */
  private ioutOf(u: number): number {
    const lim = this.model.Iout;
    return lim === null ? u / this.rout : lim * Math.tanh(u / (this.rout * lim));
  }
  /** d(iout)/du */
  private ioutSlope(u: number): number {
    const lim = this.model.Iout;
    if (lim === null) return 1 / this.rout;
    const t = Math.tanh(u / (this.rout * lim));
    return (1 - t * t) / this.rout;
  }

  override loadStatic(m: Float64Array): void {
    m[this.pxx] += this.g1;
    if (this.ny !== this.nx) { m[this.pyy] += 1; m[this.pyx] -= 1; }
    if (this.ideal) { m[this.pOutK] += 1; m[this.pKOut] += 1; m[this.pKs] -= 1; }
  }
  load(c: Circuit): void {
    const m = c.mat, x = c.x, rhs = c.rhs, mod = this.model;
    const nx = this.nx;
    // input bias currents leave the input nodes into the op-amp
    if (mod.Ib !== 0) { rhs[this.inp] -= mod.Ib; rhs[this.inn] -= mod.Ib; }
    // drive: current idrv(vd) into node x
    let vd = x[this.inp] - x[this.inn] + mod.Vos;
    let idrv = vd, gd = 1;
    if (this.imax !== Infinity) {
      const lim = crossLimit(vd, this.dV, this.imax);
      if (lim !== vd) { vd = lim; c.noncon++; }
      const t = Math.tanh(vd / this.imax);
      idrv = this.imax * t;
      gd = 1 - t * t;
    }
    c.checkCurrent(idrv, this.dI + this.dG * (vd - this.dV));
    this.dI = idrv; this.dG = gd; this.dV = vd;
    m[this.pxInp] -= gd; m[this.pxInn] += gd;
    rhs[nx] += idrv - gd * (vd - mod.Vos);
    // swing clamps on vx, relative to the supply pins. A Newton step can throw vx to Aol·vd (kilovolts) because the
    // far clamp is invisible to the linearisation; like junction limiting (Nagel 1975), the clamps are linearised
    // no further than X_WINDOW outside the swing range, and such an iteration is not accepted as converged.
    // (Skipped while the supplies leave no room between the limits, e.g. at the start of source stepping.)
    let vx = x[nx];
    const top = mod.swingHigh === null ? Infinity : x[this.vcc] - mod.swingHigh + X_WINDOW;
    const bottom = mod.swingLow === null ? -Infinity : x[this.vee] + mod.swingLow - X_WINDOW;
    if (bottom < top) {
      if (vx > top) { vx = top; c.noncon++; }
      else if (vx < bottom) { vx = bottom; c.noncon++; }
    }
    if (mod.swingHigh !== null) {
      const z = (vx - (x[this.vcc] - mod.swingHigh)) / W_CLAMP;
      const i = G_CLAMP * W_CLAMP * softplus(z);
      const g = G_CLAMP * slope;
      const v = vx - x[this.vcc];
      c.checkCurrent(i, this.hI + this.hG * (v - this.hV));
      this.hI = i; this.hG = g; this.hV = v;
      m[this.pxx] += g; m[this.pxVcc] -= g;
      rhs[nx] -= i - g * (vx - x[this.vcc]);
    }
    if (mod.swingLow !== null) {
      const z = (x[this.vee] + mod.swingLow - vx) / W_CLAMP;
      const i = -G_CLAMP * W_CLAMP * softplus(z);
      const g = G_CLAMP * slope;
      const v = vx - x[this.vee];
      c.checkCurrent(i, this.lI + this.lG * (v - this.lV));
      this.lI = i; this.lG = g; this.lV = v;
      m[this.pxx] += g; m[this.pxVee] -= g;
      rhs[nx] -= i - g * (vx - x[this.vee]);
    }
    if (c.mode === MODE_TRAN) {
      const ix = c.integrate(this.sx, this.c1 * vx);
      const gx = c.ag0 * this.c1;
      m[this.pxx] += gx;
      rhs[nx] -= ix - gx * vx;
      if (this.ny !== nx) {
        const vy = x[this.ny];
        const iy = c.integrate(this.sy, this.c2 * vy);
        const gy = c.ag0 * this.c2;
        m[this.pyy] += gy;
        rhs[this.ny] -= iy - gy * vy;
      }
    }
    // output stage and supply-pin currents
    if (this.ideal) {
      const k = this.k;
      const iout = -x[k];
      const sq = Math.sqrt(iout * iout + EPS_SPLIT * EPS_SPLIT);
      const ipos = 0.5 * (iout + sq), ineg = 0.5 * (iout - sq);
      const dpos = 0.5 * (1 + iout / sq), dneg = 0.5 * (1 - iout / sq);
      // d(iout)/d(x_k) = −1
      m[this.pCccK] -= dpos; rhs[this.vcc] -= ipos - dpos * iout;
      m[this.pEeK] -= dneg; rhs[this.vee] -= ineg - dneg * iout;
    } else {
      const s = this.src, out = this.out;
      let u = x[s] - x[out];
      if (mod.Iout !== null) {
        const lim = crossLimit(u, this.oV, this.rout * mod.Iout);
        if (lim !== u) { u = lim; c.noncon++; }
      }
      const iout = this.ioutOf(u), g = this.ioutSlope(u);
      c.checkCurrent(iout, this.oI + this.oG * (u - this.oV));
      this.oI = iout; this.oG = g; this.oV = u;
      // KCL at out: current leaving = −iout
      m[this.pOutOut] += g; m[this.pOutS] -= g;
      rhs[out] -= -iout + g * u;
      const sq = Math.sqrt(iout * iout + EPS_SPLIT * EPS_SPLIT);
      const ipos = 0.5 * (iout + sq), ineg = 0.5 * (iout - sq);
      const dpos = 0.5 * (1 + iout / sq) * g, dneg = 0.5 * (1 - iout / sq) * g;
      m[this.pCcS] += dpos; m[this.pCcOut] -= dpos; rhs[this.vcc] -= ipos - dpos * u;
      m[this.pEeS] += dneg; m[this.pEeOut] -= dneg; rhs[this.vee] -= ineg - dneg * u;
    }
  }
  override initState(c: Circuit): void {
    c.q1[this.sx] = this.c1 * c.x[this.nx];
    c.q1[this.sy] = this.c2 * c.x[this.ny];
    c.i1[this.sx] = 0; c.i1[this.sy] = 0;
  }
  override loadCap(_c: Circuit, cap: Float64Array): void {
    cap[this.pxx] += this.c1;
    if (this.ny !== this.nx) cap[this.pyy] += this.c2;
  }
  /** The element's current: output current, out of the op-amp into the out pin. */
  override current(c: Circuit): number {
    return this.ideal ? -c.x[this.k] : this.ioutOf(c.x[this.src] - c.x[this.out]);
  }
  private acG = 0;
  override acPrepare(c: Circuit): void {
    if (!this.ideal) this.acG = this.ioutSlope(c.x[this.src] - c.x[this.out]);
  }
  /** en enters as the drive's slope × en into node x (the drive is d·vd, vd = v(inp) − v(inn) + Vos + en); in at each input */
  override noise(c: Circuit, sink: NoiseSink): void {
    const m = this.model;
    if (m.noiseVoltage > 0) sink.add(this.nx, c.n, this.dG, m.noiseVoltage * m.noiseVoltage, m.noiseVoltageCorner);
    if (m.noiseCurrent > 0) {
      const s = m.noiseCurrent * m.noiseCurrent;
      sink.add(this.inp, c.n, 1, s, m.noiseCurrentCorner);
      sink.add(this.inn, c.n, 1, s, m.noiseCurrentCorner);
    }
  }
  override acCurrent(_c: Circuit, xr: Float64Array, xi: Float64Array, _w: number, out: Float64Array): void {
    if (this.ideal) { out[0] = -xr[this.k]; out[1] = -xi[this.k]; return; }
    const g = this.acG;
    out[0] = g * (xr[this.src] - xr[this.out]);
    out[1] = g * (xi[this.src] - xi[this.out]);
  }
  override info(c: Circuit): DeviceInfo {
    const mod = this.model, x = c.x;
    const vx = x[this.nx];
    const vd = x[this.inp] - x[this.inn] + mod.Vos;
    let limiting = false;
    // a swing clamp counts as limiting once it carries more than 1 µA of the (1 S) drive, i.e. it holds the internal
    // stage against more than 1 µV of input error
    if (mod.swingHigh !== null && G_CLAMP * W_CLAMP * softplus((vx - (x[this.vcc] - mod.swingHigh)) / W_CLAMP) > 1e-6) limiting = true;
    if (mod.swingLow !== null && G_CLAMP * W_CLAMP * softplus((x[this.vee] + mod.swingLow - vx) / W_CLAMP) > 1e-6) limiting = true;
    if (this.imax !== Infinity && Math.abs(vd) > this.imax) limiting = true;
    if (!this.ideal && mod.Iout !== null && Math.abs(x[this.src] - x[this.out]) > this.rout * mod.Iout) limiting = true;
    return { kind: "opamp", vout: x[this.out], iout: this.current(c), limiting };
  }
}

export const opampKind = defineKind("opamp", z.object({
  kind: z.literal("opamp"), name, nodes: z.tuple([node, node, node, node, node]), noiseless,
  model: z.strictObject({
    Aol: positive().default(1e5), GBW: positive().default(1e6), fp2: positive().nullable().default(null),
    Rout: nonNegative().default(0), slewRate: positive().nullable().default(null), Vos: finite().default(0),
    Ib: finite().default(0), swingHigh: finite().nullable().default(null), swingLow: finite().nullable().default(null),
    Iout: positive().nullable().default(null),
    /** V/√Hz: white input voltage noise density (0 = none) */
    noiseVoltage: nonNegative().default(0),
    /** Hz: 1/f corner of the input voltage noise (0 = white) */
    noiseVoltageCorner: nonNegative().default(0),
    /** A/√Hz: white input current noise density at each input (0 = none) */
    noiseCurrent: nonNegative().default(0),
    /** Hz: 1/f corner of the input current noise (0 = white) */
    noiseCurrentCorner: nonNegative().default(0),
  }).prefault({}),
}), {
  create: (e) => new Opamp(e.name, e.nodes, e.model),
  // the output is driven from ground's side (the macro model's output stage)
  dcPaths: (e) => [[e.nodes[2], GROUND]],
  // an ideal output (no Rout, no current limit) fixes the output voltage
  voltageBranches: (e) => (e.model.Rout === 0 && e.model.Iout === null ? [[e.nodes[2], GROUND]] : []),
});
