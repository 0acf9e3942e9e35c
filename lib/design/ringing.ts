/**
 * Ringing of a settling tail: frequency and damping of the dominant oscillation, three ways —
 *  - peak spacing and logarithmic decrement of successive extrema (textbook second-order identification);
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
}

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

/** Extrema of x (uniform samples) with their parabola-refined positions (in samples) and values. */
function extrema(x: Float64Array): { pos: number; value: number }[] {
  const out: { pos: number; value: number }[] = [];
  for (let i = 1; i < x.length - 1; i++) {
    const a = x[i - 1], b = x[i], c = x[i + 1];
    if ((b > a && b >= c) || (b < a && b <= c)) {
      const den = a - 2 * b + c;
      const d = den !== 0 ? (0.5 * (a - c)) / den : 0;
      out.push({ pos: i + d, value: b - 0.25 * (a - c) * d });
    }
  }
  return out;
}

/** Peak spacing and logarithmic decrement from extrema of alternating sign. */
export function peakSpacing(x: Float64Array, dt: number): { hz: number | null; damping: number | null } {
  const peak = Math.max(...Array.from(x, Math.abs));
  const ex = extrema(x).filter((e) => Math.abs(e.value) > 1e-3 * peak);
  // Keep alternating signs only (a monotone creep has no ringing).
  const alt: typeof ex = [];
  for (const e of ex) if (alt.length === 0 || Math.sign(e.value) !== Math.sign(alt[alt.length - 1].value)) alt.push(e);
  if (alt.length < 3) return { hz: null, damping: null };
  const halfPeriods = (alt[alt.length - 1].pos - alt[0].pos) / (alt.length - 1);
  const hz = 1 / (2 * halfPeriods * dt);
  // Log decrement over one full period from same-sign extrema: δ = ln(x_k / x_{k+2}); ζ = δ/√(4π² + δ²).
  let sum = 0, cnt = 0;
  for (let k = 0; k + 2 < alt.length && k < 6; k++) {
    const r = alt[k].value / alt[k + 2].value;
    if (r > 0) { sum += Math.log(r); cnt++; }
  }
  const delta = cnt ? sum / cnt : NaN;
  const damping = Number.isFinite(delta) ? delta / Math.sqrt(4 * Math.PI * Math.PI + delta * delta) : null;
  return { hz, damping };
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

/**
 * Estimate the ringing of `y` around `final` over t ≥ tFrom (the tail after the first peak, say).
 * Returns nulls when the tail does not ring.
 */
export function estimateRinging(t: ArrayLike<number>, y: ArrayLike<number>, final: number, tFrom: number, tTo = t[t.length - 1]): RingingEstimate {
  const none: RingingEstimate = {
    frequencyHz: null, dampingRatio: null, peakSpacingHz: null, logDecrementDamping: null, fftHz: null, pencilHz: null, pencilDamping: null,
  };
  if (!(tTo > tFrom)) return none;
  // 1024 uniform points for the extrema and FFT.
  const n = 1024;
  const dt = (tTo - tFrom) / (n - 1);
  const x = resampleUniform(t, y, tFrom, tTo, n);
  for (let i = 0; i < n; i++) x[i] -= final;
  const ps = peakSpacing(x, dt);
  const fftHz = ps.hz !== null ? fftPeakHz(x, dt) : null;
  // Pencil on ~8 samples per ringing period over at most ~12 periods (keeps the SVD small), or 160 points.
  let pencilHz: number | null = null;
  let pencilDamping: number | null = null;
  // No alternating extrema in the tail: nothing rings, and a pencil would only fit interpolation artefacts.
  if (ps.hz !== null) {
    const span = ps.hz ? Math.min(tTo - tFrom, 12 / ps.hz) : tTo - tFrom;
    const np = ps.hz ? Math.max(40, Math.min(200, Math.round(span * ps.hz * 10))) : 160;
    const xp = resampleUniform(t, y, tFrom, tFrom + span, np);
    for (let i = 0; i < np; i++) xp[i] -= final;
    const dtp = span / (np - 1);
    let peak = 0;
    for (let i = 0; i < np; i++) peak = Math.max(peak, Math.abs(xp[i]));
    const modes = matrixPencil(xp, dtp).filter(
      (m) => m.im > 1e-9 / dtp && m.im < (Math.PI / dtp) * 0.95 && m.re < 0 && m.amplitude > 0.05 * peak,
    );
    if (modes.length) {
      // Cross-check with the peak spacing: the dominant pair is the one that rings at the spacing's frequency
      // (within ±30 %); the largest amplitude among those.
      const target = 2 * Math.PI * ps.hz;
      const near = modes.filter((m) => Math.abs(m.im / target - 1) < 0.3);
      const pool = near.length ? near : modes;
      pool.sort((a, b) => b.amplitude - a.amplitude);
      const d = pool[0];
      pencilHz = d.im / (2 * Math.PI);
      const wn = Math.hypot(d.re, d.im);
      pencilDamping = -d.re / wn;
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
  };
}
