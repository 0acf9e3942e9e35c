/** Spread: Monte Carlo over the part tolerances, and the worst-case corners. */
import { fullScaleCurrent } from "./checks";
import { runOperatingPoint, runOperatingPointAndLoopGain } from "./run";
import { runNoiseStudy } from "./noise";
import type { Scenario } from "./schema";
import { deviation, histogram, rngForRun, summarize, type Summary } from "./stats";
import { checkStop, clampRange, engineOptions, failure, nanArray, type IndexRange, type StudyOptions } from "./study-common";

/** Part deviations drawn for one Spread run (relative, except offsets in V, bias in A and β absolute). */
export interface SpreadDraw {
  dividerTop: number; dividerBottom: number; feedbackResistor: number; senseResistor: number; compCapacitor: number;
  howlandR1: number; howlandR2: number; howlandR3: number; howlandR4: number;
  vos: number; ib: number; betaF: number;
  /** the networks' parts (drawn every run, applied when the network is fitted; after the rest, so earlier draws keep their values) */
  loadSnubberR: number; loadSnubberC: number; passSnubberR: number; passSnubberC: number;
  baseEmitterResistor: number; feedbackCapacitor: number;
}

/** The scenario of run `index`: parts within tolerance, offset within ±Vos,max, bias in [0, Ib,max], β in [βmin, βF]. */
export function spreadScenario(s: Scenario, seed: number, index: number): { scenario: Scenario; draw: SpreadDraw } {
  const rng = rngForRun(seed, index);
  const t = s.tolerances;
  const d = t.distribution;
  const draw: SpreadDraw = {
    dividerTop: deviation(rng, t.resistor, d),
    dividerBottom: deviation(rng, t.resistor, d),
    feedbackResistor: deviation(rng, t.resistor, d),
    senseResistor: deviation(rng, t.sense, d),
    compCapacitor: deviation(rng, t.capacitor, d),
    howlandR1: deviation(rng, t.resistor, d),
    howlandR2: deviation(rng, t.resistor, d),
    howlandR3: deviation(rng, t.resistor, d),
    howlandR4: deviation(rng, t.resistor, d),
    vos: deviation(rng, 1, d) * s.opamp.vosMax,
    ib: rng() * s.opamp.ibMax,
    betaF: s.pass.betaMin + rng() * Math.max(0, s.pass.betaF - s.pass.betaMin),
    loadSnubberR: deviation(rng, t.resistor, d),
    loadSnubberC: deviation(rng, t.capacitor, d),
    passSnubberR: deviation(rng, t.resistor, d),
    passSnubberC: deviation(rng, t.capacitor, d),
    baseEmitterResistor: deviation(rng, t.resistor, d),
    feedbackCapacitor: deviation(rng, t.capacitor, d),
  };
  const c = structuredClone(s);
  const p = c.parts;
  p.dividerTop *= 1 + draw.dividerTop;
  p.dividerBottom *= 1 + draw.dividerBottom;
  p.feedbackResistor *= 1 + draw.feedbackResistor;
  p.senseResistor *= 1 + draw.senseResistor;
  p.compCapacitor *= 1 + draw.compCapacitor;
  p.howlandR1 *= 1 + draw.howlandR1;
  p.howlandR2 *= 1 + draw.howlandR2;
  p.howlandR3 *= 1 + draw.howlandR3;
  p.howlandR4 *= 1 + draw.howlandR4;
  c.opamp.Vos = draw.vos;
  c.opamp.Ib = draw.ib;
  c.pass.betaF = draw.betaF;
  const n = c.networks;
  if (n.loadSnubber) {
    n.loadSnubber.resistance *= 1 + draw.loadSnubberR;
    n.loadSnubber.capacitance *= 1 + draw.loadSnubberC;
  }
  if (n.passSnubber) {
    n.passSnubber.resistance *= 1 + draw.passSnubberR;
    n.passSnubber.capacitance *= 1 + draw.passSnubberC;
  }
  if (n.baseEmitterResistor !== null) n.baseEmitterResistor *= 1 + draw.baseEmitterResistor;
  if (n.feedbackCapacitor !== null) n.feedbackCapacitor *= 1 + draw.feedbackCapacitor;
  return { scenario: c, draw };
}

