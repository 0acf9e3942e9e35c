/**
 * Where a recorded step happens and between which levels: what a bench capture needs before the step metrics of
 * metrics.ts can be read on it (the simulation knows its command edge; a capture does not). Levels are medians, so
 * scope noise and a few spikes do not move them; the edge is the 50 % crossing between them.
 */

/** Median of values[from, to). */
export function medianOf(values: ArrayLike<number>, from = 0, to = values.length): number {
  const part: number[] = [];
  for (let i = Math.max(0, from); i < Math.min(to, values.length); i++) part.push(values[i]);
  if (part.length === 0) return NaN;
  part.sort((a, b) => a - b);
  const m = part.length >> 1;
  return part.length % 2 ? part[m] : 0.5 * (part[m - 1] + part[m]);
}

export interface StepEdge {
  /** 50 % crossing between `initial` and `final`, s (linear interpolation between samples) */
  time: number;
  /** first sample at or after the crossing */
  index: number;
  /** level before the step: median of the samples before the edge's foot */
  initial: number;
  /** level after the step: median of the record's last tenth */
  final: number;
}

/** Fraction of the record whose median is the final level. */
const TAIL = 0.1;

function halfCrossing(t: ArrayLike<number>, y: ArrayLike<number>, initial: number, final: number, from: number): { time: number; index: number } | null {
  const amp = final - initial;
  const level = initial + 0.5 * amp;
  for (let i = Math.max(1, from); i < y.length; i++) {
    const a = (y[i - 1] - level) * Math.sign(amp), b = (y[i] - level) * Math.sign(amp);
    if (a < 0 && b >= 0) {
      const f = b !== a ? -a / (b - a) : 0;
      return { time: t[i - 1] + f * (t[i] - t[i - 1]), index: i };
    }
  }
  return null;
}

/**
 * The step in a record: its levels and its 50 % crossing. With `after` (a known command edge, s) the initial level is
 * the median of the samples before it and the crossing is searched from there; otherwise the initial level is first
 * taken from the record's first 2 %, then again from everything before the edge's foot (the last sample below 10 %
 * before the first crossing), so a step early in the record does not pull the level. Throws RangeError when the
 * record has no step.
 */
export function findStepEdge(t: ArrayLike<number>, y: ArrayLike<number>, opts: { after?: number } = {}): StepEdge {
  const n = y.length;
  if (n < 4 || t.length !== n) throw new RangeError("A step needs matching time and value arrays of at least 4 samples.");
  const final = medianOf(y, n - Math.max(2, Math.floor(n * TAIL)), n);
  if (opts.after !== undefined) {
    let i0 = 0;
    while (i0 < n - 1 && t[i0] < opts.after) i0++;
    const initial = i0 > 0 ? medianOf(y, 0, i0) : y[0];
    if (!(Math.abs(final - initial) > 0)) throw new RangeError("No step found: the levels before and after the step are equal.");
    const c = halfCrossing(t, y, initial, final, i0);
    if (!c) throw new RangeError("No step found: the record never crosses halfway between its levels after the step.");
    return { ...c, initial, final };
  }
  let initial = medianOf(y, 0, Math.max(3, Math.floor(n * 0.02)));
  if (!(Math.abs(final - initial) > 0)) throw new RangeError("No step found: the first and last levels are equal.");
  let c = halfCrossing(t, y, initial, final, 1);
  if (!c) throw new RangeError("No step found: the record never crosses halfway between its first and last levels.");
  // The foot of the edge: walk back from the crossing to the last sample still below 10 % of the step.
  const amp = final - initial;
  let foot = c.index - 1;
  while (foot > 0 && ((y[foot] - initial) / amp) > 0.1) foot--;
  if (foot >= 3) {
    initial = medianOf(y, 0, foot);
    if (!(Math.abs(final - initial) > 0)) throw new RangeError("No step found: the levels before and after the step are equal.");
    c = halfCrossing(t, y, initial, final, 1) ?? c;
  }
  return { ...c, initial, final };
}
