/**
 * Step-response figures of a sampled waveform (measured or simulated): 10–90 % rise time, overshoot, peak time,
 * settling time into a band, and ringing frequency (fft.js on the settling tail, refined by zero-crossing spacing).
 *
 * Rise time, overshoot and peak time come from the design layer's `stepMetrics`. What lives here is what measured
 * captures need and the design layer lacks: a step edge found in the data, levels taken as medians of noisy pre- and
 * post-step stretches, a settling band the team chooses, and a ringing estimate that tolerates scope noise.
 */
import FFT from "fft.js";
import { stepMetrics } from "@/lib/design/metrics";

export interface StepFigures {
  /** Level before the step (median of the pre-step samples), in the waveform's unit. */
  initial: number;
  /** Level after the step (median of the last tenth of the record). */
  final: number;
  /** final − initial. */
  amplitude: number;
  /** Time the figures are counted from, s: the given edge (stimulus), else the 50 % crossing. */
  edgeTime: number;
  /** Time of the first 50 % crossing after the step starts, s (what alignment matches); null if never crossed. */
  halfCrossing: number | null;
  /** 10 %–90 % rise time, s; null when the waveform never reaches 90 %. */
  riseTime: number | null;
  /** Peak overshoot beyond the final level, % of the amplitude (0 when there is none). */
  overshootPct: number;
  /** Time of the peak after the edge, s (relative to the edge). */
  peakTime: number | null;
  /** Time from the edge until the waveform stays inside ±settleBand of the amplitude, s; null if it never does. */
  settlingTime: number | null;
  /** Dominant ringing frequency on the settling tail, Hz; null when the tail does not ring. */
  ringingHz: number | null;
}

export interface StepFigureOptions {
  /** Settling band as a fraction of the amplitude (0.02 = ±2 %). */
  settleBand?: number;
  /** Step edge time, s, when known (e.g. the simulated stimulus); otherwise found at the 50 % crossing. */
  edgeTime?: number;
}

function median(values: Float64Array, from: number, to: number): number {
  const part = Array.from(values.subarray(from, to)).sort((a, b) => a - b);
  if (part.length === 0) return NaN;
  const m = part.length >> 1;
  return part.length % 2 ? part[m] : 0.5 * (part[m - 1] + part[m]);
}

/** First time after index `from` where the normalised waveform y crosses `level` going the step's way (linear interpolation). */
function crossingUp(time: Float64Array, y: Float64Array, level: number, from: number): { t: number; i: number } | null {
  for (let i = Math.max(1, from); i < y.length; i++) {
    if (y[i - 1] < level && y[i] >= level) {
      const f = (level - y[i - 1]) / (y[i] - y[i - 1]);
      return { t: time[i - 1] + f * (time[i] - time[i - 1]), i };
    }
  }
  return null;
}

/** Linear interpolation of (time, values) at t, clamped to the ends. `hint` speeds up monotone sweeps. */
export function interpolateAt(time: Float64Array, values: Float64Array, t: number, hint = 0): { v: number; i: number } {
  const n = time.length;
  if (t <= time[0]) return { v: values[0], i: 0 };
  if (t >= time[n - 1]) return { v: values[n - 1], i: n - 1 };
  let i = Math.min(Math.max(hint, 1), n - 1);
  if (time[i - 1] > t) i = 1;
  while (i < n - 1 && time[i] < t) i++;
  const f = (t - time[i - 1]) / (time[i] - time[i - 1]);
  return { v: values[i - 1] + f * (values[i] - values[i - 1]), i };
}

/** Find the 50 % crossing of a step in a waveform from its first and last stretches (no edge given). */
export function findStepEdge(time: Float64Array, values: Float64Array): number {
  const n = values.length;
  if (n < 4) throw new RangeError("a step needs at least 4 samples");
  const head = Math.max(2, Math.floor(n * 0.05));
  const tail = Math.max(2, Math.floor(n * 0.1));
  const initial = median(values, 0, head);
  const final = median(values, n - tail, n);
  const amplitude = final - initial;
  if (!(Math.abs(amplitude) > 0)) throw new RangeError("no step found: the first and last levels are equal");
  const y = new Float64Array(n);
  for (let i = 0; i < n; i++) y[i] = (values[i] - initial) / amplitude;
  const c = crossingUp(time, y, 0.5, 1);
  if (!c) throw new RangeError("no step found: the waveform never crosses halfway between its first and last levels");
  return c.t;
}

