/**
 * The compiled circuit: unknown numbering, the preallocated MNA matrix and vectors, integration state, and the
 * element instances with their stamp positions. Built once per topology; every Newton iteration restamps values in
 * place. MNA formulation: Ho, Ruehli & Brennan, "The modified nodal approach to network analysis",
 * IEEE Trans. Circuits Syst. CAS-22(6), 1975.
 *
 * Storage: row-major dense (n+1)×(n+1) with stride n+1. Index n is a spare "ground" row/column: stamps that touch
 * ground land there and are ignored, so element code needs no branches for grounded terminals.
 */
import type { SimTolerances } from "./schema";
import { StaticLU } from "./sparse";
import { checkpoint } from "./checkpoint";
import { SimError } from "./errors";

/** Boltzmann constant, J/K (exact in the 2019 SI). */
export const BOLTZMANN = 1.380649e-23;
/** Elementary charge, C (exact in the 2019 SI). */
export const ELEMENTARY_CHARGE = 1.602176634e-19;

/**
 * Where the noise analysis collects an element's noise sources (analysis/noise.ts). Each source is a current
 * gain·n(t) entering unknown `into` and leaving unknown `from` (either may be c.n, ground), where n has the one-sided
 * power spectral density white·(1 + corner/f) (units²/Hz; corner 0 = white). Sources are uncorrelated.
 */
export interface NoiseSink {
  add(into: number, from: number, gain: number, white: number, corner: number): void;
}

export const MODE_DC = 0;
export const MODE_TRAN = 1;

/** Operating information reported for a device (see DeviceInfo in index.ts). */
export type DeviceInfo =
  | { kind: "bjt"; ic: number; ib: number; ie: number; vbe: number; vce: number; power: number; region: "active" | "saturation" | "cutoff" | "reverse" }
  | { kind: "mosfet"; id: number; vgs: number; vds: number; power: number; region: "cutoff" | "triode" | "saturation" }
  | { kind: "opamp"; vout: number; iout: number; limiting: boolean }
  | { kind: "diode"; id: number; vd: number; power: number };

/** Allocates unknowns while elements are set up. */
export class Builder {
  readonly nodeIndex = new Map<string, number>();
  readonly nodeNames: string[] = [];
  readonly internal: string[] = [];
  readonly branches: string[] = [];
  /** Index of a user node; ground is -1 until `resolve`. */
  node(name: string, isGround: boolean): number {
    if (isGround) return -1;
    let i = this.nodeIndex.get(name);
    if (i === undefined) {
      i = this.nodeNames.length;
      this.nodeIndex.set(name, i);
      this.nodeNames.push(name);
    }
    return i;
  }
  /** A hidden internal node; returned as a negative placeholder resolved later. */
  internalNode(label: string): number {
    this.internal.push(label);
    return -1000 - (this.internal.length - 1);
  }
  /** A branch-current unknown (voltage sources, inductors, ideal outputs). */
  branch(label: string): number {
    this.branches.push(label);
    return -1_000_000 - (this.branches.length - 1);
  }
}

export abstract class Element {
  constructor(readonly name: string, readonly kind: string) {}
  /** Allocate unknowns (user nodes, internal nodes, branches). */
  abstract setup(b: Builder): void;
  /** Turn placeholders into indices, compute matrix positions and state slots. */
  abstract bind(c: Circuit): void;
  /** Stamp the linearised element at c.x into c.mat / c.rhs (Newton companion, plus integration when MODE_TRAN).
   *  Only what changes between iterations: constant entries go in loadStatic. */
  abstract load(c: Circuit): void;
  /** false when load() does nothing (everything is in loadStatic), so the Newton loop skips the element */
  readonly dynamic: boolean = true;
  /** Stamp the matrix entries that never change (linear, time-invariant parts); called once per topology. */
  loadStatic(_m: Float64Array): void {}
  /** Stamp dq/dv at the operating point into `cap` (same positions as c.mat) for AC. */
  loadCap(_c: Circuit, _cap: Float64Array): void {}
  /** Cache small-signal values at the operating point in c.x before an AC sweep (used by acCurrent). */
  acPrepare(_c: Circuit): void {}
  /** true: the element adds no noise sources (netlist field `noiseless`) */
  noiseless = false;
  /** Report the element's noise sources at the operating point (called after acPrepare; see NoiseSink). */
  noise(_c: Circuit, _sink: NoiseSink): void {}
  /** Index of the element's branch-current unknown (voltage sources, inductors), or -1. */
  branchIndex(): number { return -1; }
  /** Add this element's AC excitation to the right-hand side. */
  loadAc(_c: Circuit, _br: Float64Array, _bi: Float64Array): void {}
  /** Element current at c.x (positive from nodes[0] through the element to nodes[1]). */
  current(_c: Circuit): number { return 0; }
  /** AC current (same sign convention) given the complex solution; writes [re, im] into out. */
  acCurrent(_c: Circuit, _xr: Float64Array, _xi: Float64Array, _omega: number, out: Float64Array): void { out[0] = 0; out[1] = 0; }
  info(_c: Circuit): DeviceInfo | null { return null; }
  /** Push times (s, within (0, tStop]) where the element's stimulus has a corner. */
  breakpoints(_tStop: number, _out: number[]): void {}
  /** Set the integration state from c.x at the start of a transient (`fromIc`: use the elements' ic values). */
  initState(_c: Circuit, _fromIc: boolean): void {}
  /** Largest step (s) allowed at time t (e.g. inside a switch transition); Infinity for none. */
  maxStepAt(_t: number): number { return Infinity; }
  /** Start from initial conditions: write the unknowns the element's initial condition fixes into c.x (before
   *  initState; e.g. a grounded capacitor's node voltage). */
  applyInitialCondition(_c: Circuit): void {}
  /** Independent sources: their AC excitation [re, im], which loadAc stamps; a multi-excitation AC run replaces it
   *  for one set and restores it afterwards. null for every other element. */
  readonly acExcitation: Float64Array | null = null;
  /** DC sweep: hold the element's value at v instead of its dc (null: back to dc). Only independent sources sweep. */
  setSweepValue(_v: number | null): void {
    throw new SimError("invalid", `${this.kind} "${this.name}" cannot be swept (only a vsource or isource)`);
  }
}

