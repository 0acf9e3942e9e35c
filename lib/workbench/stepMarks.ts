/**
 * Where the step plot marks its figures: the 10 % and 90 % crossings of the step, the peak in the step's direction
 * and the ±1 % settling band around the final value — read from the same record and the design layer's metrics
 * (lib/design/metrics: initial and final values), so the marks sit where the figures were measured.
 */
import type { StepMetrics } from "@/lib/design/metrics";

export interface StepMarks {
  /** times of the 10 % and 90 % crossings, s (null when the record does not cross) */
  t10: number | null;
  t90: number | null;
  /** the extreme in the step's direction: time, s, and value, A */
  peak: { t: number; value: number } | null;
  /** the ±1 % band: final ± 1 % of the step, A */
  band: { low: number; high: number } | null;
}

function crossing(t: ArrayLike<number>, y: ArrayLike<number>, level: number, rising: boolean): number | null {
  for (let i = 1; i < y.length; i++) {
    const a = y[i - 1]!, b = y[i]!;
    if (rising ? a < level && b >= level : a > level && b <= level) {
      const f = b !== a ? (level - a) / (b - a) : 0;
      return t[i - 1]! + f * (t[i]! - t[i - 1]!);
    }
  }
  return null;
}

export function stepMarks(time: ArrayLike<number>, y: ArrayLike<number>, m: Pick<StepMetrics, "initial" | "final">): StepMarks {
  const step = m.final - m.initial;
  if (!Number.isFinite(step) || step === 0 || time.length < 2) return { t10: null, t90: null, peak: null, band: null };
  const rising = step > 0;
  const t10 = crossing(time, y, m.initial + 0.1 * step, rising);
  const t90 = crossing(time, y, m.initial + 0.9 * step, rising);
  let peak: StepMarks["peak"] = null;
  if (t10 !== null) {
    let ip = -1;
    for (let i = 0; i < y.length; i++) {
      if (time[i]! < t10) continue;
      if (ip < 0 || (rising ? y[i]! > y[ip]! : y[i]! < y[ip]!)) ip = i;
    }
    if (ip >= 0) peak = { t: time[ip]!, value: y[ip]! };
  }
  const half = Math.abs(step) * 0.01;
  return { t10, t90, peak, band: { low: m.final - half, high: m.final + half } };
}
