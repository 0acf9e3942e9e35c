/**
 * Studies: Sweep (1D), Map (2D), Spread (Monte Carlo over tolerances) and Compensate (auto-compensation).
 * Pure and chunkable: every study takes an index range [start, end) so a worker pool can split it, reports progress
 * and polls `shouldStop` between runs (and passes it to the engine so a long run stops too). A run the engine
 * cannot solve becomes NaN with its message in `failures`; cancellation throws SimError "cancelled".
 */
import { SimError, isSimError } from "../sim";
import { formatEng } from "../units/eng";
import { fullScaleCurrent } from "./checks";
import { nearestE, eValuesBetween, type ESeriesName } from "./eseries";
import { runLoopGain, runOperatingPoint, runStep } from "./run";
import type { Scenario, SweepAxis } from "./schema";
import { deviation, histogram, rngForRun, summarize, type Summary } from "./stats";

export interface StudyOptions {
  /** called after each run with (runs done in this chunk, runs in this chunk) */
  onProgress?: (done: number, total: number) => void;
  shouldStop?: () => boolean;
  /** engine time budget per run, ms */
  timeBudgetMs?: number;
}

export interface IndexRange {
  start: number;
  end: number;
}

export interface SweepableParameter {
  path: string;
  label: string;
  unit: string;
  from: number;
  to: number;
  scale: "linear" | "log";
}

/** Parameters a study can vary, addressed by path into the scenario. */
export const SWEEPABLE_PARAMETERS: readonly SweepableParameter[] = [
  { path: "parts.compCapacitor", label: "Compensation capacitor", unit: "F", from: 10e-12, to: 100e-9, scale: "log" },
  { path: "parts.baseResistor", label: "Base/gate resistor", unit: "Ω", from: 10, to: 10e3, scale: "log" },
  { path: "parts.feedbackResistor", label: "Feedback resistor", unit: "Ω", from: 100, to: 1e6, scale: "log" },
  { path: "parts.senseResistor", label: "Sense resistor", unit: "Ω", from: 0.01, to: 10, scale: "log" },
  { path: "parts.dividerTop", label: "Divider top", unit: "Ω", from: 1e3, to: 1e6, scale: "log" },
  { path: "parts.dividerBottom", label: "Divider bottom", unit: "Ω", from: 100, to: 100e3, scale: "log" },
  { path: "load.resistance", label: "Load resistance", unit: "Ω", from: 1, to: 100, scale: "log" },
  { path: "load.inductance", label: "Load inductance", unit: "H", from: 10e-6, to: 100e-3, scale: "log" },
  { path: "load.extraCapacitance", label: "Extra load capacitance", unit: "F", from: 1e-9, to: 10e-6, scale: "log" },
  { path: "load.cable.length", label: "Cable length", unit: "m", from: 0.5, to: 50, scale: "log" },
  { path: "load.cellVoltage", label: "Cell voltage", unit: "V", from: 3, to: 4.2, scale: "linear" },
  { path: "supplies.load", label: "Load supply", unit: "V", from: 5, to: 60, scale: "linear" },
  { path: "opamp.GBW", label: "Op-amp gain–bandwidth", unit: "Hz", from: 100e3, to: 100e6, scale: "log" },
  { path: "opamp.Rout", label: "Op-amp output resistance", unit: "Ω", from: 1, to: 500, scale: "log" },
  { path: "pass.betaF", label: "Pass-device beta", unit: "", from: 10, to: 500, scale: "log" },
  { path: "pass.Cjc0", label: "Pass-device Cjc0", unit: "F", from: 10e-12, to: 1e-9, scale: "log" },
  { path: "thermal.ambient", label: "Ambient temperature", unit: "°C", from: -20, to: 85, scale: "linear" },
];

/** Read a numeric parameter by path ("parts.compCapacitor"). */
export function getParameter(s: Scenario, path: string): number {
  let cur: unknown = s;
  for (const key of path.split(".")) {
    if (cur === null || typeof cur !== "object" || !(key in (cur as object))) throw new RangeError(`Unknown parameter "${path}"`);
    cur = (cur as Record<string, unknown>)[key];
  }
  if (typeof cur !== "number") throw new RangeError(`Parameter "${path}" is not a number`);
  return cur;
}

