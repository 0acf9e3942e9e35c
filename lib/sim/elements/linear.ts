/**
 * Linear elements: R, C, L, independent sources, controlled sources, the timed switch.
 * Stamps: REFERENCES §2.1 (Ho et al. 1975; Vlach & Singhal 1994). Companion models: REFERENCES §2.2.
 */
import { Builder, Circuit, Element, MODE_TRAN, type NoiseSink, stampG } from "../circuit";
import type { Wave } from "../fields";
import { isGround } from "../ground";
import { waveBreakpoints, waveMaxStep, waveValue } from "../waves";

/** Placeholder for a user node (ground → -1). */
export function nodeOf(b: Builder, name: string): number {
  return b.node(name, isGround(name));
}

abstract class TwoTerminal extends Element {
  protected a = 0;
  protected b = 0;
  protected paa = 0; protected pab = 0; protected pba = 0; protected pbb = 0;
  constructor(name: string, kind: string, protected readonly nodeNames: readonly [string, string]) {
    super(name, kind);
  }
  setup(bd: Builder): void {
    this.a = nodeOf(bd, this.nodeNames[0]);
    this.b = nodeOf(bd, this.nodeNames[1]);
  }
  bind(c: Circuit): void {
    this.a = c.idx(this.a);
    this.b = c.idx(this.b);
    this.paa = c.pos(this.a, this.a); this.pab = c.pos(this.a, this.b);
    this.pba = c.pos(this.b, this.a); this.pbb = c.pos(this.b, this.b);
  }
  protected v(c: Circuit): number { return c.x[this.a] - c.x[this.b]; }
}

export class Resistor extends TwoTerminal {
  private readonly g: number;
  constructor(name: string, nodes: readonly [string, string], value: number) {
    super(name, "resistor", nodes);
    this.g = 1 / value;
  }
  override readonly dynamic = false;
  load(): void {}
  override loadStatic(m: Float64Array): void { stampG(m, this.paa, this.pab, this.pba, this.pbb, this.g); }
  override current(c: Circuit): number { return this.v(c) * this.g; }
  /** thermal noise current 4kT/R, A²/Hz (Johnson 1928, Nyquist 1928) */
  override noise(c: Circuit, sink: NoiseSink): void { sink.add(this.a, this.b, 1, 4 * c.kT * this.g, 0); }
  override acCurrent(_c: Circuit, xr: Float64Array, xi: Float64Array, _w: number, out: Float64Array): void {
    out[0] = (xr[this.a] - xr[this.b]) * this.g;
    out[1] = (xi[this.a] - xi[this.b]) * this.g;
  }
}

export class Capacitor extends TwoTerminal {
  private s = 0;
  constructor(name: string, nodes: readonly [string, string], private readonly cap: number, private readonly ic: number) {
    super(name, "capacitor", nodes);
  }
  override bind(c: Circuit): void { super.bind(c); this.s = c.allocState(1); }
  load(c: Circuit): void {
    if (c.mode !== MODE_TRAN) return;
    const v = this.v(c);
    const i = c.integrate(this.s, this.cap * v);
    const geq = c.ag0 * this.cap;
    const ceq = i - geq * v;
    stampG(c.mat, this.paa, this.pab, this.pba, this.pbb, geq);
    c.rhs[this.a] -= ceq;
    c.rhs[this.b] += ceq;
  }
  override loadCap(_c: Circuit, cap: Float64Array): void { stampG(cap, this.paa, this.pab, this.pba, this.pbb, this.cap); }
  override initState(c: Circuit, fromIc: boolean): void {
    c.q1[this.s] = this.cap * (fromIc ? this.ic : this.v(c));
    c.i1[this.s] = 0;
  }
  override current(c: Circuit): number { return c.mode === MODE_TRAN ? c.i0[this.s] : 0; }
  override acCurrent(_c: Circuit, xr: Float64Array, xi: Float64Array, w: number, out: Float64Array): void {
    const wc = w * this.cap;
    out[0] = -(xi[this.a] - xi[this.b]) * wc;
    out[1] = (xr[this.a] - xr[this.b]) * wc;
  }
  /** a capacitor to ground fixes its node's voltage (a floating one leaves both nodes to the first step) */
  override applyInitialCondition(c: Circuit): void {
    if (this.b === c.n && this.a !== c.n) c.x[this.a] = this.ic;
    else if (this.a === c.n && this.b !== c.n) c.x[this.b] = -this.ic;
  }
}