export class Circuit {
  /** number of unknowns */
  readonly n: number;
  readonly stride: number;
  /** unknowns 0..numNodes-1 are node voltages (user then internal), the rest branch currents */
  readonly numNodes: number;
  readonly mat: Float64Array;
  readonly rhs: Float64Array;
  x: Float64Array;
  xNew: Float64Array;
  readonly diag: Int32Array;
  /** structural non-zeros: every position requested through pos() */
  readonly structure: Uint8Array;
  /** the matrix before factorisation (restored when the pivot order must be recomputed) */
  readonly matBackup: Float64Array;
  /** LU with a reusable pivot order and fill pattern */
  readonly lu: StaticLU;
  readonly unknownNames: string[];
  readonly userNodeNames: string[];
  readonly elements: Element[];
  /** elements whose load() stamps something each iteration */
  readonly dynamicElements: Element[];
  /** constant matrix entries (linear, time-invariant stamps), copied in before each load */
  readonly staticMat: Float64Array;
  /** positions of the spare ground row and column (reset before each load) */
  readonly trash: Int32Array;
  readonly tol: SimTolerances;
  /** thermal voltage kT/q, V */
  readonly vt: number;
  /** kT at the netlist's temperature, J */
  readonly kT: number;

  mode = MODE_DC;
  time = 0;
  /** sources follow their waves at c.time (transient and its initial operating point) instead of `dc` */
  useWaves = false;
  /** scale of every independent source (source stepping) */
  srcScale = 1;
  /** extra conductance from every node to ground (gmin stepping), S */
  gshunt = 0;
  /** incremented by a device whose voltages were limited in this load */
  noncon = 0;
  /** integration: iq = ag0·(q − q1) − trap·i1 */
  ag0 = 0;
  trap = 0;

  /** integration state: q0/i0 this step, q1/i1 last accepted, q2/q3 older (for truncation error) */
  nState = 0;
  q0 = new Float64Array(0);
  q1 = new Float64Array(0);
  q2 = new Float64Array(0);
  q3 = new Float64Array(0);
  i0 = new Float64Array(0);
  i1 = new Float64Array(0);
  /**
   * Each state's absolute floor in the truncation-error tolerance, in the units of its derivative: abstol (A) for a
   * charge, whose derivative is a current; vntol (V) for an inductor's flux, whose derivative is a voltage.
   */
  stateAbsTol = new Float64Array(0);
  private readonly stateFloors: number[] = [];

  /** a singular matrix at the next Newton iteration is reported as the circuit's fault (first iteration only) */
  strictSingular = true;
  /** set when the last Newton run failed: index of the unknown with the largest normalised update, or -1 */
  worstUnknown = -1;
  /** message of the last singular matrix met inside a Newton run (reported if every strategy fails) */
  singularAt = "";
  /** which DC method produced the last operating point */
  dcMethod: "newton" | "damped" | "gmin" | "source" = "newton";
  /** work counters */
  newtonIterations = 0;
  deadline = Infinity;
  shouldStop: (() => boolean) | undefined;

