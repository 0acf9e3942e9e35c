/**
 * Compensate: the E-series compensation capacitor (and base/gate resistor) that meets the targets over the load range;
 * when asked, also the load snubber (compensate-snubber.ts).
 */
import { isSimError } from "../sim";
import { formatEng } from "../units/eng";
import { eValuesBetween, nearestE, type ESeriesName } from "./eseries";
import { withParameter } from "./parameters";
import { runLoopGain } from "./run";
import { runNoiseStudy } from "./noise";
import type { Scenario } from "./schema";
import { compensateLoadSnubber, type SnubberTuneResult } from "./compensate-snubber";
import { checkStop, clampRange, engineOptions, worstStepOverCorners, type IndexRange, type StudyOptions } from "./study-common";


export interface CompensateSettings {
  targetPhaseMarginDeg: number;
  maxOvershootPct: number;
  series: ESeriesName;
  tuneBaseResistor: boolean;
  /** also search the load snubber (compensate-snubber.ts), with the rest of the design as it is */
  tuneLoadSnubber?: boolean;
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
        const pm = runLoopGain(applyCandidate(corner, cands[i]), engineOptions(opts), { pointsPerDecade: 10 }, false).phaseMarginDeg;
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

/**
 * The smallest index j in [0, n) with meets(j), for a predicate that holds from some index on but may fail again
 * near the end (overshoot falls with capacitance until the loop gets too slow, then wind-up brings it back): probe
 * about eight indices spread over the range, then bisect between the last failing probe and the first that meets.
 * Returns −1 when no probe meets.
 */
export function probeAndBisect(n: number, meets: (j: number) => boolean): number {
  if (n <= 0) return -1;
  const stride = Math.max(1, Math.ceil(n / 8));
  const probes: number[] = [];
  for (let j = 0; j < n; j += stride) probes.push(j);
  if (probes[probes.length - 1] !== n - 1) probes.push(n - 1);
  let lo = -1, hi = -1;
  for (let j = 0; j < probes.length; j++) {
    if (meets(probes[j])) { hi = probes[j]; lo = j > 0 ? probes[j - 1] : -1; break; }
  }
  if (hi < 0) return -1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (meets(mid)) hi = mid; else lo = mid;
  }
  return hi;
}

/** The chosen design's figures re-computed at full resolution (20 points per decade, every load corner). */
export interface CompensateCheck {
  minPhaseMarginDeg: number;
  worstOvershootPct: number;
  worstSettlingTime1pct: number;
  /** whether the re-run still meets both targets */
  meetsTargets: boolean;
}

/** Re-run the chosen design: the current loop's gain at the full frequency resolution and the step at every corner. */
export function checkChoice(s: Scenario, c: CompensateCandidate, settings: CompensateSettings, opts: StudyOptions = {}): CompensateCheck {
  const designs = loadCorners(s).map((corner) => applyCandidate(corner, c));
  let pm = Infinity;
  for (const v of designs) pm = Math.min(pm, runLoopGain(v, engineOptions(opts), {}, false).phaseMarginDeg ?? NaN);
  const { os, ts } = worstStepOverCorners(designs, opts);
  return {
    minPhaseMarginDeg: pm, worstOvershootPct: os, worstSettlingTime1pct: ts,
    meetsTargets: pm >= settings.targetPhaseMarginDeg && os <= settings.maxOvershootPct && Number.isFinite(ts),
  };
}

/**
 * Why no value was chosen. A coil can ring against the capacitance at its terminals far above the loop's crossover
 * (lib/design/explain.ts loadTankNote): no compensation value reaches that ring, a load snubber does.
 */
function noChoice(s: Scenario, settings: CompensateSettings, reachesMargin: boolean, noisy: boolean, tried: string): string {
  if (!reachesMargin) return `No ${settings.series} value from 10 pF to 100 nF${tried} reaches ${settings.targetPhaseMarginDeg}° phase margin at every load corner.`;
  if (noisy) return `Values that reach ${settings.targetPhaseMarginDeg}° without overshooting more than ${settings.maxOvershootPct} % exceed the noise target.`;
  const coil = s.load.kind === "coil" && !settings.tuneLoadSnubber
    ? " If the ring is the coil's own, against the capacitance at its terminals (the verdict's note says so), no compensation value reaches it: ask for a load snubber too."
    : "";
  return `Values that reach ${settings.targetPhaseMarginDeg}° still overshoot more than ${settings.maxOvershootPct} % (the worse of the full and the small-signal step).${coil}`;
}