/** Elements with a branch-current unknown k and the voltage-source KCL pattern. */
abstract class BranchElement extends TwoTerminal {
  protected k = 0;
  protected pak = 0; protected pbk = 0; protected pka = 0; protected pkb = 0; protected pkk = 0;
  override setup(bd: Builder): void {
    super.setup(bd);
    this.k = bd.branch(`${this.kind} "${this.name}"`);
  }
  override bind(c: Circuit): void {
    super.bind(c);
    this.k = c.idx(this.k);
    this.pak = c.pos(this.a, this.k); this.pbk = c.pos(this.b, this.k);
    this.pka = c.pos(this.k, this.a); this.pkb = c.pos(this.k, this.b); this.pkk = c.pos(this.k, this.k);
  }
  override loadStatic(m: Float64Array): void {
    m[this.pak] += 1; m[this.pbk] -= 1; m[this.pka] += 1; m[this.pkb] -= 1;
  }
  override current(c: Circuit): number { return c.x[this.k]; }
  override branchIndex(): number { return this.k; }
  override acCurrent(_c: Circuit, xr: Float64Array, xi: Float64Array, _w: number, out: Float64Array): void {
    out[0] = xr[this.k]; out[1] = xi[this.k];
  }
}

export class Inductor extends BranchElement {
  private s = 0;
  constructor(name: string, nodes: readonly [string, string], private readonly ind: number, private readonly ic: number) {
    super(name, "inductor", nodes);
  }
  // The flux's derivative is the inductor's voltage: its truncation-error floor is a voltage (vntol), not abstol,
  // an ampere figure that would ask a small inductor carrying microamperes for picovolt accuracy.
  override bind(c: Circuit): void { super.bind(c); this.s = c.allocState(1, c.tol.vntol); }
  load(c: Circuit): void {
    if (c.mode !== MODE_TRAN) return;
    const i = c.x[this.k];
    const v = c.integrate(this.s, this.ind * i); // flux φ = L·i, v = dφ/dt
    const req = c.ag0 * this.ind;
    c.mat[this.pkk] -= req;
    c.rhs[this.k] += v - req * i;
  }
  override loadCap(_c: Circuit, cap: Float64Array): void { cap[this.pkk] -= this.ind; }
  override initState(c: Circuit, fromIc: boolean): void {
    if (fromIc) c.x[this.k] = this.ic;
    c.q1[this.s] = this.ind * c.x[this.k];
    c.i1[this.s] = 0;
  }
}

/** AC excitation of an independent source as (real, imaginary) from its magnitude and phase in degrees. */
function acPhasor(ac: number, phaseDeg: number): [number, number] {
  const rad = (phaseDeg * Math.PI) / 180;
  return [ac * Math.cos(rad), ac * Math.sin(rad)];
}

/** Present value of an independent source: the DC-sweep value, else its wave in a transient, else its DC value. */
function sourceValue(sweepValue: number, wave: Wave | null, dc: number, c: Circuit): number {
  if (sweepValue === sweepValue) return sweepValue; // not NaN: a DC sweep holds the value
  return c.useWaves && wave !== null ? waveValue(wave, c.time) : dc;
}

