/**
 * Small-signal AC: linearise every device at the operating point (the converged Newton Jacobian G, plus the
 * capacitance/inductance matrix C of dq/dv at the OP), then solve (G + jωC)·x = b per frequency with a complex LU
 * (Vlach & Singhal 1994, ch. on frequency-domain analysis; REFERENCES §2.1). Frequencies log-spaced.
 *
 * Several excitations (right-hand sides b) can share one operating point, one linearisation and one factorisation
 * per frequency: only b depends on the sources' AC values, (G + jωC) does not (runAcMulti).
 */
import { type Circuit, MODE_DC } from "../circuit";
import { SimError } from "../errors";
import { LU_REORDER, StaticLU } from "../sparse";
import type { AcResult, ComplexColumn } from "../results";
import { runOp } from "./dc";
import { checkpoint } from "../checkpoint";
import { loadAll } from "./newton";

export function logFrequencies(fStart: number, fStop: number, perDecade: number): Float64Array {
  const decades = Math.log10(fStop / fStart);
  const count = Math.max(1, Math.floor(decades * perDecade + 1e-9) + 1);
  const f = new Float64Array(count);
  for (let i = 0; i < count; i++) f[i] = fStart * Math.pow(10, i / perDecade);
  return f;
}

export function runAc(c: Circuit, fStart: number, fStop: number, perDecade: number, onProgress?: (f: number) => void, skipOp = false): AcResult {
  return runAcMulti(c, fStart, fStop, perDecade, [{}], onProgress, skipOp)[0];
}

/** AC values for one excitation set: source name → magnitude and phase (degrees); unnamed sources keep theirs. */
export type AcExcitation = Record<string, { ac: number; acPhase?: number }>;

/**
 * AC analysis for several excitation sets at one operating point: the OP is solved once (unless `skipOp`: c.x
 * already holds it), G and C are formed once, and each frequency's matrix is factored once and solved once per set.
 * Result j equals a separate AC run of the netlist with set j's source values.
 */
export function runAcMulti(
  c: Circuit, fStart: number, fStop: number, perDecade: number, excitations: readonly AcExcitation[],
  onProgress?: (f: number) => void, skipOp = false,
): AcResult[] {
  const sources = c.elements.filter((e) => e.acExcitation !== null);
  const phasors = sources.map((e) => e.acExcitation as Float64Array);
  const base = phasors.map((p) => [p[0], p[1]] as const);
  const byName = new Map(sources.map((e, i) => [e.name, i]));
  const m = excitations.length;
  // per set: every source's [re, im]
  const setRe: Float64Array[] = [], setIm: Float64Array[] = [];
  for (const ex of excitations) {
    const re = Float64Array.from(base, (b) => b[0]), im = Float64Array.from(base, (b) => b[1]);
    for (const [name, v] of Object.entries(ex)) {
      const i = byName.get(name);
      if (i === undefined) throw new SimError("invalid", `AC excitation names "${name}", which is not a vsource or isource`);
      if (!Number.isFinite(v.ac) || (v.acPhase !== undefined && !Number.isFinite(v.acPhase))) {
        throw new SimError("invalid", `AC excitation of "${name}": field "ac" and "acPhase" must be finite numbers`);
      }
      const ph = ((v.acPhase ?? 0) * Math.PI) / 180;
      re[i] = v.ac * Math.cos(ph);
      im[i] = v.ac * Math.sin(ph);
    }
    setRe.push(re); setIm.push(im);
  }
  const apply = (j: number) => {
    const re = setRe[j], im = setIm[j];
    for (let i = 0; i < phasors.length; i++) { phasors[i][0] = re[i]; phasors[i][1] = im[i]; }
  };
  try {
    return acCore(c, fStart, fStop, perDecade, m, apply, onProgress, skipOp);
  } finally {
    for (let i = 0; i < phasors.length; i++) { phasors[i][0] = base[i][0]; phasors[i][1] = base[i][1]; }
  }
}

/**
 * The circuit linearised at its operating point (solved first unless `skipOp`: c.x already holds it): G, the
 * converged Newton Jacobian, and C, the matrix of dq/dv, both in the circuit's dense storage; each element's
 * small-signal state is prepared (acPrepare). The AC analysis and the small-signal step share it.
 */
export function linearise(c: Circuit, skipOp = false): { g: Float64Array; cap: Float64Array } {
  if (!skipOp) runOp(c);
  c.mode = MODE_DC;
  loadAll(c); // Jacobian at the OP
  const size = c.mat.length;
  const g = new Float64Array(size);
  for (let i = 0; i < size; i++) if (c.structure[i]) g[i] = c.mat[i];
  const cap = new Float64Array(size);
  for (const el of c.elements) { el.loadCap(c, cap); el.acPrepare(c); }
  return { g, cap };
}

