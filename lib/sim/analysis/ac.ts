/**
 * Small-signal AC: linearise every device at the operating point (the converged Newton Jacobian G, plus the
 * capacitance/inductance matrix C of dq/dv at the OP), then solve (G + jωC)·x = b per frequency with a complex LU
 * (Vlach & Singhal 1994, ch. on frequency-domain analysis; REFERENCES §2.1). Frequencies log-spaced.
 */
import { type Circuit, MODE_DC } from "../circuit";
import { SimError } from "../errors";
import { LU_REORDER, StaticLU } from "../sparse";
import type { AcResult, ComplexColumn } from "../results";
import { runOp } from "./dc";
import { checkBudget, loadAll } from "./newton";

export function logFrequencies(fStart: number, fStop: number, perDecade: number): Float64Array {
  const decades = Math.log10(fStop / fStart);
  const count = Math.max(1, Math.floor(decades * perDecade + 1e-9) + 1);
  const f = new Float64Array(count);
  for (let i = 0; i < count; i++) f[i] = fStart * Math.pow(10, i / perDecade);
  return f;
}

export function runAc(c: Circuit, fStart: number, fStop: number, perDecade: number, onProgress?: (f: number) => void, skipOp = false): AcResult {
  if (!skipOp) runOp(c);
  c.mode = MODE_DC;
  loadAll(c); // Jacobian at the OP
  const size = c.mat.length;
  const g = new Float64Array(size);
  for (let i = 0; i < size; i++) if (c.structure[i]) g[i] = c.mat[i];
  const cap = new Float64Array(size);
  for (const el of c.elements) { el.loadCap(c, cap); el.acPrepare(c); }
  const els = c.elements;
  const nEl = els.length;
  const curRe: Float64Array[] = [], curIm: Float64Array[] = [];
  const nodeRe: Float64Array[] = [], nodeIm: Float64Array[] = [];
  const freq = logFrequencies(fStart, fStop, perDecade);
  const count = freq.length;
  const nodes: Record<string, ComplexColumn> = {};
  const currents: Record<string, ComplexColumn> = {};
  for (const n of c.userNodeNames) nodes[n] = { re: new Float64Array(count), im: new Float64Array(count) };
  for (const el of c.elements) currents[el.name] = { re: new Float64Array(count), im: new Float64Array(count) };
  for (const el of els) { curRe.push(currents[el.name].re); curIm.push(currents[el.name].im); }
  for (const nm of c.userNodeNames) { nodeRe.push(nodes[nm].re); nodeIm.push(nodes[nm].im); }
  const nUser = nodeRe.length;
  // AC excitation does not depend on frequency
  const exRe = new Float64Array(c.stride), exIm = new Float64Array(c.stride);
  for (const el of els) el.loadAc(c, exRe, exIm);
  const re = new Float64Array(size), im = new Float64Array(size);
  const out = new Float64Array(2);
  const xr = new Float64Array(c.stride), xi = new Float64Array(c.stride);
  const n = c.n;
  const lu = new StaticLU(n, c.stride, c.structure);
  for (let k = 0; k < count; k++) {
    const w = 2 * Math.PI * freq[k];
    if (lu.analysed) {
      // only the structural non-zeros and fill-in take part in the factorisation
      const P = lu.positions;
      for (let q = 0; q < P.length; q++) { const p = P[q]; re[p] = g[p]; im[p] = w * cap[p]; }
    }
    let r = lu.analysed ? lu.factorComplex(re, im) : LU_REORDER;
    if (r === LU_REORDER) {
      re.set(g);
      for (let i = 0; i < size; i++) im[i] = w * cap[i];
      const bad = lu.analyse(re, im);
      if (bad >= 0) throw new SimError("singular", `Singular AC matrix at ${c.unknownNames[bad]} at ${freq[k].toPrecision(4)} Hz`);
      r = lu.factorComplex(re, im);
      if (r !== -1) throw new SimError("singular", `Singular AC matrix at ${freq[k].toPrecision(4)} Hz`);
    }
    lu.solveComplex(re, im, exRe, exIm, xr, xi);
    xr[n] = 0; xi[n] = 0;
    for (let i = 0; i < nUser; i++) { nodeRe[i][k] = xr[i]; nodeIm[i][k] = xi[i]; }
    for (let e = 0; e < nEl; e++) {
      els[e].acCurrent(c, xr, xi, w, out);
      curRe[e][k] = out[0]; curIm[e][k] = out[1];
    }
    if ((k & 31) === 31) {
      checkBudget(c);
      if (c.shouldStop?.()) throw new SimError("cancelled", "Simulation cancelled");
      onProgress?.(k / count);
    }
  }
  return { kind: "ac", freq, nodes, currents };
}
