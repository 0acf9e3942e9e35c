/**
 * Ringing of a settling tail: frequency and damping of the dominant oscillation, three ways —
 *  - zero-crossing spacing and logarithmic decrement of the half-cycle extrema (textbook second-order
 *    identification), read on the samples as recorded with a hysteresis band above the noise, each a least-squares
 *    line so a noisy capture gives a standard error rather than a jump;
 *  - the FFT of the resampled, windowed tail (fft.js), peak bin refined by parabolic interpolation;
 *  - the matrix-pencil method (Hua & Sarkar, IEEE Trans. ASSP 38(5), 1990) with ml-matrix's SVD: a Prony-type
 *    estimate of the tail's poles, the dominant complex pair reported.
 */
import FFT from "fft.js";
import { EigenvalueDecomposition, Matrix, SingularValueDecomposition, solve } from "ml-matrix";

export interface RingingEstimate {
  /** best estimate: matrix pencil when it found a complex pair, else peak spacing, Hz */
  frequencyHz: number | null;
  /** damping ratio ζ of the dominant pair (0 = undamped) */
  dampingRatio: number | null;
  peakSpacingHz: number | null;
  logDecrementDamping: number | null;
  fftHz: number | null;
  pencilHz: number | null;
  pencilDamping: number | null;
  /**
   * How far the frequency may be off, Hz: the larger of twice the crossing fit's standard error and the spread between
   * the crossing spacing and the matrix pencil. Null when nothing rings.
   */
  uncertaintyHz: number | null;
  /** true when the crossing spacing and the matrix pencil agree within max(2 %, 3 standard errors); null with fewer than two estimates */
  estimatorsAgree: boolean | null;
}

/** The estimate of a tail that does not ring. */
export const NO_RINGING: RingingEstimate = {
  frequencyHz: null, dampingRatio: null, peakSpacingHz: null, logDecrementDamping: null, fftHz: null, pencilHz: null, pencilDamping: null,
  uncertaintyHz: null, estimatorsAgree: null,
};

/** Linear resampling of (t, y) onto n uniform points over [t0, t1]. */
export function resampleUniform(t: ArrayLike<number>, y: ArrayLike<number>, t0: number, t1: number, n: number): Float64Array {
  const out = new Float64Array(n);
  let j = 0;
  const dt = (t1 - t0) / (n - 1);
  for (let i = 0; i < n; i++) {
    const tt = t0 + i * dt;
    while (j < t.length - 2 && t[j + 1] < tt) j++;
    const ta = t[j];
    const tb = t[j + 1];
    const f = tb > ta ? Math.min(1, Math.max(0, (tt - ta) / (tb - ta))) : 0;
    out[i] = y[j] + (y[j + 1] - y[j]) * f;
  }
  return out;
}

/** Dominant frequency of uniform samples by FFT (Hann window, zero-padded to a power of two, parabolic peak). */
export function fftPeakHz(x: Float64Array, dt: number): number | null {
  const n0 = x.length;
  if (n0 < 8) return null;
  let size = 1;
  while (size < 4 * n0) size <<= 1;
  const f = new FFT(size);
  const input = new Array<number>(size).fill(0);
  let mean = 0;
  for (let i = 0; i < n0; i++) mean += x[i];
  mean /= n0;
  for (let i = 0; i < n0; i++) input[i] = (x[i] - mean) * (0.5 - 0.5 * Math.cos((2 * Math.PI * i) / (n0 - 1)));
  const out = f.createComplexArray() as number[];
  f.realTransform(out, input);
  const half = size / 2;
  const mag = new Float64Array(half);
  for (let k = 0; k < half; k++) mag[k] = Math.hypot(out[2 * k], out[2 * k + 1]);
  let best = 2;
  for (let k = 2; k < half - 1; k++) if (mag[k] > mag[best]) best = k;
  if (mag[best] === 0) return null;
  const a = Math.log(mag[best - 1] + 1e-300), b = Math.log(mag[best] + 1e-300), c = Math.log(mag[best + 1] + 1e-300);
  const den = a - 2 * b + c;
  const d = den !== 0 ? (0.5 * (a - c)) / den : 0;
  return (best + d) / (size * dt);
}

/**
 * Matrix pencil: poles z_i of x[n] = Σ a_i z_i^n from the SVD-filtered Hankel matrix; returns the continuous-time
 * poles s_i = ln(z_i)/dt with least-squares amplitudes. `maxModes` caps the model order.
 */
