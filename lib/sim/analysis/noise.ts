/**
 * Small-signal noise at the operating point, by the adjoint (transposed) network: for one output x_out = eᵀ·x, the
 * solution z of Aᵀ·z = e gives the transfer from every right-hand-side position at once (x_out = zᵀ·b), so one
 * factorisation and one transposed solve per frequency give every noise source's contribution — the cost of an AC
 * run, not of one AC run per source (Rohrer, Nagel, Meyer & Weber, "Computationally efficient electronic-circuit
 * noise calculations", IEEE JSSC SC-6(4), 1971; Vlach & Singhal 1994, ch. on noise; docs/references.md §8).
 *
 * Sources come from the elements (Element.noise): uncorrelated current sources with one-sided densities
 * white·(1 + corner/f). The output density is √(Σ |H_i|²·S_i); each element's contribution is the root of the sum
 * over its own sources. The band's RMS integrates the output's power density between the analysis' first and last
 * frequency, each interval as a power law through its two end points (exact for the slopes of RC and 1/f spectra).
 */
import { type Circuit, type NoiseSink } from "../circuit";
import { SimError } from "../errors";
import { StaticLU } from "../sparse";
import type { NoiseResult } from "../results";
import { checkpoint } from "../checkpoint";
import { isGround } from "../ground";
import { factorAt, linearise, logFrequencies } from "./ac";

/** What the noise is measured at: a node's voltage (against ground or a reference node), or a vsource's current. */
export type NoiseOutput = { node: string; reference?: string } | { current: string };

export interface NoiseSpec {
  output: NoiseOutput;
  /** a vsource or isource: the output density is also referred to it (divided by |transfer from its AC value|) */
  input?: string;
  fStart: number;
  fStop: number;
  pointsPerDecade: number;
}

/** The noise sources of a circuit as flat arrays (built once per run, walked per frequency). */
class SourceList implements NoiseSink {
  into: number[] = [];
  from: number[] = [];
  gain: number[] = [];
  white: number[] = [];
  corner: number[] = [];
  owner: number[] = [];
  current = 0;
  add(into: number, from: number, gain: number, white: number, corner: number): void {
    if (!(white > 0) || gain === 0) return;
    this.into.push(into); this.from.push(from); this.gain.push(gain);
    this.white.push(white); this.corner.push(corner); this.owner.push(this.current);
  }
}

/** Unknown index of a node name (user nodes only), or throws naming the field. */
function nodeIndex(c: Circuit, name: string, field: string): number {
  if (isGround(name)) return c.n;
  const i = c.userNodeNames.indexOf(name);
  if (i < 0) throw new SimError("invalid", `Invalid analysis: field "${field}" names "${name}", which is not a node of the netlist`);
  return i;
}

/** ∫ S df over [f0, f1] with S a power law through (f0, s0) and (f1, s1); trapezoid when either end is zero. */
export function powerLawInterval(f0: number, f1: number, s0: number, s1: number): number {
  if (!(s0 > 0) || !(s1 > 0)) return 0.5 * (s0 + s1) * (f1 - f0);
  const r = f1 / f0;
  const a = Math.log(s1 / s0) / Math.log(r);
  const a1 = a + 1;
  if (Math.abs(a1) < 1e-9) return s0 * f0 * Math.log(r);
  return ((s0 * f0) / a1) * (Math.pow(r, a1) - 1);
}

/** Integral of a power density (units²/Hz) over the frequency points, interval by interval as power laws. */
export function integratePower(freq: Float64Array, psd: Float64Array): number {
  let sum = 0;
  for (let k = 1; k < freq.length; k++) sum += powerLawInterval(freq[k - 1], freq[k], psd[k - 1], psd[k]);
  return sum;
}