/**
 * Factor G + jωC at frequency `f` (Hz) into `re`/`im` with the LU's stored order, re-analysing the order when it no
 * longer holds; only the structural non-zeros and fill-in take part. Throws SimError "singular" naming the unknown.
 */
export function factorAt(
  c: Circuit, lu: StaticLU, g: Float64Array, cap: Float64Array, re: Float64Array, im: Float64Array, f: number,
): void {
  const w = 2 * Math.PI * f;
  if (lu.analysed) {
    const P = lu.positions;
    for (let q = 0; q < P.length; q++) { const p = P[q]; re[p] = g[p]; im[p] = w * cap[p]; }
  }
  let r = lu.analysed ? lu.factorComplex(re, im) : LU_REORDER;
  if (r === LU_REORDER) {
    re.set(g);
    for (let i = 0; i < g.length; i++) im[i] = w * cap[i];
    const bad = lu.analyse(re, im);
    if (bad >= 0) throw new SimError("singular", `Singular AC matrix at ${c.unknownNames[bad]} at ${f.toPrecision(4)} Hz`);
    r = lu.factorComplex(re, im);
    if (r !== -1) throw new SimError("singular", `Singular AC matrix at ${f.toPrecision(4)} Hz`);
  }
}

function acCore(
  c: Circuit, fStart: number, fStop: number, perDecade: number, m: number, apply: (j: number) => void,
  onProgress: ((f: number) => void) | undefined, skipOp: boolean,
): AcResult[] {
  const { g, cap } = linearise(c, skipOp);
  const size = g.length;
  const els = c.elements;
  const nEl = els.length;
  const freq = logFrequencies(fStart, fStop, perDecade);
  const count = freq.length;
  const results: AcResult[] = [];
  const curRe: Float64Array[][] = [], curIm: Float64Array[][] = [];
  const nodeRe: Float64Array[][] = [], nodeIm: Float64Array[][] = [];
  // AC excitation does not depend on frequency: one right-hand side per set
  const exRe: Float64Array[] = [], exIm: Float64Array[] = [];
  for (let j = 0; j < m; j++) {
    const nodes: Record<string, ComplexColumn> = {};
    const currents: Record<string, ComplexColumn> = {};
    for (const n of c.userNodeNames) nodes[n] = { re: new Float64Array(count), im: new Float64Array(count) };
    for (const el of els) currents[el.name] = { re: new Float64Array(count), im: new Float64Array(count) };
    curRe.push(els.map((el) => currents[el.name].re)); curIm.push(els.map((el) => currents[el.name].im));
    nodeRe.push(c.userNodeNames.map((nm) => nodes[nm].re)); nodeIm.push(c.userNodeNames.map((nm) => nodes[nm].im));
    results.push({ kind: "ac", freq: j === 0 ? freq : freq.slice(), nodes, currents });
    apply(j);
    const br = new Float64Array(c.stride), bi = new Float64Array(c.stride);
    for (const el of els) el.loadAc(c, br, bi);
    exRe.push(br); exIm.push(bi);
  }
  const nUser = c.userNodeNames.length;
  const re = new Float64Array(size), im = new Float64Array(size);
  const out = new Float64Array(2);
  const xr = new Float64Array(c.stride), xi = new Float64Array(c.stride);
  const n = c.n;
  const lu = new StaticLU(n, c.stride, c.structure);
  lu.poll = c.lu.poll;
  for (let k = 0; k < count; k++) {
    // every 8th frequency (a small circuit's frequency costs a few µs; a large one's factorisation polls on its own)
    if ((k & 7) === 0) checkpoint(c);
    const w = 2 * Math.PI * freq[k];
    factorAt(c, lu, g, cap, re, im, freq[k]);
    for (let j = 0; j < m; j++) {
      if (m > 1) apply(j); // a current source's AC current is its excitation
      lu.solveComplex(re, im, exRe[j], exIm[j], xr, xi);
      xr[n] = 0; xi[n] = 0;
      const nr = nodeRe[j], ni = nodeIm[j], cr = curRe[j], ci = curIm[j];
      for (let i = 0; i < nUser; i++) { nr[i][k] = xr[i]; ni[i][k] = xi[i]; }
      for (let e = 0; e < nEl; e++) {
        els[e].acCurrent(c, xr, xi, w, out);
        cr[e][k] = out[0]; ci[e][k] = out[1];
      }
    }
    if ((k & 31) === 31) onProgress?.(k / count);
  }
  return results;
}
