/** What every study shares: options, index ranges, cancellation and failure bookkeeping. */
import { SimError, isSimError } from "../sim";

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
