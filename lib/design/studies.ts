/**
 * Studies: Sweep (1D), Map (2D), Spread (Monte Carlo over tolerances, spread.ts) and Compensate
 * (auto-compensation, compensate.ts). Pure and chunkable: every study takes an index range [start, end) so a worker
 * pool can split it, reports progress and polls `shouldStop` between runs (and passes it to the engine so a long run
 * stops too). A run the engine cannot solve becomes NaN with its message in `failures`; cancellation throws
 * SimError "cancelled".
 */
import { withParameter, axisValues } from "./parameters";
import { runLoopGain, runSmallSignalStep, runStep } from "./run";
import { judgedOvershootPct } from "./verdicts";
import { runNoiseStudy } from "./noise";
import type { Scenario, SweepAxis } from "./schema";
import { checkStop, clampRange, engineOptions, failure, nanArray, type IndexRange, type StudyOptions } from "./study-common";

export { SWEEPABLE_PARAMETERS, getParameter, withParameter, axisValues } from "./parameters";
export type { SweepableParameter } from "./parameters";
export type { StudyOptions, IndexRange } from "./study-common";
export * from "./spread";
export * from "./compensate";
export * from "./compensate-snubber";

export interface SweepPoint {
  index: number;
  value: number;
  step: { time: Float64Array; iLoad: Float64Array } | null;
  loop: { freq: Float64Array; magDb: Float64Array; phaseDeg: Float64Array } | null;
}

export interface SweepResult {
  path: string;
  /** all the axis' values; the metric columns hold the chunk's entries at their indices, NaN elsewhere */
  values: Float64Array;
  phaseMarginDeg: Float64Array;
  gainMarginDb: Float64Array;
  crossoverHz: Float64Array;
  overshootPct: Float64Array;
  /** the small-signal step's overshoot, % (NaN where it grows: the point's failures say so) */
  smallOvershootPct: Float64Array;
  settlingTime1pct: Float64Array;
  riseTime: Float64Array;
  finalCurrent: Float64Array;
  /** load-current noise over the scenario's noise band, A RMS (the Noise study) */
  noiseRms: Float64Array;
  points: SweepPoint[];
  failures: { index: number; message: string }[];
}



/** 1D sweep: step response and loop gain at each value, and metric-versus-parameter columns. */
export function sweep1d(s: Scenario, axis: SweepAxis, opts: StudyOptions = {}, range?: IndexRange): SweepResult {
  const values = axisValues(axis);
  const n = values.length;
  const r = clampRange(range, n);
  const out: SweepResult = {
    path: axis.path,
    values: Float64Array.from(values),
    phaseMarginDeg: nanArray(n), gainMarginDb: nanArray(n), crossoverHz: nanArray(n), overshootPct: nanArray(n), smallOvershootPct: nanArray(n),
    settlingTime1pct: nanArray(n), riseTime: nanArray(n), finalCurrent: nanArray(n), noiseRms: nanArray(n),
    points: [],
    failures: [],
  };
  for (let i = r.start; i < r.end; i++) {
    checkStop(opts);
    const v = withParameter(s, axis.path, values[i]);
    const point: SweepPoint = { index: i, value: values[i], step: null, loop: null };
    try {
      const lg = runLoopGain(v, engineOptions(opts), {}, false);
      out.phaseMarginDeg[i] = lg.phaseMarginDeg ?? NaN;
      out.gainMarginDb[i] = lg.gainMarginDb ?? NaN;
      out.crossoverHz[i] = lg.crossoverHz ?? NaN;
      point.loop = { freq: lg.freq, magDb: lg.magDb, phaseDeg: lg.phaseDeg };
    } catch (e) {
      failure(e, i, out.failures);
    }
    try {
      const st = runStep(v, engineOptions(opts));
      out.overshootPct[i] = st.metrics.overshootPct;
      out.settlingTime1pct[i] = st.metrics.settlingTime1pct ?? NaN;
      out.riseTime[i] = st.metrics.riseTime ?? NaN;
      out.finalCurrent[i] = st.metrics.final;
      point.step = { time: st.time, iLoad: st.series.iLoad };
    } catch (e) {
      failure(e, i, out.failures);
    }
    try {
      const small = runSmallSignalStep(v, engineOptions(opts));
      if (small?.grows) out.failures.push({ index: i, message: GROWS });
      else if (small) out.smallOvershootPct[i] = small.metrics.overshootPct;
    } catch (e) {
      failure(e, i, out.failures);
    }
    try {
      out.noiseRms[i] = runNoiseStudy(v, engineOptions(opts)).rms;
    } catch (e) {
      failure(e, i, out.failures);
    }
    out.points.push(point);
    opts.onProgress?.(i - r.start + 1, r.end - r.start);
  }
  return out;
}