export function matrixPencil(x: Float64Array, dt: number, maxModes = 6): { re: number; im: number; amplitude: number }[] {
  const N = x.length;
  if (N < 12) return [];
  const L = Math.floor(N / 3);
  const rows = N - L;
  const Y = new Matrix(rows, L + 1);
  for (let i = 0; i < rows; i++) for (let j = 0; j <= L; j++) Y.set(i, j, x[i + j]);
  const svd = new SingularValueDecomposition(Y, { computeLeftSingularVectors: false, autoTranspose: true });
  const sv = svd.diagonal;
  let M = 0;
  while (M < Math.min(maxModes, sv.length) && sv[M] > 1e-6 * sv[0]) M++;
  if (M === 0) return [];
  const V = svd.rightSingularVectors.subMatrix(0, L, 0, M - 1);
  const V1 = V.subMatrix(0, L - 1, 0, M - 1);
  const V2 = V.subMatrix(1, L, 0, M - 1);
  // Least-squares solve V1·A = V2; eigenvalues of A are the z_i.
  const A = solve(V1, V2, true);
  const eig = new EigenvalueDecomposition(A);
  const zr = eig.realEigenvalues;
  const zi = eig.imaginaryEigenvalues;
  const poles: { re: number; im: number }[] = [];
  for (let k = 0; k < zr.length; k++) {
    const mag = Math.hypot(zr[k], zi[k]);
    if (mag <= 0) continue;
    poles.push({ re: Math.log(mag) / dt, im: Math.atan2(zi[k], zr[k]) / dt });
  }
  // Real least-squares amplitudes: basis e^{σt}cos(ωt), e^{σt}sin(ωt) per upper-half pole.
  const modes = poles.filter((p) => p.im >= 0);
  const cols: Float64Array[] = [];
  const owner: number[] = [];
  modes.forEach((p, m) => {
    const c = new Float64Array(N);
    const s = new Float64Array(N);
    for (let n = 0; n < N; n++) {
      const e = Math.exp(p.re * n * dt);
      c[n] = e * Math.cos(p.im * n * dt);
      s[n] = e * Math.sin(p.im * n * dt);
    }
    cols.push(c); owner.push(m);
    if (p.im > 0) { cols.push(s); owner.push(m); }
  });
  if (cols.length === 0) return [];
  const B = new Matrix(N, cols.length);
  for (let n = 0; n < N; n++) for (let k = 0; k < cols.length; k++) B.set(n, k, cols[k][n]);
  const coef = solve(B, Matrix.columnVector(Array.from(x)), true);
  const amp = new Array<number>(modes.length).fill(0);
  for (let k = 0; k < cols.length; k++) amp[owner[k]] += coef.get(k, 0) ** 2;
  return modes.map((p, m) => ({ re: p.re, im: p.im, amplitude: Math.sqrt(amp[m]) }));
}

function median(values: number[]): number {
  if (values.length === 0) return 0;
  const v = [...values].sort((a, b) => a - b);
  const m = v.length >> 1;
  return v.length % 2 ? v[m] : 0.5 * (v[m - 1] + v[m]);
}

/** Least-squares line y = a + b·x with the standard error of the slope (NaN with fewer than three points). */
function fitLine(x: number[], y: number[]): { slope: number; intercept: number; slopeError: number } {
  const n = x.length;
  let mx = 0, my = 0;
  for (let i = 0; i < n; i++) { mx += x[i]; my += y[i]; }
  mx /= n; my /= n;
  let sxx = 0, sxy = 0;
  for (let i = 0; i < n; i++) { sxx += (x[i] - mx) ** 2; sxy += (x[i] - mx) * (y[i] - my); }
  const slope = sxy / sxx;
  const intercept = my - slope * mx;
  let rss = 0;
  for (let i = 0; i < n; i++) rss += (y[i] - intercept - slope * x[i]) ** 2;
  const slopeError = n > 2 ? Math.sqrt(rss / (n - 2) / sxx) : NaN;
  return { slope, intercept, slopeError };
}

/**
 * Noise of a record, standard deviation: the median absolute second difference scaled to σ (white noise gives
 * Δ² with σ√6; 1.4826 turns a median absolute deviation into σ for Gaussian noise, common practice). A smooth,
 * well-sampled waveform has second differences far below its noise, so the ringing itself hardly counts.
 */
