/**
 * The Noise study: the load current's noise density from the lowest frequency (0.1 Hz unless the scenario sets
 * another) to well past the current loop's crossover, its RMS over the scenario's band, and the contributors ranked by
 * their share of the band's noise power. The engine's noise analysis (lib/sim/analysis/noise.ts) runs on the
 * closed-loop netlist with the load meter's current as the output and the command source as the input, so the
 * input-referred density is the command noise that would give the same load-current noise.
 *
 * Defaults (our own, for scenarios that predate the noise fields): op-amp 20 nV/√Hz with a 100 Hz corner and
 * 0.5 pA/√Hz with a 200 Hz corner, band 0.1 Hz–100 kHz. The analysis runs to 10 × the op-amp's gain–bandwidth (the
 * current loop cannot cross over above the op-amp's GBW), or past the band's top when that is higher.
 */
import { formatEng } from "../units/eng";
import { integratePower, simulate, type NoiseResult, type SimOptions } from "../sim";
import { NAMES } from "./compile";
import { compileNetlist } from "./run";
import type { CheckRow } from "./check-formulas";
import { ScenarioError, type Scenario } from "./schema";

/** Generic op-amp noise for scenarios that carry none: V/√Hz, Hz, A/√Hz, Hz (plausible values of our own). */
export const DEFAULT_OPAMP_NOISE = { noiseVoltage: 20e-9, noiseVoltageCorner: 100, noiseCurrent: 0.5e-12, noiseCurrentCorner: 200 } as const;
/** Study defaults: lowest frequency and integration band, Hz. */
export const DEFAULT_NOISE_STUDY = { fMin: 0.1, bandLow: 0.1, bandHigh: 100e3 } as const;
/** Points per decade of the noise analysis. */
const POINTS_PER_DECADE = 20;

export interface NoiseSettings { fMin: number; fMax: number; bandLow: number; bandHigh: number }

/** The study's frequencies, the scenario's values or the defaults (throws ScenarioError naming the field). */
export function noiseSettings(s: Scenario, override: Partial<Omit<NoiseSettings, "fMax">> = {}): NoiseSettings {
  const st = s.studies.noise ?? {};
  const fMin = override.fMin ?? st.fMin ?? DEFAULT_NOISE_STUDY.fMin;
  const bandLow = override.bandLow ?? st.bandLow ?? DEFAULT_NOISE_STUDY.bandLow;
  const bandHigh = override.bandHigh ?? st.bandHigh ?? DEFAULT_NOISE_STUDY.bandHigh;
  if (!(bandHigh > bandLow)) throw new ScenarioError("studies.noise.bandHigh: the band's end must be above its start");
  if (bandLow < fMin) throw new ScenarioError("studies.noise.bandLow: the band must start at or above the lowest frequency");
  const fMax = Math.max(10 * s.opamp.GBW, bandHigh);
  return { fMin, fMax, bandLow, bandHigh };
}

/** The op-amp's noise figures, the scenario's or the defaults. */
export function opampNoise(s: Scenario): { noiseVoltage: number; noiseVoltageCorner: number; noiseCurrent: number; noiseCurrentCorner: number } {
  const o = s.opamp;
  return {
    noiseVoltage: o.noiseVoltage ?? DEFAULT_OPAMP_NOISE.noiseVoltage,
    noiseVoltageCorner: o.noiseVoltageCorner ?? DEFAULT_OPAMP_NOISE.noiseVoltageCorner,
    noiseCurrent: o.noiseCurrent ?? DEFAULT_OPAMP_NOISE.noiseCurrent,
    noiseCurrentCorner: o.noiseCurrentCorner ?? DEFAULT_OPAMP_NOISE.noiseCurrentCorner,
  };
}

/** ∫ S df over [f0, f1] ∩ the points, each interval a power law through its ends (as the engine integrates). */
export function bandPower(freq: Float64Array, psd: Float64Array, f0: number, f1: number): number {
  let sum = 0;
  const seg = new Float64Array(2), val = new Float64Array(2);
  for (let k = 1; k < freq.length; k++) {
    const a = freq[k - 1], b = freq[k];
    if (b <= f0 || a >= f1) continue;
    const lo = Math.max(a, f0), hi = Math.min(b, f1);
    // the power law through the interval's ends, evaluated at the clipped ends
    const sa = psd[k - 1], sb = psd[k];
    const alpha = sa > 0 && sb > 0 ? Math.log(sb / sa) / Math.log(b / a) : 0;
    const at = (f: number) => (sa > 0 && sb > 0 ? sa * Math.pow(f / a, alpha) : sa + ((sb - sa) * (f - a)) / (b - a));
    seg[0] = lo; seg[1] = hi; val[0] = at(lo); val[1] = at(hi);
    sum += integratePower(seg, val);
  }
  return sum;
}