/** A copy of the scenario with one numeric parameter changed. */
export function withParameter(s: Scenario, path: string, value: number): Scenario {
  getParameter(s, path);
  if (!Number.isFinite(value)) throw new RangeError(`${path}: ${value} is not a finite number`);
  const copy = structuredClone(s);
  const keys = path.split(".");
  let cur = copy as unknown as Record<string, unknown>;
  for (let i = 0; i < keys.length - 1; i++) cur = cur[keys[i]] as Record<string, unknown>;
  cur[keys[keys.length - 1]] = value;
  return copy;
}

/** The values of a sweep axis: linear, logarithmic (both ends included) or the given list. */
export function axisValues(axis: SweepAxis): number[] {
  if (axis.scale === "list") {
    if (axis.values.length === 0) throw new RangeError(`${axis.path}: the list of values is empty`);
    return [...axis.values];
  }
  const n = axis.points;
  if (n === 1) return [axis.from];
  if (axis.scale === "log") {
    if (!(axis.from > 0 && axis.to > 0)) throw new RangeError(`${axis.path}: a logarithmic sweep needs positive ends`);
    const a = Math.log(axis.from), b = Math.log(axis.to);
    return Array.from({ length: n }, (_, i) => Math.exp(a + ((b - a) * i) / (n - 1)));
  }
  return Array.from({ length: n }, (_, i) => axis.from + ((axis.to - axis.from) * i) / (n - 1));
}

function checkStop(opts: StudyOptions): void {
  if (opts.shouldStop?.()) throw new SimError("cancelled", "Study cancelled");
}

function engineOptions(opts: StudyOptions) {
  return { shouldStop: opts.shouldStop, timeBudgetMs: opts.timeBudgetMs };
}

function clampRange(range: IndexRange | undefined, total: number): IndexRange {
  const start = Math.max(0, Math.min(total, range?.start ?? 0));
  const end = Math.max(start, Math.min(total, range?.end ?? total));
  return { start, end };
}

/** Record an engine failure (NaN in the results) unless it is a cancellation, which ends the study. */
function failure(e: unknown, index: number, failures: { index: number; message: string }[]): void {
  if (isSimError(e) && e.code === "cancelled") throw e;
  if (!isSimError(e)) throw e;
  failures.push({ index, message: e.message });
}

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
  settlingTime1pct: Float64Array;
  riseTime: Float64Array;
  finalCurrent: Float64Array;
  points: SweepPoint[];
  failures: { index: number; message: string }[];
}

const nanArray = (n: number) => new Float64Array(n).fill(NaN);

/** 1D sweep: step response and loop gain at each value, and metric-versus-parameter columns. */
export function sweep1d(s: Scenario, axis: SweepAxis, opts: StudyOptions = {}, range?: IndexRange): SweepResult {
  const values = axisValues(axis);
  const n = values.length;
  const r = clampRange(range, n);
  const out: SweepResult = {
    path: axis.path,
    values: Float64Array.from(values),
    phaseMarginDeg: nanArray(n), gainMarginDb: nanArray(n), crossoverHz: nanArray(n), overshootPct: nanArray(n),
    settlingTime1pct: nanArray(n), riseTime: nanArray(n), finalCurrent: nanArray(n),
    points: [],
    failures: [],
  };
  for (let i = r.start; i < r.end; i++) {
    checkStop(opts);
    const v = withParameter(s, axis.path, values[i]);
    const point: SweepPoint = { index: i, value: values[i], step: null, loop: null };
    try {
      const lg = runLoopGain(v, engineOptions(opts));
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
    out.points.push(point);
    opts.onProgress?.(i - r.start + 1, r.end - r.start);
  }
  return out;
}

export type MapMetric = "phaseMarginDeg" | "overshootPct" | "settlingTime1pct";

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

/** Evaluate one metric for one scenario (PM from the loop gain; overshoot and settling from the step). */
export function evaluateMetric(s: Scenario, metric: MapMetric, opts: StudyOptions = {}): number {
  // 10 points per decade locate the crossover well enough for a map (the margin is interpolated).
  if (metric === "phaseMarginDeg") return runLoopGain(s, engineOptions(opts), { pointsPerDecade: 10 }).phaseMarginDeg ?? NaN;
  const m = runStep(s, engineOptions(opts)).metrics;
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
      out.values[k] = evaluateMetric(v, settings.metric, opts);
    } catch (e) {
      failure(e, k, out.failures);
    }
    opts.onProgress?.(k - r.start + 1, r.end - r.start);
  }
  return out;
}