export function noiseSigma(x: ArrayLike<number>, from = 0, to = x.length): number {
  const d: number[] = [];
  for (let i = from + 2; i < to; i++) d.push(Math.abs(x[i] - 2 * x[i - 1] + x[i - 2]));
  return (1.4826 * median(d)) / Math.sqrt(6);
}

/**
 * Zero-crossing spacing and logarithmic decrement of the oscillation of y about `final` for t ≥ tFrom, on the samples
 * as recorded. A crossing counts when the signal goes from beyond one side of a hysteresis band (±3 noise σ, at least
 * 0.1 % of the first excursion) to beyond the other; it is placed midway between leaving the one edge and reaching
 * the other (exact for a locally straight crossing). The half period is the least-squares slope of crossing time
 * against crossing number; the decay rate σ the slope of ln|extremum| against time, ζ = σ/√(σ² + ωd²).
 */
/** A half cycle whose extremum is below this many hysteresis bands is noise, not ringing. */
const RING_OVER_NOISE = 3;

export function crossingSpacing(
  t: ArrayLike<number>, y: ArrayLike<number>, final: number, tFrom: number, tTo = t[t.length - 1],
): { hz: number | null; hzError: number | null; damping: number | null } {
  const none = { hz: null, hzError: null, damping: null };
  let i0 = 0;
  while (i0 < t.length - 1 && t[i0] < tFrom) i0++;
  let i1 = t.length - 1;
  while (i1 > i0 && t[i1] > tTo) i1--;
  if (i1 - i0 < 8) return none;
  const x = new Float64Array(i1 - i0 + 1);
  for (let i = i0; i <= i1; i++) x[i - i0] = y[i] - final;
  let first = 0;
  for (let i = 0; i < x.length; i++) first = Math.max(first, Math.abs(x[i]));
  const h = Math.max(3 * noiseSigma(x), 1e-3 * first);
  const at = (k: number, level: number) => {
    const a = x[k - 1], b = x[k];
    const f = b !== a ? (level - a) / (b - a) : 0;
    return t[i0 + k - 1] + f * (t[i0 + k] - t[i0 + k - 1]);
  };
  // Each crossing is the zero of a least-squares line through the samples between leaving one band edge and
  // reaching the other (one or two samples on clean data, a few more on noisy data).
  const zeroBetween = (tA: number, tB: number, kB: number): number => {
    const ts: number[] = [], xs: number[] = [];
    for (let k = kB; k >= 0 && t[i0 + k] >= tA; k--) { ts.push(t[i0 + k]); xs.push(x[k]); }
    if (kB > 0) { ts.push(t[i0 + kB - 1]); xs.push(x[kB - 1]); }
    if (ts.length < 2) return 0.5 * (tA + tB);
    const line = fitLine(xs, ts); // t as a function of x: its value at x = 0
    const z = line.intercept;
    return z >= Math.min(...ts) && z <= Math.max(...ts) ? z : 0.5 * (tA + tB);
  };
  const crossings: number[] = [];
  const peakTimes: number[] = [];
  const peakLogs: number[] = [];
  let side = 0;
  let leave = NaN;
  let peakIndex = -1;
  let ended = false;
  /** Closes the half cycle that just ended; false once its extremum is lost in the noise (the ringing is over). */
  const closePeak = (): boolean => {
    if (peakIndex < 0) return true;
    const k = peakIndex;
    let pos = t[i0 + k], value = Math.abs(x[k]);
    if (k > 0 && k < x.length - 1) {
      // Parabola through the extremum and its neighbours (uniform sampling assumed locally).
      const a = Math.abs(x[k - 1]), b = value, c = Math.abs(x[k + 1]);
      const den = a - 2 * b + c;
      if (den < 0) {
        const d = (0.5 * (a - c)) / den;
        if (Math.abs(d) <= 1) { value = b - 0.25 * (a - c) * d; pos += d * (t[i0 + k + 1] - t[i0 + k - 1]) / 2; }
      }
    }
    if (value < RING_OVER_NOISE * h) return false;
    peakTimes.push(pos); peakLogs.push(Math.log(value));
    return true;
  };
  for (let k = 0; k < x.length; k++) {
    const b = x[k];
    if (k > 0) {
      const a = x[k - 1];
      if (side === 1 && a >= h && b < h) leave = at(k, h);
      if (side === -1 && a <= -h && b > -h) leave = at(k, -h);
    }
    if ((b >= h && side !== 1) || (b <= -h && side !== -1)) {
      const next = b >= h ? 1 : -1;
      // A half cycle lost in the noise ends the ringing; the crossing into it is not trusted either.
      if (!closePeak()) { crossings.pop(); ended = true; break; }
      if (side !== 0) crossings.push(zeroBetween(leave, at(k, next * h), k));
      side = next; peakIndex = k;
    } else if (side !== 0 && Math.abs(b) > Math.abs(x[peakIndex])) peakIndex = k;
  }
  if (!ended && side !== 0 && !closePeak()) crossings.pop();
  if (crossings.length < 3) return none;
  const idx = crossings.map((_, k) => k);
  const fit = fitLine(idx, crossings);
  if (!(fit.slope > 0)) return none;
  const hz = 1 / (2 * fit.slope);
  const hzError = Number.isFinite(fit.slopeError) ? (hz * fit.slopeError) / fit.slope : null;
  let damping: number | null = null;
  if (peakTimes.length >= 2) {
    const decay = -fitLine(peakTimes, peakLogs).slope;
    const wd = 2 * Math.PI * hz;
    if (Number.isFinite(decay)) damping = Math.max(0, decay) / Math.hypot(decay, wd);
  }
  return { hz, hzError, damping };
}