export class VSource extends BranchElement {
  /** value that replaces `dc` during a DC sweep, NaN when none */
  private sweepValue = NaN;
  /** largest step (s) the wave allows */
  private readonly stepBound: number;
  override readonly acExcitation: Float64Array;
  constructor(name: string, nodes: readonly [string, string], private readonly dc: number, ac: number, acPhaseDeg: number, private readonly wave: Wave | null) {
    super(name, "vsource", nodes);
    this.acExcitation = Float64Array.from(acPhasor(ac, acPhaseDeg));
    this.stepBound = wave ? waveMaxStep(wave) : Infinity;
  }
  override setSweepValue(v: number | null): void { this.sweepValue = v ?? NaN; }
  value(c: Circuit): number {
    return sourceValue(this.sweepValue, this.wave, this.dc, c);
  }
  load(c: Circuit): void {
    c.rhs[this.k] += this.value(c) * c.srcScale;
  }
  override loadAc(_c: Circuit, br: Float64Array, bi: Float64Array): void { br[this.k] += this.acExcitation[0]; bi[this.k] += this.acExcitation[1]; }
  override breakpoints(tStop: number, out: number[]): void { if (this.wave) waveBreakpoints(this.wave, tStop, out); }
  /** a periodic wave bounds the step to a fraction of its period (waves.ts) */
  override maxStepAt(): number { return this.stepBound; }
}

export class ISource extends TwoTerminal {
  /** value that replaces `dc` during a DC sweep, NaN when none */
  private sweepValue = NaN;
  /** largest step (s) the wave allows */
  private readonly stepBound: number;
  override readonly acExcitation: Float64Array;
  constructor(name: string, nodes: readonly [string, string], private readonly dc: number, ac: number, acPhaseDeg: number, private readonly wave: Wave | null) {
    super(name, "isource", nodes);
    this.acExcitation = Float64Array.from(acPhasor(ac, acPhaseDeg));
    this.stepBound = wave ? waveMaxStep(wave) : Infinity;
  }
  override setSweepValue(v: number | null): void { this.sweepValue = v ?? NaN; }
  value(c: Circuit): number {
    return sourceValue(this.sweepValue, this.wave, this.dc, c);
  }
  load(c: Circuit): void {
    const i = this.value(c) * c.srcScale;
    c.rhs[this.a] -= i;
    c.rhs[this.b] += i;
  }
  override loadAc(_c: Circuit, br: Float64Array, bi: Float64Array): void {
    const [re, im] = this.acExcitation;
    br[this.a] -= re; bi[this.a] -= im;
    br[this.b] += re; bi[this.b] += im;
  }
  override current(c: Circuit): number { return this.value(c) * c.srcScale; }
  override acCurrent(_c: Circuit, _xr: Float64Array, _xi: Float64Array, _w: number, out: Float64Array): void {
    out[0] = this.acExcitation[0]; out[1] = this.acExcitation[1];
  }
  override breakpoints(tStop: number, out: number[]): void { if (this.wave) waveBreakpoints(this.wave, tStop, out); }
  /** a periodic wave bounds the step to a fraction of its period (waves.ts) */
  override maxStepAt(): number { return this.stepBound; }
}

export class Vcvs extends BranchElement {
  private cp = 0; private cn = 0; private pkc = 0; private pkd = 0;
  constructor(name: string, nodes: readonly [string, string], private readonly control: readonly [string, string], private readonly gain: number) {
    super(name, "vcvs", nodes);
  }
  override setup(bd: Builder): void {
    super.setup(bd);
    this.cp = nodeOf(bd, this.control[0]);
    this.cn = nodeOf(bd, this.control[1]);
  }
  override bind(c: Circuit): void {
    super.bind(c);
    this.cp = c.idx(this.cp); this.cn = c.idx(this.cn);
    this.pkc = c.pos(this.k, this.cp); this.pkd = c.pos(this.k, this.cn);
  }
  override readonly dynamic = false;
  load(): void {}
  override loadStatic(m: Float64Array): void {
    super.loadStatic(m);
    m[this.pkc] -= this.gain;
    m[this.pkd] += this.gain;
  }
}