function describe(best: NonNullable<CompensateResult["chosen"]>, settings: CompensateSettings, tried: number): string {
  const what = `Compensation capacitor ${formatEng(best.compCapacitor, "F")}${settings.tuneBaseResistor ? ` with base/gate resistor ${formatEng(best.baseResistor, "Ω")}` : ""}`;
  const figures = `current-loop phase margin ≥ ${best.minPhaseMarginDeg.toFixed(1)}° (${best.phaseMarginToSpareDeg.toFixed(1)}° to spare) and overshoot ≤ ${best.worstOvershootPct.toFixed(2)} % over the load range (the worse of the full and the small-signal step); settles to ±1 % in ${Number.isFinite(best.worstSettlingTime1pct) ? formatEng(best.worstSettlingTime1pct, "s") : "— (not within the record)"}`;
  const check = best.check
    ? best.check.meetsTargets
      ? " Re-run of the chosen design confirms these figures."
      : ` Re-run of the chosen design at full resolution: phase margin ${best.check.minPhaseMarginDeg.toFixed(1)}°, overshoot ${Number.isFinite(best.check.worstOvershootPct) ? `${best.check.worstOvershootPct.toFixed(2)} %` : "unbounded (the small-signal step grows)"} — it misses a target; treat the choice as a starting point.`
    : "";
  return `${what}: ${figures} (${tried} candidate${tried === 1 ? "" : "s"} tried).${check}`;
}

/** Fill in `chosen.check` and the figures it confirms (the re-run's, which are at full resolution). */
function confirm(s: Scenario, best: NonNullable<CompensateResult["chosen"]>, settings: CompensateSettings, opts: StudyOptions): void {
  try {
    const check = checkChoice(s, best, settings, opts);
    best.check = check;
    best.minPhaseMarginDeg = check.minPhaseMarginDeg;
    best.worstOvershootPct = check.worstOvershootPct;
    best.worstSettlingTime1pct = check.worstSettlingTime1pct;
    best.phaseMarginToSpareDeg = check.minPhaseMarginDeg - settings.targetPhaseMarginDeg;
    best.overshootToSparePct = settings.maxOvershootPct - check.worstOvershootPct;
  } catch (e) {
    if (!isSimError(e) || e.code === "cancelled") throw e;
    best.check = null;
  }
}

export interface CompensateResult {
  chosen: (CompensateCandidate & {
    minPhaseMarginDeg: number;
    worstOvershootPct: number;
    worstSettlingTime1pct: number;
    phaseMarginToSpareDeg: number;
    overshootToSparePct: number;
    /** the re-run of the chosen design (null when it could not be re-run); the figures above are the re-run's */
    check: CompensateCheck | null;
  }) | null;
  /** every candidate's phase margin, and the step metrics of those that were simulated */
  scanned: CompensateScanRow[];
  stepped: (CompensateCandidate & { worstOvershootPct: number; worstSettlingTime1pct: number })[];
  /** the load-snubber search, when asked for (settings.tuneLoadSnubber) */
  loadSnubber: SnubberTuneResult | null;
  message: string;
}

/** The load-snubber search when the settings ask for it, and the message with its sentence added. */
function withSnubberSearch(s: Scenario, settings: CompensateSettings, opts: StudyOptions, message: string): { loadSnubber: SnubberTuneResult | null; message: string } {
  if (!settings.tuneLoadSnubber) return { loadSnubber: null, message };
  const loadSnubber = compensateLoadSnubber(s, settings, { ...opts, onProgress: undefined });
  return { loadSnubber, message: `${message} ${loadSnubber.message}` };
}

/**
 * Pick among scanned candidates. Those meeting the phase-margin target at every load corner are ordered by
 * capacitance (a smaller capacitor means a faster loop). Overshoot falls as the capacitor grows, so a bisection over
 * that list finds the smallest value whose worst-corner overshoot meets the limit; it and the next `extra` values
 * above it are compared and the fastest worst-case settling wins. Each step run covers every load corner.
 */
/**
 * With a noise target (tolerances.noiseTarget) the load-current noise of a candidate, at the nominal load, must stay
 * under it: a constraint on the pick. Without a target the noise is ignored (true).
 */
function quietEnough(s: Scenario, cand: CompensateCandidate, opts: StudyOptions): boolean {
  const target = s.tolerances.noiseTarget;
  if (target === undefined) return true;
  try {
    return runNoiseStudy(applyCandidate(s, cand), engineOptions(opts)).rms <= target;
  } catch (e) {
    if (!isSimError(e) || e.code === "cancelled") throw e;
    return false;
  }
}

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
    let res: { os: number; ts: number } | null = null;
    try {
      res = worstStepOverCorners(corners.map((corner) => applyCandidate(corner, cand)), opts);
      stepped.push({ compCapacitor: cand.compCapacitor, baseResistor: cand.baseResistor, worstOvershootPct: res.os, worstSettlingTime1pct: res.ts });
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
  let tooNoisy = false;
  const quiet = (k: number): boolean => quietEnough(s, passing[k], opts);
  let best: CompensateResult["chosen"] = null;
  if (passing.length > 0) {
    const hi = probeAndBisect(passing.length, meets);
    if (hi >= 0) {
      for (let k = hi; k < Math.min(passing.length, hi + 1 + extra); k++) {
        const m = measure(k);
        if (!m || m.os > settings.maxOvershootPct) continue;
        if (!best || m.ts < best.worstSettlingTime1pct) {
          if (!quiet(k)) { tooNoisy = true; continue; }
          const cand = passing[k];
          best = {
            compCapacitor: cand.compCapacitor,
            baseResistor: cand.baseResistor,
            minPhaseMarginDeg: cand.minPhaseMarginDeg,
            worstOvershootPct: m.os,
            worstSettlingTime1pct: m.ts,
            phaseMarginToSpareDeg: cand.minPhaseMarginDeg - settings.targetPhaseMarginDeg,
            overshootToSparePct: settings.maxOvershootPct - m.os,
            check: null,
          };
        }
      }
    }
  }
  stepped.sort((a, b) => a.compCapacitor - b.compCapacitor || a.baseResistor - b.baseResistor);
  if (best) confirm(s, best, settings, opts);
  const message = best ? describe(best, settings, rows.length) : noChoice(s, settings, passing.length > 0, tooNoisy, "");
  return { chosen: best, scanned: rows, stepped, ...withSnubberSearch(s, settings, opts, message) };
}