/**
 * One sweep from its chunks (each computed over an index range by a worker): every metric column takes each chunk's
 * computed entries, the points are in index order, the failures gathered. Equals the sweep run whole.
 */
export function mergeSweep(chunks: readonly SweepResult[]): SweepResult {
  if (chunks.length === 0) throw new RangeError("mergeSweep needs at least one chunk");
  const first = chunks[0];
  const n = first.values.length;
  const columns = ["phaseMarginDeg", "gainMarginDb", "crossoverHz", "overshootPct", "smallOvershootPct", "settlingTime1pct", "riseTime", "finalCurrent", "noiseRms"] as const;
  const out: SweepResult = {
    ...first,
    points: chunks.flatMap((c) => c.points).sort((a, b) => a.index - b.index),
    failures: chunks.flatMap((c) => c.failures),
  };
  for (const key of columns) {
    const col = nanArray(n);
    for (const c of chunks) {
      const src = c[key];
      if (!src) continue;
      for (let i = 0; i < n; i++) if (!Number.isNaN(src[i])) col[i] = src[i];
    }
    out[key] = col;
  }
  return out;
}

export type MapMetric = "phaseMarginDeg" | "overshootPct" | "judgedOvershootPct" | "settlingTime1pct" | "noiseRms";

/** What a study point records when its linearised step grows (no overshoot figure: the closed loop is unstable). */
const GROWS = "the small-signal step grows: the closed loop is unstable";

export interface MapResult {
  xPath: string;
  yPath: string;
  xValues: Float64Array;
  yValues: Float64Array;
  metric: MapMetric;
  /** row-major: values[iy·nx + ix]; NaN where not computed or failed */
  values: Float64Array;
  failures: { index: number; message: string }[];
}

/** One map from its chunks: each cell from the chunk that computed it; `failed` holds the cells that failed. */
export function mergeMap(chunks: readonly MapResult[]): MapResult & { failed: Set<number> } {
  if (chunks.length === 0) throw new RangeError("mergeMap needs at least one chunk");
  const first = chunks[0];
  const values = nanArray(first.values.length);
  const failed = new Set<number>();
  for (const c of chunks) {
    for (let i = 0; i < values.length; i++) if (!Number.isNaN(c.values[i])) values[i] = c.values[i];
    for (const x of c.failures) failed.add(x.index);
  }
  return { ...first, values, failures: chunks.flatMap((c) => c.failures), failed };
}

/** Evaluate one metric for one scenario (the current loop's PM from its loop gain; overshoot and settling from the step,
 *  `judgedOvershootPct` the worse of it and the small-signal step's as the overshoot card judges, Infinity when that
 *  grows; the load-current noise over the scenario's band from the Noise study). */
export function evaluateMetric(s: Scenario, metric: MapMetric, opts: StudyOptions = {}): number {
  if (metric === "noiseRms") return runNoiseStudy(s, engineOptions(opts)).rms;
  // 10 points per decade locate the crossover well enough for a map (the margin is interpolated).
  if (metric === "phaseMarginDeg") return runLoopGain(s, engineOptions(opts), { pointsPerDecade: 10 }, false).phaseMarginDeg ?? NaN;
  const m = runStep(s, engineOptions(opts)).metrics;
  if (metric === "judgedOvershootPct") {
    const small = runSmallSignalStep(s, engineOptions(opts));
    return judgedOvershootPct(m.overshootPct, small);
  }
  return metric === "overshootPct" ? m.overshootPct : m.settlingTime1pct ?? NaN;
}

/** 2D sweep grid over the flat indices [start, end) of an nx × ny grid. */
export function map2d(
  s: Scenario,
  settings: { x: SweepAxis; y: SweepAxis; metric: MapMetric },
  opts: StudyOptions = {},
  range?: IndexRange,
): MapResult {
  const xs = axisValues(settings.x);
  const ys = axisValues(settings.y);
  const total = xs.length * ys.length;
  const r = clampRange(range, total);
  const out: MapResult = {
    xPath: settings.x.path, yPath: settings.y.path, xValues: Float64Array.from(xs), yValues: Float64Array.from(ys),
    metric: settings.metric, values: nanArray(total), failures: [],
  };
  for (let k = r.start; k < r.end; k++) {
    checkStop(opts);
    const ix = k % xs.length;
    const iy = Math.floor(k / xs.length);
    const v = withParameter(withParameter(s, settings.x.path, xs[ix]), settings.y.path, ys[iy]);
    try {
      const value = evaluateMetric(v, settings.metric, opts);
      if (value === Infinity) out.failures.push({ index: k, message: GROWS });
      else out.values[k] = value;
    } catch (e) {
      failure(e, k, out.failures);
    }
    opts.onProgress?.(k - r.start + 1, r.end - r.start);
  }
  return out;
}