export interface SpreadResult {
  seed: number;
  runs: number;
  /** per run (NaN outside the chunk or on failure): load-current error against the nominal ideal, % of full scale */
  errorPctFs: Float64Array;
  phaseMarginDeg: Float64Array;
  /** per run, when the scenario sets a noise target: load-current noise over the noise band, A RMS (the Noise study) */
  noiseRms?: Float64Array;
  failures: { index: number; message: string }[];
}

/** Monte Carlo over the tolerances: operating point (current error) and loop gain (phase margin) per run. */
export function spread(s: Scenario, settings: { runs: number; seed: number }, opts: StudyOptions = {}, range?: IndexRange): SpreadResult & {
  summary?: { errorPctFs: Summary; phaseMarginDeg: Summary; errorHistogram: { edges: Float64Array; counts: Float64Array }; pmHistogram: { edges: Float64Array; counts: Float64Array }; worstError: { index: number; errorPctFs: number; draw: SpreadDraw } | null; worstPhaseMargin: { index: number; phaseMarginDeg: number; draw: SpreadDraw } | null };
} {
  const n = settings.runs;
  const r = clampRange(range, n);
  const out: SpreadResult = { seed: settings.seed, runs: n, errorPctFs: nanArray(n), phaseMarginDeg: nanArray(n), failures: [] };
  const withNoise = s.tolerances.noiseTarget !== undefined;
  if (withNoise) out.noiseRms = nanArray(n);
  const nominalIdeal = fullScaleCurrent(s) * (s.stimulus.commandHigh / s.stimulus.commandFullScale);
  const fs = fullScaleCurrent(s);
  for (let i = r.start; i < r.end; i++) {
    checkStop(opts);
    const { scenario } = spreadScenario(s, settings.seed, i);
    try {
      // one compile and one operating point serve the current error and both loop-gain injections
      const { summary, loop } = runOperatingPointAndLoopGain(scenario, engineOptions(opts), { pointsPerDecade: 10 });
      out.errorPctFs[i] = ((Math.abs(summary.iLoad) - Math.abs(nominalIdeal)) / fs) * 100;
      out.phaseMarginDeg[i] = loop.phaseMarginDeg ?? NaN;
      if (out.noiseRms) out.noiseRms[i] = runNoiseStudy(scenario, engineOptions(opts)).rms;
    } catch (e) {
      failure(e, i, out.failures);
    }
    opts.onProgress?.(i - r.start + 1, r.end - r.start);
  }
  if (r.start === 0 && r.end === n) return { ...out, summary: summarizeSpread(s, out) };
  return out;
}

/** One toleranced quantity for the corner search: its two extremes applied to a copy of the scenario. */
interface CornerParameter {
  name: string;
  apply: (c: Scenario, end: 1 | -1) => void;
}

function cornerParameters(s: Scenario): CornerParameter[] {
  const t = s.tolerances;
  const rel = (key: keyof Scenario["parts"], tol: number): CornerParameter => ({
    name: `parts.${key}`,
    apply: (c, e) => { (c.parts[key] as number) *= 1 + e * tol; },
  });
  const list: CornerParameter[] =
    s.template === "howland"
      ? [rel("howlandR1", t.resistor), rel("howlandR2", t.resistor), rel("howlandR3", t.resistor), rel("howlandR4", t.resistor)]
      : [rel("dividerTop", t.resistor), rel("dividerBottom", t.resistor), rel("feedbackResistor", t.resistor)];
  list.push(rel("senseResistor", t.sense));
  list.push({ name: "opamp.Vos", apply: (c, e) => { c.opamp.Vos = e * c.opamp.vosMax; } });
  list.push({ name: "opamp.Ib", apply: (c, e) => { c.opamp.Ib = e > 0 ? c.opamp.ibMax : 0; } });
  list.push({ name: "pass.betaF", apply: (c, e) => { c.pass.betaF = e > 0 ? c.pass.betaF : c.pass.betaMin; } });
  return list;
}