/**
 * Estimate the ringing of `y` around `final` over t ≥ tFrom (the tail after the first peak, say).
 * Returns nulls when the tail does not ring.
 */
export function estimateRinging(t: ArrayLike<number>, y: ArrayLike<number>, final: number, tFrom: number, tTo = t[t.length - 1]): RingingEstimate {
  if (!(tTo > tFrom)) return NO_RINGING;
  const ps = crossingSpacing(t, y, final, tFrom, tTo);
  let fftHz: number | null = null;
  // Pencil on ~10 samples per ringing period over at most ~12 periods (keeps the SVD small).
  let pencilHz: number | null = null;
  let pencilDamping: number | null = null;
  // No crossings in the tail: nothing rings, and a pencil would only fit interpolation artefacts.
  if (ps.hz !== null) {
    const span = Math.min(tTo - tFrom, 12 / ps.hz);
    const np = Math.max(40, Math.min(200, Math.round(span * ps.hz * 10)));
    const xp = resampleUniform(t, y, tFrom, tFrom + span, np);
    for (let i = 0; i < np; i++) xp[i] -= final;
    const dtp = span / (np - 1);
    // The FFT over the same span (the ringing, not the settled rest of the record): a cross-check, reported only.
    fftHz = fftPeakHz(resampleUniform(t, y, tFrom, tFrom + span, 1024).map((v) => v - final), span / 1023);
    let peak = 0;
    for (let i = 0; i < np; i++) peak = Math.max(peak, Math.abs(xp[i]));
    const modes = matrixPencil(xp, dtp).filter(
      (m) => m.im > 1e-9 / dtp && m.im < (Math.PI / dtp) * 0.95 && m.re < 0 && m.amplitude > 0.05 * peak,
    );
    // The dominant pair is the one that rings at the crossings' frequency (within ±30 %), the largest among those;
    // a pencil that finds none there (noise modes only) gives no estimate rather than a wrong one.
    const target = 2 * Math.PI * ps.hz;
    const near = modes.filter((m) => Math.abs(m.im / target - 1) < 0.3).sort((a, b) => b.amplitude - a.amplitude);
    if (near.length) {
      const d = near[0];
      pencilHz = d.im / (2 * Math.PI);
      pencilDamping = -d.re / Math.hypot(d.re, d.im);
    }
  }
  let uncertaintyHz: number | null = null;
  let estimatorsAgree: boolean | null = null;
  if (ps.hz !== null) {
    const fitError = ps.hzError ?? 0;
    uncertaintyHz = 2 * fitError;
    if (pencilHz !== null) {
      const spread = Math.abs(pencilHz - ps.hz);
      uncertaintyHz = Math.max(uncertaintyHz, spread);
      estimatorsAgree = spread <= Math.max(0.02 * ps.hz, 3 * fitError);
    }
  }
  return {
    frequencyHz: pencilHz ?? ps.hz,
    dampingRatio: pencilDamping ?? ps.damping,
    peakSpacingHz: ps.hz,
    logDecrementDamping: ps.damping,
    fftHz,
    pencilHz,
    pencilDamping,
    uncertaintyHz,
    estimatorsAgree,
  };
}