  constructor(b: Builder, elements: Element[], tol: SimTolerances, tempC: number) {
    const nUser = b.nodeNames.length;
    this.numNodes = nUser + b.internal.length;
    this.n = this.numNodes + b.branches.length;
    this.stride = this.n + 1;
    this.mat = new Float64Array(this.stride * this.stride);
    this.rhs = new Float64Array(this.stride);
    this.x = new Float64Array(this.stride);
    this.xNew = new Float64Array(this.stride);
    this.structure = new Uint8Array(this.stride * this.stride);
    this.matBackup = new Float64Array(this.stride * this.stride);
    this.diag = new Int32Array(this.numNodes);
    for (let i = 0; i < this.numNodes; i++) this.diag[i] = this.pos(i, i);
    this.userNodeNames = b.nodeNames.slice();
    this.unknownNames = [
      ...b.nodeNames.map((s) => `node "${s}"`),
      ...b.internal.map((s) => `internal node ${s}`),
      ...b.branches.map((s) => `branch current of ${s}`),
    ];
    this.elements = elements;
    this.tol = tol;
    // 2019 SI exact constants: k = 1.380649e-23 J/K, q = 1.602176634e-19 C.
    this.kT = BOLTZMANN * (tempC + 273.15);
    this.vt = this.kT / ELEMENTARY_CHARGE;
    for (const el of elements) el.bind(this);
    this.lu = new StaticLU(this.n, this.stride, this.structure);
    this.lu.poll = () => checkpoint(this);
    this.staticMat = new Float64Array(this.stride * this.stride);
    for (const el of elements) el.loadStatic(this.staticMat);
    this.dynamicElements = elements.filter((e) => e.dynamic);
    const trash: number[] = [];
    for (let i = 0; i <= this.n; i++) { trash.push(this.n * this.stride + i); if (i < this.n) trash.push(i * this.stride + this.n); }
    this.trash = Int32Array.from(trash);
    this.q0 = new Float64Array(this.nState);
    this.q1 = new Float64Array(this.nState);
    this.q2 = new Float64Array(this.nState);
    this.q3 = new Float64Array(this.nState);
    this.i0 = new Float64Array(this.nState);
    this.i1 = new Float64Array(this.nState);
    this.stateAbsTol = Float64Array.from(this.stateFloors);
  }

  /** Resolve a Builder placeholder to an unknown index (ground → n, the spare slot). */
  idx(p: number): number {
    const nUser = this.userNodeNames.length;
    if (p === -1) return this.n;
    if (p <= -1_000_000) return this.numNodes + (-1_000_000 - p);
    if (p <= -1000) return nUser + (-1000 - p);
    return p;
  }
  /** Matrix position of (row, col). */
  pos(r: number, c: number): number {
    const p = r * this.stride + c;
    this.structure[p] = 1;
    return p;
  }
  /**
   * Reserve `k` integration state slots; returns the first. `absTol` is their truncation-error floor in the units of
   * the state's derivative (default abstol: a charge, whose derivative is a current).
   */
  allocState(k: number, absTol = this.tol.abstol): number {
    const s = this.nState;
    this.nState += k;
    for (let i = 0; i < k; i++) this.stateFloors.push(absTol);
    return s;
  }

  /**
   * Device current convergence test (Nagel 1975, ERL-M520; the SPICE2 per-device test): the current predicted by
   * the previous iteration's linearisation must match the current at the new voltages within
   * reltol·max(|i|, |î|) + abstol. A large node conductance can make the voltage update tiny while the current is
   * still far off (a stiff clamp, an exponential), so the voltage test alone is not enough.
   */
  checkCurrent(actual: number, predicted: number): void {
    const d = actual - predicted;
    if ((d < 0 ? -d : d) > this.tol.reltol * Math.max(Math.abs(actual), Math.abs(predicted)) + this.tol.abstol) this.noncon++;
  }

  /**
   * Integrate a charge (or flux) in slot s: returns the current dq/dt by the active formula and stores q and i.
   * Trapezoidal: i = (2/h)(q − q_n) − i_n; backward Euler: i = (q − q_n)/h. (Companion forms: REFERENCES §2.2.)
   */
  integrate(s: number, q: number): number {
    const i = this.ag0 * (q - this.q1[s]) - this.trap * this.i1[s];
    this.q0[s] = q;
    this.i0[s] = i;
    return i;
  }
}

/** Stamp a conductance g between unknowns whose positions are given. */
export function stampG(m: Float64Array, aa: number, ab: number, ba: number, bb: number, g: number): void {
  m[aa] += g;
  m[bb] += g;
  m[ab] -= g;
  m[ba] -= g;
}

/** Positions of the 2×2 conductance block between unknowns a and b. */
export function gPos(c: Circuit, a: number, b: number): [number, number, number, number] {
  return [c.pos(a, a), c.pos(a, b), c.pos(b, a), c.pos(b, b)];
}