/**
 * Worst-case corners by sensitivity: each toleranced quantity is moved to one end alone to learn which way it
 * pushes the load current; then every quantity is set to the end that raises the current (high corner) or lowers
 * it (low corner) and the operating point is solved. Errors are against the nominal Vcmd·k/Rsense, % of full scale.
 */
export function worstCaseCorners(s: Scenario, opts: StudyOptions = {}): {
  high: number;
  low: number;
  /** per quantity: the end (+1 or −1) that raises the current */
  raises: Record<string, 1 | -1>;
} {
  const fs = fullScaleCurrent(s);
  const nominalIdeal = fs * (s.stimulus.commandHigh / s.stimulus.commandFullScale);
  const current = (c: Scenario) => {
    checkStop(opts);
    return Math.abs(runOperatingPoint(c, engineOptions(opts)).summary.iLoad);
  };
  const params = cornerParameters(s);
  const base = current(s);
  const raises: Record<string, 1 | -1> = {};
  for (const p of params) {
    const c = structuredClone(s);
    p.apply(c, 1);
    raises[p.name] = current(c) >= base ? 1 : -1;
  }
  const corner = (dir: 1 | -1) => {
    const c = structuredClone(s);
    for (const p of params) p.apply(c, (dir * raises[p.name]) as 1 | -1);
    return ((current(c) - Math.abs(nominalIdeal)) / fs) * 100;
  };
  return { high: corner(1), low: corner(-1), raises };
}

/** Combine chunks of a Spread (their NaN-padded columns) into one result. */
export function mergeSpread(parts: SpreadResult[]): SpreadResult {
  if (parts.length === 0) throw new RangeError("Nothing to merge");
  const n = parts[0].runs;
  const out: SpreadResult = { seed: parts[0].seed, runs: n, errorPctFs: nanArray(n), phaseMarginDeg: nanArray(n), failures: [] };
  for (const p of parts) {
    for (let i = 0; i < n; i++) {
      if (!Number.isNaN(p.errorPctFs[i])) out.errorPctFs[i] = p.errorPctFs[i];
      if (!Number.isNaN(p.phaseMarginDeg[i])) out.phaseMarginDeg[i] = p.phaseMarginDeg[i];
      if (p.noiseRms && !Number.isNaN(p.noiseRms[i])) (out.noiseRms ??= nanArray(n))[i] = p.noiseRms[i];
    }
    out.failures.push(...p.failures);
  }
  return out;
}

/** Summary statistics, histograms and the worst runs (with the part deviations that produced them). */
export function summarizeSpread(s: Scenario, r: SpreadResult) {
  let we = -1, wp = -1;
  for (let i = 0; i < r.runs; i++) {
    if (Number.isFinite(r.errorPctFs[i]) && (we < 0 || Math.abs(r.errorPctFs[i]) > Math.abs(r.errorPctFs[we]))) we = i;
    if (Number.isFinite(r.phaseMarginDeg[i]) && (wp < 0 || r.phaseMarginDeg[i] < r.phaseMarginDeg[wp])) wp = i;
  }
  return {
    errorPctFs: summarize(r.errorPctFs),
    phaseMarginDeg: summarize(r.phaseMarginDeg),
    errorHistogram: histogram(r.errorPctFs, 30),
    pmHistogram: histogram(r.phaseMarginDeg, 30),
    /** load-current noise over the band, A RMS (null without a noise target) */
    noiseRms: r.noiseRms ? summarize(r.noiseRms) : null,
    worstError: we >= 0 ? { index: we, errorPctFs: r.errorPctFs[we], draw: spreadScenario(s, r.seed, we).draw } : null,
    worstPhaseMargin: wp >= 0 ? { index: wp, phaseMarginDeg: r.phaseMarginDeg[wp], draw: spreadScenario(s, r.seed, wp).draw } : null,
  };
}