export interface NoiseContributor {
  /** the netlist element's name (e.g. "sense", "amplifier", "pass") */
  element: string;
  /** its RMS load-current noise over the band, A */
  rms: number;
  /** its share of the band's noise power, 0..1 */
  share: number;
}

export interface NoiseStudyResult {
  freq: Float64Array;
  /** load-current noise density, A/√Hz */
  density: Float64Array;
  /** the same referred to the command input, V/√Hz */
  commandReferred: Float64Array | null;
  /** element → load-current noise density, A/√Hz */
  contributions: Record<string, Float64Array>;
  /** RMS load-current noise over the band, A */
  rms: number;
  band: { low: number; high: number };
  /** contributors ranked by their share of the band's noise power, largest first */
  ranked: NoiseContributor[];
  /** the scenario's target, A RMS (null = none) */
  target: number | null;
}

/**
 * Run the noise analysis on the scenario's closed-loop circuit. `noiseless` names elements whose noise is left out
 * (e.g. all but one, to see a single source alone).
 */
export function runNoiseStudy(
  s: Scenario, options: SimOptions = {}, override: Partial<Omit<NoiseSettings, "fMax">> = {}, noiseless: readonly string[] = [],
): NoiseStudyResult {
  const set = noiseSettings(s, override);
  const n = compileNetlist(s, "closedloop");
  const on = opampNoise(s);
  n.elements = n.elements.map((e) => {
    let el = e;
    if (el.kind === "opamp" && el.name === NAMES.opamp) el = { ...el, model: { ...el.model, ...on } };
    if (noiseless.includes(el.name) && NOISY_KINDS.has(el.kind)) el = { ...el, noiseless: true } as typeof el;
    return el;
  });
  n.analysis = { kind: "noise", output: { current: NAMES.ammeter }, input: NAMES.command, fStart: set.fMin, fStop: set.fMax, pointsPerDecade: POINTS_PER_DECADE };
  const r = simulate(n, options) as NoiseResult;
  if (r.kind !== "noise") throw new Error(`Expected a noise result, got ${r.kind}`);
  return reduce(s, r, set);
}

/** Kinds whose netlist entries take `noiseless` (the noisy ones). */
const NOISY_KINDS: ReadonlySet<string> = new Set(["resistor", "diode", "bjt", "mosfet", "opamp"]);

function reduce(s: Scenario, r: NoiseResult, set: NoiseSettings): NoiseStudyResult {
  const count = r.freq.length;
  const psd = new Float64Array(count);
  for (let k = 0; k < count; k++) psd[k] = r.outputDensity[k] * r.outputDensity[k];
  const total = bandPower(r.freq, psd, set.bandLow, set.bandHigh);
  const ranked: NoiseContributor[] = [];
  const p = new Float64Array(count);
  for (const [element, d] of Object.entries(r.contributions)) {
    for (let k = 0; k < count; k++) p[k] = d[k] * d[k];
    const power = bandPower(r.freq, p, set.bandLow, set.bandHigh);
    ranked.push({ element, rms: Math.sqrt(power), share: total > 0 ? power / total : 0 });
  }
  ranked.sort((a, b) => b.share - a.share);
  return {
    freq: r.freq,
    density: r.outputDensity,
    commandReferred: r.inputReferredDensity,
    contributions: r.contributions,
    rms: Math.sqrt(total),
    band: { low: set.bandLow, high: set.bandHigh },
    ranked,
    target: s.tolerances.noiseTarget ?? null,
  };
}

const fmtA = (a: number) => formatEng(a, "A");
const fmtHz = (f: number) => formatEng(f, "Hz");

/** The noise check (pass under 80 % of the target, warn up to it, fail above); null when the scenario sets no target. */
export function noiseCheck(r: NoiseStudyResult): CheckRow | null {
  if (r.target === null) return null;
  const top = r.ranked[0];
  return {
    id: "noise",
    label: `Load-current noise, ${fmtHz(r.band.low)}–${fmtHz(r.band.high)}`,
    verdict: r.rms > r.target ? "fail" : r.rms > 0.8 * r.target ? "warn" : "pass",
    value: r.rms,
    limit: r.target,
    unit: "A",
    formula: "In,rms = √(∫ Sᵢ(f) df over the band), Sᵢ the load-current noise density from every source (noise analysis)",
    detail: `${fmtA(r.rms)} RMS against a target of ${fmtA(r.target)}` +
      (top ? `; largest contributor ${top.element} (${(top.share * 100).toFixed(0)} % of the noise power)` : ""),
  };
}