export class Vccs extends TwoTerminal {
  private cp = 0; private cn = 0; private pac = 0; private pad = 0; private pbc = 0; private pbd = 0;
  constructor(name: string, nodes: readonly [string, string], private readonly control: readonly [string, string], private readonly gm: number) {
    super(name, "vccs", nodes);
  }
  override setup(bd: Builder): void {
    super.setup(bd);
    this.cp = nodeOf(bd, this.control[0]);
    this.cn = nodeOf(bd, this.control[1]);
  }
  override bind(c: Circuit): void {
    super.bind(c);
    this.cp = c.idx(this.cp); this.cn = c.idx(this.cn);
    this.pac = c.pos(this.a, this.cp); this.pad = c.pos(this.a, this.cn);
    this.pbc = c.pos(this.b, this.cp); this.pbd = c.pos(this.b, this.cn);
  }
  override readonly dynamic = false;
  load(): void {}
  override loadStatic(m: Float64Array): void {
    m[this.pac] += this.gm; m[this.pad] -= this.gm; m[this.pbc] -= this.gm; m[this.pbd] += this.gm;
  }
  override current(c: Circuit): number { return this.gm * (c.x[this.cp] - c.x[this.cn]); }
  override acCurrent(_c: Circuit, xr: Float64Array, xi: Float64Array, _w: number, out: Float64Array): void {
    out[0] = this.gm * (xr[this.cp] - xr[this.cn]);
    out[1] = this.gm * (xi[this.cp] - xi[this.cn]);
  }
}

/**
 * A switch whose resistance follows a schedule; each change of state moves the resistance log-linearly from the old
 * to the new value over `transition` seconds (a smooth, differentiable-in-time change that Newton follows).
 */
export class Switch extends TwoTerminal {
  private readonly times: Float64Array;
  private readonly on: Uint8Array;
  private readonly lnOn: number;
  private readonly lnOff: number;
  private readonly tr: number;
  constructor(name: string, nodes: readonly [string, string], ron: number, roff: number, schedule: readonly (readonly [number, "on" | "off"])[], transition: number) {
    super(name, "switch", nodes);
    this.times = Float64Array.from(schedule.map((s) => s[0]));
    this.on = Uint8Array.from(schedule.map((s) => (s[1] === "on" ? 1 : 0)));
    this.lnOn = Math.log(ron);
    this.lnOff = Math.log(roff);
    this.tr = Math.max(transition, 1e-9);
  }
  /** conductance at time t, S */
  conductance(t: number): number {
    let ln = this.lnOff;
    for (let i = 0; i < this.times.length; i++) {
      const t0 = this.times[i];
      const target = this.on[i] ? this.lnOn : this.lnOff;
      if (t0 <= 0) { ln = target; continue; }
      if (t < t0) break;
      if (t >= t0 + this.tr) { ln = target; continue; }
      const f = (t - t0) / this.tr;
      ln = ln + (target - ln) * f;
      break;
    }
    return Math.exp(-ln);
  }
  load(c: Circuit): void {
    stampG(c.mat, this.paa, this.pab, this.pba, this.pbb, this.conductance(c.time));
  }
  override current(c: Circuit): number { return this.v(c) * this.conductance(c.time); }
  private acG = 0;
  override acPrepare(c: Circuit): void { this.acG = this.conductance(c.time); }
  override acCurrent(_c: Circuit, xr: Float64Array, xi: Float64Array, _w: number, out: Float64Array): void {
    const g = this.acG;
    out[0] = (xr[this.a] - xr[this.b]) * g;
    out[1] = (xi[this.a] - xi[this.b]) * g;
  }
  override loadCap(): void {}
  override breakpoints(tStop: number, out: number[]): void {
    for (let i = 0; i < this.times.length; i++) {
      const t0 = this.times[i];
      if (t0 > 0 && t0 <= tStop) out.push(t0);
      if (t0 > 0 && t0 + this.tr <= tStop) out.push(t0 + this.tr);
    }
  }
  override maxStepAt(t: number): number {
    for (let i = 0; i < this.times.length; i++) {
      const t0 = this.times[i];
      if (t0 > 0 && t >= t0 - 1e-15 && t < t0 + this.tr) return this.tr / 8;
    }
    return Infinity;
  }
}