/** Ringing frequency of a decaying oscillation about zero: FFT peak (Hann, zero-padded, Gaussian-interpolated), refined by zero crossings. */
export function ringingFrequency(time: Float64Array, y: Float64Array, from: number): number | null {
  const n = y.length;
  if (n - from < 16) return null;
  const t0 = time[from];
  const t1 = time[n - 1];
  const span = t1 - t0;
  if (!(span > 0)) return null;
  // Resample uniformly: simulated time steps are adaptive and scope exports may skip samples.
  const count = Math.min(8192, Math.max(256, n - from));
  const dt = span / (count - 1);
  const size = Math.min(1 << 16, 1 << Math.ceil(Math.log2(count * 8)));
  const input = new Array<number>(size).fill(0);
  let hint = from;
  for (let k = 0; k < count; k++) {
    const r = interpolateAt(time, y, t0 + k * dt, hint);
    hint = r.i;
    const w = 0.5 - 0.5 * Math.cos((2 * Math.PI * k) / (count - 1));
    input[k] = r.v * w;
  }
  const fft = new FFT(size);
  const out = fft.createComplexArray() as number[];
  fft.realTransform(out, input);
  const half = size / 2;
  const mag = new Float64Array(half);
  for (let k = 0; k < half; k++) mag[k] = Math.hypot(out[2 * k], out[2 * k + 1]);
  // Skip the lowest bins (the window's main lobe around DC spans 2 bins of the unpadded record).
  const minBin = Math.ceil((2 * size) / count) + 1;
  let best = minBin;
  for (let k = minBin; k < half - 1; k++) if (mag[k] > mag[best]) best = k;
  if (best <= minBin || best >= half - 2) return null;
  const a = Math.log(mag[best - 1] + 1e-300);
  const b = Math.log(mag[best] + 1e-300);
  const c = Math.log(mag[best + 1] + 1e-300);
  const shift = (0.5 * (a - c)) / (a - 2 * b + c);
  const fftHz = (best + shift) / (size * dt);

  // Zero crossings while the oscillation is well above the noise: exact spacing π/ωd for a damped sinusoid.
  let peak = 0;
  for (let i = from; i < n; i++) peak = Math.max(peak, Math.abs(y[i]));
  const floor = 0.05 * peak;
  const crossings: number[] = [];
  let envelope = peak;
  for (let i = from + 1; i < n; i++) {
    if ((y[i - 1] < 0) !== (y[i] < 0) && y[i] !== y[i - 1]) {
      if (envelope < floor) break;
      crossings.push(time[i - 1] + (y[i - 1] / (y[i - 1] - y[i])) * (time[i] - time[i - 1]));
      envelope = 0;
    }
    envelope = Math.max(envelope, Math.abs(y[i]));
  }
  if (crossings.length >= 3) {
    const crossHz = (crossings.length - 1) / (2 * (crossings[crossings.length - 1] - crossings[0]));
    if (Math.abs(crossHz - fftHz) < 0.2 * fftHz) return crossHz;
  }
  return fftHz;
}

/** Step figures of one waveform. Throws RangeError when there is no step to measure. */
export function stepFigures(time: Float64Array, values: Float64Array, options: StepFigureOptions = {}): StepFigures {
  const n = values.length;
  if (n !== time.length) throw new RangeError(`time has ${time.length} samples, values ${n}`);
  const band = options.settleBand ?? 0.02;
  const edgeGuess = options.edgeTime ?? findStepEdge(time, values);
  let edgeIndex = 0;
  while (edgeIndex < n - 1 && time[edgeIndex] < edgeGuess) edgeIndex++;
  const head = edgeIndex >= 2 ? edgeIndex : Math.max(2, Math.floor(n * 0.05));
  const initial = median(values, 0, head);
  const final = median(values, n - Math.max(2, Math.floor(n * 0.1)), n);
  const amplitude = final - initial;
  if (!(Math.abs(amplitude) > 0)) throw new RangeError("no step found: the levels before and after the step are equal");

  const y = new Float64Array(n);
  for (let i = 0; i < n; i++) y[i] = (values[i] - initial) / amplitude;
  // Start of the step: the last sample at or before the edge that is still below 5 % (the edge itself when the
  // waveform has not yet moved there, as with a simulated stimulus time).
  let startIndex = edgeIndex;
  while (startIndex > 0 && y[startIndex] >= 0.05) startIndex--;
  const c50 = crossingUp(time, y, 0.5, startIndex + 1);
  const edgeTime = options.edgeTime ?? (c50 ? c50.t : edgeGuess);

  // Rise time, overshoot and peak: the design layer's definitions, so simulated figures here match the workbench.
  // It is given the robust levels and the sample where the step starts (noise cannot trip its crossings there).
  const tStart = time[startIndex];
  const shared = stepMetrics(time, values, tStart, { initial, final });
  const riseTime = shared.riseTime;
  const overshootPct = shared.overshootPct;
  const peakTime = shared.peakTime === null ? null : shared.peakTime + tStart - edgeTime;
  let peakIndex = startIndex;
  for (let i = startIndex; i < n; i++) if (y[i] > y[peakIndex]) peakIndex = i;

  let lastOutside = -1;
  for (let i = n - 1; i >= startIndex; i--) if (Math.abs(y[i] - 1) > band) { lastOutside = i; break; }
  let settlingTime: number | null;
  if (lastOutside === n - 1) settlingTime = null;
  else if (lastOutside < 0) settlingTime = 0;
  else {
    // Interpolate where the waveform re-enters the band between lastOutside and the next sample.
    const i = lastOutside;
    const target = y[i] > 1 ? 1 + band : 1 - band;
    const f = (target - y[i]) / (y[i + 1] - y[i]);
    settlingTime = time[i] + Math.min(1, Math.max(0, f)) * (time[i + 1] - time[i]) - edgeTime;
  }

  let ringingHz: number | null = null;
  if (overshootPct > 2 * band * 100 && peakIndex > 0 && peakIndex < n - 16) {
    const tail = new Float64Array(n);
    for (let i = 0; i < n; i++) tail[i] = y[i] - 1;
    ringingHz = ringingFrequency(time, tail, peakIndex);
  }

  return { initial, final, amplitude, edgeTime, halfCrossing: c50 ? c50.t : null, riseTime, overshootPct, peakTime, settlingTime, ringingHz };
}