export function runNoise(c: Circuit, spec: NoiseSpec, onProgress?: (f: number) => void): NoiseResult {
  const els = c.elements;
  const n = c.n;
  // output selector e (real), checked before the operating point is solved
  const e = new Float64Array(c.stride);
  let outputUnit: "V" | "A";
  if ("current" in spec.output) {
    const name = spec.output.current;
    const el = els.find((x) => x.name === name);
    if (!el || el.kind !== "vsource") {
      throw new SimError("invalid", `Invalid analysis: field "output.current" names "${name}", which is not a vsource in the netlist`);
    }
    e[el.branchIndex()] = 1;
    outputUnit = "A";
  } else {
    e[nodeIndex(c, spec.output.node, "output.node")] += 1;
    if (spec.output.reference !== undefined) e[nodeIndex(c, spec.output.reference, "output.reference")] -= 1;
    e[n] = 0;
    outputUnit = "V";
  }
  const inputEl = spec.input === undefined ? null : els.find((x) => x.name === spec.input) ?? null;
  if (spec.input !== undefined && (inputEl === null || inputEl.acExcitation === null)) {
    throw new SimError("invalid", `Invalid analysis: field "input" names "${spec.input}", which is not a vsource or isource in the netlist`);
  }

  const { g, cap } = linearise(c);
  const size = g.length;

  // the noise sources at the operating point
  const list = new SourceList();
  const owners: string[] = [];
  for (const el of els) {
    if (el.noiseless) continue;
    const before = list.into.length;
    list.current = owners.length;
    el.noise(c, list);
    if (list.into.length > before) owners.push(el.name);
  }
  const nSrc = list.into.length;
  const into = Int32Array.from(list.into), from = Int32Array.from(list.from);
  const gain = Float64Array.from(list.gain), white = Float64Array.from(list.white), corner = Float64Array.from(list.corner);
  const owner = Int32Array.from(list.owner);
  const nOwn = owners.length;

  // the input's right-hand side for a unit AC value (frequency-independent, as in the AC analysis)
  let inRe: Float64Array | null = null, inIm: Float64Array | null = null;
  if (inputEl !== null) {
    const ph = inputEl.acExcitation as Float64Array;
    const r0 = ph[0], i0 = ph[1];
    ph[0] = 1; ph[1] = 0;
    inRe = new Float64Array(c.stride); inIm = new Float64Array(c.stride);
    try { inputEl.loadAc(c, inRe, inIm); } finally { ph[0] = r0; ph[1] = i0; }
    inRe[n] = 0; inIm[n] = 0;
  }

  const freq = logFrequencies(spec.fStart, spec.fStop, spec.pointsPerDecade);
  const count = freq.length;
  const outputPsd = new Float64Array(count);
  const ownerPsd: Float64Array[] = [];
  for (let j = 0; j < nOwn; j++) ownerPsd.push(new Float64Array(count));
  const inputDensity = inputEl === null ? null : new Float64Array(count);
  const perOwner = new Float64Array(Math.max(1, nOwn));

  const re = new Float64Array(size), im = new Float64Array(size);
  const er = e, ei = new Float64Array(c.stride);
  const zr = new Float64Array(c.stride), zi = new Float64Array(c.stride);
  const lu = new StaticLU(n, c.stride, c.structure);
  lu.poll = c.lu.poll;
  for (let k = 0; k < count; k++) {
    if ((k & 7) === 0) checkpoint(c);
    const f = freq[k];
    factorAt(c, lu, g, cap, re, im, f);
    lu.solveComplexTransposed(re, im, er, ei, zr, zi);
    zr[n] = 0; zi[n] = 0;
    for (let j = 0; j < nOwn; j++) perOwner[j] = 0;
    let total = 0;
    for (let s = 0; s < nSrc; s++) {
      const a = into[s], b = from[s], gs = gain[s];
      const hr = gs * (zr[a] - zr[b]), hi = gs * (zi[a] - zi[b]);
      const psd = (hr * hr + hi * hi) * white[s] * (1 + corner[s] / f);
      perOwner[owner[s]] += psd;
      total += psd;
    }
    outputPsd[k] = total;
    for (let j = 0; j < nOwn; j++) ownerPsd[j][k] = perOwner[j];
    if (inputDensity !== null && inRe !== null && inIm !== null) {
      let hr = 0, hi = 0;
      for (let i = 0; i < n; i++) {
        const br = inRe[i], bi = inIm[i];
        if (br === 0 && bi === 0) continue;
        hr += zr[i] * br - zi[i] * bi;
        hi += zr[i] * bi + zi[i] * br;
      }
      inputDensity[k] = Math.sqrt(total / (hr * hr + hi * hi));
    }
    if ((k & 31) === 31) onProgress?.(k / count);
  }

  const outputDensity = new Float64Array(count);
  for (let k = 0; k < count; k++) outputDensity[k] = Math.sqrt(outputPsd[k]);
  const contributions: Record<string, Float64Array> = {};
  const contributionRms: Record<string, number> = {};
  for (let j = 0; j < nOwn; j++) {
    const p = ownerPsd[j];
    contributionRms[owners[j]] = Math.sqrt(integratePower(freq, p));
    for (let k = 0; k < count; k++) p[k] = Math.sqrt(p[k]);
    contributions[owners[j]] = p;
  }
  return {
    kind: "noise",
    outputUnit,
    freq,
    outputDensity,
    inputReferredDensity: inputDensity,
    contributions,
    contributionRms,
    integrated: { rms: Math.sqrt(integratePower(freq, outputPsd)), fStart: freq[0], fStop: freq[count - 1] },
  };
}
