/** What every study shares: options, index ranges, cancellation and failure bookkeeping. */
import { SimError, isSimError } from "../sim";
import { runSmallSignalStep, runStep } from "./run";
import type { Scenario } from "./schema";
import { judgedOvershootPct, judgedSettling } from "./verdicts";

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

export function checkStop(opts: StudyOptions): void {
  if (opts.shouldStop?.()) throw new SimError("cancelled", "Study cancelled");
}

export function engineOptions(opts: StudyOptions) {
  return { shouldStop: opts.shouldStop, timeBudgetMs: opts.timeBudgetMs };
}

export function clampRange(range: IndexRange | undefined, total: number): IndexRange {
  const start = Math.max(0, Math.min(total, range?.start ?? 0));
  const end = Math.max(start, Math.min(total, range?.end ?? total));
  return { start, end };
}

/** Record an engine failure (NaN in the results) unless it is a cancellation, which ends the study. */
export function failure(e: unknown, index: number, failures: { index: number; message: string }[]): void {
  if (isSimError(e) && e.code === "cancelled") throw e;
  if (!isSimError(e)) throw e;
  failures.push({ index, message: e.message });
}


export const nanArray = (n: number) => new Float64Array(n).fill(NaN);

/**
 * The worst step over a set of designs (a candidate at every load corner), judged as the headline cards judge it:
 * the overshoot and the ±1 % settling of the worse of the full step and its linearised twin (`judgedOvershootPct`,
 * `judgedSettling`; Infinity when one does not settle within its record). A run the engine cannot finish throws.
 */
export function worstStepOverCorners(corners: readonly Scenario[], opts: StudyOptions): { os: number; ts: number } {
  let os = 0, ts = 0;
  for (const corner of corners) {
    const m = runStep(corner, engineOptions(opts)).metrics;
    const small = runSmallSignalStep(corner, engineOptions(opts));
    os = Math.max(os, judgedOvershootPct(m.overshootPct, small));
    ts = Math.max(ts, judgedSettling(m, small).settlingTime1pct ?? Infinity);
  }
  return { os, ts };
}
