/**
 * Small-signal AC: linearise every device at the operating point (the converged Newton Jacobian G, plus the
 * capacitance/inductance matrix C of dq/dv at the OP), then solve (G + jωC)·x = b per frequency with a complex LU
 * (Vlach & Singhal 1994, ch. on frequency-domain analysis; REFERENCES §2.1). Frequencies log-spaced.
 */
import { type Circuit, MODE_DC } from "../circuit";
import { SimError } from "../errors";
import { luFactorComplex, luSolveComplex } from "../lu";
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
  const g = c.mat.slice(0, size);
  const cap = new Float64Array(size);
  for (const el of c.elements) el.loadCap(c, cap);
  const freq = logFrequencies(fStart, fStop, perDecade);
  const count = freq.length;
  const nodes: Record<string, ComplexColumn> = {};
  const currents: Record<string, ComplexColumn> = {};
  for (const n of c.userNodeNames) nodes[n] = { re: new Float64Array(count), im: new Float64Array(count) };
  for (const el of c.elements) currents[el.name] = { re: new Float64Array(count), im: new Float64Array(count) };
  const re = new Float64Array(size), im = new Float64Array(size);
  const br = new Float64Array(c.stride), bi = new Float64Array(c.stride);
  const out = new Float64Array(2);
  const n = c.n;
  for (let k = 0; k < count; k++) {
    const w = 2 * Math.PI * freq[k];
    re.set(g);
    for (let i = 0; i < size; i++) im[i] = w * cap[i];
    br.fill(0); bi.fill(0);
    for (const el of c.elements) el.loadAc(c, br, bi);
    const bad = luFactorComplex(re, im, n, c.stride, c.piv);
    if (bad >= 0) throw new SimError("singular", `Singular AC matrix at ${c.unknownNames[bad]} at ${freq[k].toPrecision(4)} Hz`);
    luSolveComplex(re, im, n, c.stride, c.piv, br, bi);
    br[n] = 0; bi[n] = 0;
    for (let i = 0; i < c.userNodeNames.length; i++) {
      const col = nodes[c.userNodeNames[i]];
      col.re[k] = br[i]; col.im[k] = bi[i];
    }
    for (const el of c.elements) {
      el.acCurrent(c, br, bi, w, out);
      const col = currents[el.name];
      col.re[k] = out[0]; col.im[k] = out[1];
    }
    if ((k & 31) === 31) {
      checkBudget(c);
      if (c.shouldStop?.()) throw new SimError("cancelled", "Simulation cancelled");
      onProgress?.(k / count);
    }
  }
  return { kind: "ac", freq, nodes, currents };
}