/**
 * Auto-compensation in one thread, evaluating lazily: the same search as compensateScan + compensatePick (probe
 * about eight values, bisect to the smallest that meets both the phase-margin and the overshoot target at every
 * load corner, then compare it with the next values up for settling), but a candidate's phase margin is computed
 * only when the search visits it. `scanned` then lists the visited candidates. A worker pool should rather split
 * compensateScan and call compensatePick.
 */
export function compensate(s: Scenario, settings: CompensateSettings, opts: StudyOptions = {}, extra = 2): CompensateResult {
  const cands = compensateCandidates(s, settings);
  const corners = loadCorners(s);
  const scanned = new Map<number, CompensateScanRow>();
  const stepped = new Map<number, { os: number; ts: number } | null>();
  const quiet: StudyOptions = { ...opts, onProgress: undefined };
  let visits = 0;
  const budget = cands.length;
  const progress = () => opts.onProgress?.(Math.min(++visits, budget), budget);
  const pmRow = (k: number): CompensateScanRow => {
    let row = scanned.get(k);
    if (!row) {
      row = compensateScan(s, settings, quiet, { start: k, end: k + 1 })[0];
      scanned.set(k, row);
      progress();
    }
    return row;
  };
  const step = (k: number): { os: number; ts: number } | null => {
    if (stepped.has(k)) return stepped.get(k)!;
    checkStop(opts);
    let res: { os: number; ts: number } | null = null;
    try {
      res = worstStepOverCorners(corners.map((corner) => applyCandidate(corner, cands[k])), opts);
    } catch (e) {
      if (!isSimError(e) || e.code === "cancelled") throw e;
    }
    stepped.set(k, res);
    return res;
  };
  const pmOk = (k: number) => {
    const pm = pmRow(k).minPhaseMarginDeg;
    return Number.isFinite(pm) && pm >= settings.targetPhaseMarginDeg;
  };
  const meets = (k: number) => {
    if (!pmOk(k)) return false;
    const m = step(k);
    return m !== null && m.os <= settings.maxOvershootPct;
  };
  let best: CompensateResult["chosen"] = null;
  let noisy = false;
  // One search per base/gate resistor (candidates come grouped by resistor, ascending in capacitance).
  const groups = new Map<number, number[]>();
  cands.forEach((c, k) => groups.set(c.baseResistor, [...(groups.get(c.baseResistor) ?? []), k]));
  for (const idx of groups.values()) {
    const n = idx.length;
    const hi = probeAndBisect(n, (j) => meets(idx[j]));
    if (hi < 0) continue;
    for (let j = hi; j < Math.min(n, hi + 1 + extra); j++) {
      const k = idx[j];
      if (!meets(k)) continue;
      const m = step(k)!;
      if (!best || m.ts < best.worstSettlingTime1pct) {
        if (!quietEnough(s, cands[k], opts)) { noisy = true; continue; }
        const row = pmRow(k);
        best = {
          compCapacitor: row.compCapacitor,
          baseResistor: row.baseResistor,
          minPhaseMarginDeg: row.minPhaseMarginDeg,
          worstOvershootPct: m.os,
          worstSettlingTime1pct: m.ts,
          phaseMarginToSpareDeg: row.minPhaseMarginDeg - settings.targetPhaseMarginDeg,
          overshootToSparePct: settings.maxOvershootPct - m.os,
          check: null,
        };
      }
    }
  }
  opts.onProgress?.(budget, budget);
  const rows = [...scanned.values()].sort((a, b) => a.index - b.index);
  const steppedRows = [...stepped.entries()]
    .filter((e): e is [number, { os: number; ts: number }] => e[1] !== null)
    .map(([k, m]) => ({ compCapacitor: cands[k].compCapacitor, baseResistor: cands[k].baseResistor, worstOvershootPct: m.os, worstSettlingTime1pct: m.ts }))
    .sort((a, b) => a.compCapacitor - b.compCapacitor || a.baseResistor - b.baseResistor);
  const anyPm = rows.some((r) => Number.isFinite(r.minPhaseMarginDeg) && r.minPhaseMarginDeg >= settings.targetPhaseMarginDeg);
  if (best) confirm(s, best, settings, opts);
  const message = best ? describe(best, settings, rows.length) : noChoice(s, settings, anyPm, noisy, " that was tried");
  return { chosen: best, scanned: rows, stepped: steppedRows, ...withSnubberSearch(s, settings, opts, message) };
}