/** Part deviations drawn for one Spread run (relative, except offsets in V, bias in A and β absolute). */
export interface SpreadDraw {
  dividerTop: number; dividerBottom: number; feedbackResistor: number; senseResistor: number; compCapacitor: number;
  howlandR1: number; howlandR2: number; howlandR3: number; howlandR4: number;
  vos: number; ib: number; betaF: number;
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
  return { scenario: c, draw };
}

export interface SpreadResult {
  seed: number;
  runs: number;
  /** per run (NaN outside the chunk or on failure): load-current error against the nominal ideal, % of full scale */
  errorPctFs: Float64Array;
  phaseMarginDeg: Float64Array;
  failures: { index: number; message: string }[];
}

/** Monte Carlo over the tolerances: operating point (current error) and loop gain (phase margin) per run. */
export function spread(s: Scenario, settings: { runs: number; seed: number }, opts: StudyOptions = {}, range?: IndexRange): SpreadResult & {
  summary?: { errorPctFs: Summary; phaseMarginDeg: Summary; errorHistogram: { edges: Float64Array; counts: Float64Array }; pmHistogram: { edges: Float64Array; counts: Float64Array }; worstError: { index: number; errorPctFs: number; draw: SpreadDraw } | null; worstPhaseMargin: { index: number; phaseMarginDeg: number; draw: SpreadDraw } | null };
} {
  const n = settings.runs;
  const r = clampRange(range, n);
  const out: SpreadResult = { seed: settings.seed, runs: n, errorPctFs: nanArray(n), phaseMarginDeg: nanArray(n), failures: [] };
  const nominalIdeal = fullScaleCurrent(s) * (s.stimulus.commandHigh / s.stimulus.commandFullScale);
  const fs = fullScaleCurrent(s);
  for (let i = r.start; i < r.end; i++) {
    checkStop(opts);
    const { scenario } = spreadScenario(s, settings.seed, i);
    try {
      const { summary } = runOperatingPoint(scenario, engineOptions(opts));
      out.errorPctFs[i] = ((Math.abs(summary.iLoad) - Math.abs(nominalIdeal)) / fs) * 100;
      out.phaseMarginDeg[i] = runLoopGain(scenario, engineOptions(opts), { pointsPerDecade: 10 }).phaseMarginDeg ?? NaN;
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
    worstError: we >= 0 ? { index: we, errorPctFs: r.errorPctFs[we], draw: spreadScenario(s, r.seed, we).draw } : null,
    worstPhaseMargin: wp >= 0 ? { index: wp, phaseMarginDeg: r.phaseMarginDeg[wp], draw: spreadScenario(s, r.seed, wp).draw } : null,
  };
}

export interface CompensateSettings {
  targetPhaseMarginDeg: number;
  maxOvershootPct: number;
  series: ESeriesName;
  tuneBaseResistor: boolean;
}

export interface CompensateCandidate {
  compCapacitor: number;
  baseResistor: number;
}

/** The load corners the design must serve: lightest, nominal and heaviest load resistance (and cell voltages). */
export function loadCorners(s: Scenario): Scenario[] {
  const L = s.load;
  const rs = [...new Set([L.resistanceMin, L.resistance, L.resistanceMax].filter((r) => r > 0))];
  if (L.kind === "led" || rs.length === 0) return [s];
  return rs.map((r) => withParameter(s, "load.resistance", r));
}

/** Candidates: series capacitor values from 10 pF to 100 nF (× base resistors from 0.5× to 2× the present one). */
export function compensateCandidates(s: Scenario, settings: CompensateSettings): CompensateCandidate[] {
  const caps = eValuesBetween(10e-12, 100e-9, settings.series);
  const rbs = settings.tuneBaseResistor
    ? [...new Set([0.5, 1, 2].map((f) => nearestE(s.parts.baseResistor * f, settings.series)))]
    : [s.parts.baseResistor];
  const out: CompensateCandidate[] = [];
  for (const rb of rbs) for (const c of caps) out.push({ compCapacitor: c, baseResistor: rb });
  return out;
}

function applyCandidate(s: Scenario, c: CompensateCandidate): Scenario {
  return withParameter(withParameter(s, "parts.compCapacitor", c.compCapacitor), "parts.baseResistor", c.baseResistor);
}

export interface CompensateScanRow extends CompensateCandidate {
  index: number;
  /** smallest phase margin over the load corners, degrees (NaN when a corner failed) */
  minPhaseMarginDeg: number;
}

/** Phase-margin scan of candidates [start, end) over the load corners (AC only: fast; split it across a pool). */
export function compensateScan(s: Scenario, settings: CompensateSettings, opts: StudyOptions = {}, range?: IndexRange): CompensateScanRow[] {
  const cands = compensateCandidates(s, settings);
  const r = clampRange(range, cands.length);
  const corners = loadCorners(s);
  const rows: CompensateScanRow[] = [];
  // Coarse AC grid: 10 points per decade is enough to locate crossover by interpolation.
  for (let i = r.start; i < r.end; i++) {
    checkStop(opts);
    let minPm = Infinity;
    for (const corner of corners) {
      try {
        const pm = runLoopGain(applyCandidate(corner, cands[i]), engineOptions(opts), { pointsPerDecade: 10 }).phaseMarginDeg;
        minPm = Math.min(minPm, pm ?? NaN);
      } catch (e) {
        if (isSimError(e) && e.code === "cancelled") throw e;
        if (!isSimError(e)) throw e;
        minPm = NaN;
      }
    }
    rows.push({ ...cands[i], index: i, minPhaseMarginDeg: minPm });
    opts.onProgress?.(i - r.start + 1, r.end - r.start);
  }
  return rows;
}

export interface CompensateResult {
  chosen: (CompensateCandidate & {
    minPhaseMarginDeg: number;
    worstOvershootPct: number;
    worstSettlingTime1pct: number;
    phaseMarginToSpareDeg: number;
    overshootToSparePct: number;
  }) | null;
  /** every candidate's phase margin, and the step metrics of those that were simulated */
  scanned: CompensateScanRow[];
  stepped: (CompensateCandidate & { worstOvershootPct: number; worstSettlingTime1pct: number })[];
  message: string;
}

/**
 * Pick among scanned candidates. Those meeting the phase-margin target at every load corner are ordered by
 * capacitance (a smaller capacitor means a faster loop). Overshoot falls as the capacitor grows, so a bisection over
 * that list finds the smallest value whose worst-corner overshoot meets the limit; it and the next `extra` values
 * above it are compared and the fastest worst-case settling wins. Each step run covers every load corner.
 */
export function compensatePick(s: Scenario, settings: CompensateSettings, rows: CompensateScanRow[], opts: StudyOptions = {}, extra = 2): CompensateResult {
  const corners = loadCorners(s);
  const passing = rows
    .filter((r) => Number.isFinite(r.minPhaseMarginDeg) && r.minPhaseMarginDeg >= settings.targetPhaseMarginDeg)
    .sort((a, b) => a.compCapacitor - b.compCapacitor || a.baseResistor - b.baseResistor);
  const stepped: CompensateResult["stepped"] = [];
  const cache = new Map<number, { os: number; ts: number } | null>();
  const measure = (k: number): { os: number; ts: number } | null => {
    if (cache.has(k)) return cache.get(k)!;
    checkStop(opts);
    const cand = passing[k];
    let os = 0, ts = 0;
    let res: { os: number; ts: number } | null = null;
    try {
      for (const corner of corners) {
        const m = runStep(applyCandidate(corner, cand), engineOptions(opts)).metrics;
        os = Math.max(os, m.overshootPct);
        ts = Math.max(ts, m.settlingTime1pct ?? Infinity);
      }
      res = { os, ts };
      stepped.push({ compCapacitor: cand.compCapacitor, baseResistor: cand.baseResistor, worstOvershootPct: os, worstSettlingTime1pct: ts });
    } catch (e) {
      if (!isSimError(e) || e.code === "cancelled") throw e;
    }
    cache.set(k, res);
    return res;
  };
  const meets = (k: number) => {
    const m = measure(k);
    return m !== null && m.os <= settings.maxOvershootPct;
  };
  let best: CompensateResult["chosen"] = null;
  if (passing.length > 0) {
    // Overshoot falls with capacitance until the loop gets too slow (then wind-up brings it back), so first probe
    // about eight values spread over the list, then bisect between the last failing probe and the first that meets.
    const n = passing.length;
    const stride = Math.max(1, Math.ceil(n / 8));
    const probes: number[] = [];
    for (let k = 0; k < n; k += stride) probes.push(k);
    if (probes[probes.length - 1] !== n - 1) probes.push(n - 1);
    let lo = -1, hi = -1;
    for (let j = 0; j < probes.length; j++) {
      if (meets(probes[j])) { hi = probes[j]; lo = j > 0 ? probes[j - 1] : -1; break; }
    }
    if (hi >= 0) {
      while (hi - lo > 1) {
        const mid = (lo + hi) >> 1;
        if (meets(mid)) hi = mid; else lo = mid;
      }
      for (let k = hi; k < Math.min(passing.length, hi + 1 + extra); k++) {
        const m = measure(k);
        if (!m || m.os > settings.maxOvershootPct) continue;
        if (!best || m.ts < best.worstSettlingTime1pct) {
          const cand = passing[k];
          best = {
            compCapacitor: cand.compCapacitor,
            baseResistor: cand.baseResistor,
            minPhaseMarginDeg: cand.minPhaseMarginDeg,
            worstOvershootPct: m.os,
            worstSettlingTime1pct: m.ts,
            phaseMarginToSpareDeg: cand.minPhaseMarginDeg - settings.targetPhaseMarginDeg,
            overshootToSparePct: settings.maxOvershootPct - m.os,
          };
        }
      }
    }
  }
  stepped.sort((a, b) => a.compCapacitor - b.compCapacitor || a.baseResistor - b.baseResistor);
  const message = best
    ? `Compensation capacitor ${formatEng(best.compCapacitor, "F")}${settings.tuneBaseResistor ? ` with base/gate resistor ${formatEng(best.baseResistor, "Ω")}` : ""}: phase margin ≥ ${best.minPhaseMarginDeg.toFixed(1)}° (${best.phaseMarginToSpareDeg.toFixed(1)}° to spare) and overshoot ≤ ${best.worstOvershootPct.toFixed(2)} % over the load range; settles to ±1 % in ${formatEng(best.worstSettlingTime1pct, "s")}.`
    : passing.length === 0
      ? `No ${settings.series} value from 10 pF to 100 nF reaches ${settings.targetPhaseMarginDeg}° phase margin at every load corner.`
      : `Values that reach ${settings.targetPhaseMarginDeg}° still overshoot more than ${settings.maxOvershootPct} %.`;
  return { chosen: best, scanned: rows, stepped, message };
}

/** Auto-compensation in one call: scan every candidate, then pick. */
export function compensate(s: Scenario, settings: CompensateSettings, opts: StudyOptions = {}): CompensateResult {
  const total = compensateCandidates(s, settings).length;
  const scanOpts: StudyOptions = { ...opts, onProgress: opts.onProgress ? (d) => opts.onProgress!(d, total + 3) : undefined };
  const rows = compensateScan(s, settings, scanOpts);
  const pickOpts: StudyOptions = { ...opts, onProgress: undefined };
  const result = compensatePick(s, settings, rows, pickOpts);
  opts.onProgress?.(total + 3, total + 3);
  return result;
}
