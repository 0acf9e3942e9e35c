/**
 * Reducing waveforms to the numbers a design is judged by: step metrics from a transient, stability margins from a
 * loop gain, bandwidth from a closed-loop response, and the second-order relations that link them.
 */
import { estimateRinging, NO_RINGING, type RingingEstimate } from "./ringing";

export interface StepMetrics {
  /* For a disturbance (load or supply step) the percentages and bands refer to the final value: see disturbanceMetrics. */
  /** value before the step and the final value (mean of the last 2 % of the record) */
  initial: number;
  final: number;
  /** 10–90 % rise time, s */
  riseTime: number | null;
  /** overshoot beyond the final value in the direction of the step, % of the step */
  overshootPct: number;
  /** time of the extreme after the step, measured from the step, s */
  peakTime: number | null;
  /** time from the step after which the response stays within ±1 % / ±0.1 % of the step around the final value, s */
  settlingTime1pct: number | null;
  settlingTime01pct: number | null;
  /** false when the response has not settled within ±1 % by the end of the record (settlingTime1pct is then null) */
  settled: boolean;
  /** settling band asked for (`settleBand` option, default 0.01 = ±1 %), as a fraction of the step */
  settleBand: number;
  /** time from the step after which the response stays within ±settleBand; null when not within the record */
  settlingTime: number | null;
  /** final minus target, as a fraction of the target (null without a target) */
  steadyStateError: number | null;
  ringing: RingingEstimate;
}

/** Largest lift of an interpolated peak above the computed sample, as a fraction of the step (the engine's reltol). */
const PEAK_LIFT_LIMIT = 1e-3;

function crossing(t: ArrayLike<number>, y: ArrayLike<number>, from: number, level: number, rising: boolean): number | null {
  for (let i = Math.max(1, from); i < y.length; i++) {
    const a = y[i - 1], b = y[i];
    if (rising ? a < level && b >= level : a > level && b <= level) {
      const f = b !== a ? (level - a) / (b - a) : 0;
      return t[i - 1] + f * (t[i] - t[i - 1]);
    }
  }
  return null;
}

/**
 * Fraction of the record after the step that the response must spend inside the band, at the end, to count as
 * settled. The final value is estimated from the record's last 2 %, so a response still moving at the end would
 * otherwise look "settled" around wherever it happened to stop.
 */
const SETTLED_DWELL = 0.05;

function settleTime(t: ArrayLike<number>, y: ArrayLike<number>, from: number, final: number, band: number, tStep: number): number | null {
  // The last sample outside the band; settled if it is not the last sample of the record.
  let last = -1;
  for (let i = y.length - 1; i >= from; i--) {
    if (Math.abs(y[i] - final) > band) { last = i; break; }
  }
  if (last === y.length - 1) return null;
  if (last < 0) return Math.max(0, t[from] - tStep);
  // Interpolate the exit of the band between samples last and last+1.
  const a = y[last] - final, b = y[last + 1] - final;
  const edge = a > 0 ? band : -band;
  const f = b !== a ? (edge - a) / (b - a) : 0;
  const settled = Math.max(0, t[last] + Math.min(1, Math.max(0, f)) * (t[last + 1] - t[last]) - tStep);
  const tEnd = t[t.length - 1] - tStep;
  return settled <= (1 - SETTLED_DWELL) * tEnd ? settled : null;
}

/**
 * The frame a step is measured in: the first sample at or after the step (i0), the value before it (or `initial`),
 * and the final value (or `final`; by default the mean of the record's last 2 % after the step).
 */
function stepFrame(
  who: string, t: ArrayLike<number>, y: ArrayLike<number>, tStep: number, opts: { initial?: number; final?: number },
): { n: number; i0: number; initial: number; final: number } {
  const n = t.length;
  if (n < 3 || y.length !== n) throw new RangeError(`${who} needs matching time and value arrays of 3 or more samples`);
  let i0 = 0;
  while (i0 < n - 1 && t[i0] < tStep) i0++;
  const initial = opts.initial ?? y[Math.max(0, i0 - 1)];
  let final = opts.final ?? NaN;
  if (!Number.isFinite(final)) {
    const tTail = t[n - 1] - 0.02 * (t[n - 1] - tStep);
    let sum = 0, cnt = 0;
    for (let i = n - 1; i >= 0 && t[i] >= tTail; i--) { sum += y[i]; cnt++; }
    final = cnt ? sum / cnt : y[n - 1];
  }
  return { n, i0, initial, final };
}

/**
 * Step metrics of `y(t)` for a step at `tStep`. `initial` defaults to the value at the step; `target` (the ideal
 * final value) gives the steady-state error.
 */
export function stepMetrics(
  t: ArrayLike<number>,
  y: ArrayLike<number>,
  tStep: number,
  opts: {
    initial?: number; final?: number; target?: number; disturbance?: boolean;
    /** settling band for `settlingTime`, fraction of the step (the team's tolerance; default 0.01) */
    settleBand?: number;
  } = {},
): StepMetrics {
  if (opts.disturbance) return disturbanceMetrics(t, y, tStep, opts);
  const { n, i0, initial, final } = stepFrame("stepMetrics", t, y, tStep, opts);
  const step = final - initial;
  const rising = step >= 0;
  const steadyStateError = opts.target !== undefined && opts.target !== 0 ? (final - opts.target) / opts.target : null;
  const emptyRinging: RingingEstimate = NO_RINGING;
  const settleBand = opts.settleBand ?? 0.01;
  if (step === 0 || !Number.isFinite(step)) {
    return {
      initial, final, riseTime: null, overshootPct: 0, peakTime: null, settlingTime1pct: 0, settlingTime01pct: 0, settled: true, settleBand, settlingTime: 0, steadyStateError,
      ringing: emptyRinging,
    };
  }
  const t10 = crossing(t, y, i0, initial + 0.1 * step, rising);
  const t90 = crossing(t, y, i0, initial + 0.9 * step, rising);
  const riseTime = t10 !== null && t90 !== null ? t90 - t10 : null;
  // Peak: the extreme in the direction of the step, refined by a parabola through its neighbours.
  let ip = i0;
  for (let i = i0; i < n; i++) if (rising ? y[i] > y[ip] : y[i] < y[ip]) ip = i;
  let peakValue = y[ip];
  let peakT = t[ip];
  if (ip > 0 && ip < n - 1) {
    const ta = t[ip - 1], tb = t[ip], tc = t[ip + 1];
    const a = y[ip - 1], b = y[ip], c = y[ip + 1];
    // Parabola through three (possibly non-uniform) points.
    const d1 = (b - a) / (tb - ta), d2 = (c - b) / (tc - tb);
    const curv = (d2 - d1) / (tc - ta);
    if (curv !== 0) {
      // Newton form y ≈ a + d1(t−ta) + curv(t−ta)(t−tb): the vertex is where its derivative vanishes.
      const tv = (ta + tb) / 2 - d1 / (2 * curv);
      if (tv > ta && tv < tc) {
        peakT = tv;
        // The parabola may not raise the peak above the computed sample by more than the integrator's own relative
        // tolerance (1e-3 of the step): a larger lift would be invented, not measured.
        const lift = a + d1 * (tv - ta) + curv * (tv - ta) * (tv - tb) - b;
        const cap = PEAK_LIFT_LIMIT * Math.abs(step);
        peakValue = b + Math.max(-cap, Math.min(cap, lift));
      }
    }
  }
  const overshootPct = Math.max(0, ((peakValue - final) / step) * 100);
  const peakTime = overshootPct > 0 ? peakT - tStep : null;
  const band = Math.abs(step);
  const settlingTime1pct = settleTime(t, y, i0, final, 0.01 * band, tStep);
  const settlingTime01pct = settleTime(t, y, i0, final, 0.001 * band, tStep);
  const settlingTime = settleBand === 0.01 ? settlingTime1pct : settleTime(t, y, i0, final, settleBand * band, tStep);
  const ringing = overshootPct > 0.05 ? estimateRinging(t, y, final, peakT) : emptyRinging;
  return {
    initial, final, riseTime, overshootPct, peakTime, settlingTime1pct, settlingTime01pct, settled: settlingTime1pct !== null, settleBand, settlingTime,
    steadyStateError,
    ringing,
  };
}

/**
 * Metrics of the recovery from a disturbance (load or supply step) that should leave the output unchanged: the
 * percentages and settling bands refer to the final value itself, not to the (tiny) change. `overshootPct` is the
 * largest deviation from the final value, `peakTime` when it happens, `riseTime` is null.
 */
export function disturbanceMetrics(
  t: ArrayLike<number>,
  y: ArrayLike<number>,
  tStep: number,
  opts: { initial?: number; final?: number; target?: number; settleBand?: number } = {},
): StepMetrics {
  const { n, i0, initial, final } = stepFrame("disturbanceMetrics", t, y, tStep, opts);
  const scale = Math.abs(final) > 0 ? Math.abs(final) : Math.max(Math.abs(initial), 1e-30);
  let ip = i0;
  for (let i = i0; i < n; i++) if (Math.abs(y[i] - final) > Math.abs(y[ip] - final)) ip = i;
  const deviation = Math.abs(y[ip] - final);
  const settlingTime1pct = settleTime(t, y, i0, final, 0.01 * scale, tStep);
  const settlingTime01pct = settleTime(t, y, i0, final, 0.001 * scale, tStep);
  const settleBand = opts.settleBand ?? 0.01;
  const settlingTime = settleBand === 0.01 ? settlingTime1pct : settleTime(t, y, i0, final, settleBand * scale, tStep);
  const ringing = deviation > 0.0005 * scale ? estimateRinging(t, y, final, t[ip]) : NO_RINGING;
  return {
    initial,
    final,
    riseTime: null,
    overshootPct: (deviation / scale) * 100,
    peakTime: deviation > 0 ? t[ip] - tStep : null,
    settlingTime1pct,
    settlingTime01pct,
    settled: settlingTime1pct !== null,
    settleBand,
    settlingTime,
    steadyStateError: opts.target !== undefined && opts.target !== 0 ? (final - opts.target) / opts.target : null,
    ringing,
  };
}

/** Phase unwrapped to a continuous curve, degrees. */
export function unwrapDeg(phase: Float64Array): Float64Array {
  const out = new Float64Array(phase.length);
  let offset = 0;
  for (let i = 0; i < phase.length; i++) {
    if (i > 0) {
      const d = phase[i] + offset - out[i - 1];
      if (d > 180) offset -= 360 * Math.round(d / 360);
      else if (d < -180) offset -= 360 * Math.round(d / 360);
    }
    out[i] = phase[i] + offset;
  }
  return out;
}

export interface LoopMetrics {
  magDb: Float64Array;
  phaseDeg: Float64Array;
  phaseMarginDeg: number | null;
  gainMarginDb: number | null;
  /** the gain crossover the phase margin is taken at (the one with the smallest margin), Hz */
  crossoverHz: number | null;
  /** every |T| = 1 crossing, Hz, in rising frequency (more than one: the magnitude dips back through 0 dB) */
  crossovers: number[];
  /** frequency of the −180° crossing the gain margin is taken at, Hz */
  phaseCrossoverHz: number | null;
  /** every frequency where ∠T passes through −180° (mod 360°), Hz */
  phaseCrossovers: number[];
  /**
   * modulus (stability) margin: the smallest distance of T(jω) from −1, min |1 + T| (1 = far, 0 = oscillating),
   * and where it occurs. It catches what a single crossover misses, e.g. a notch that almost touches 0 dB.
   */
  modulusMargin: number;
  modulusMarginHz: number;
  /**
   * The closed loop is unstable: T(jω) encircles −1 (Nyquist criterion, taking the loop itself as stable when
   * broken, as it is for these circuits): the net count of crossings of the negative real axis left of −1, ∠T falling
   * through −180° (mod 360°) while |T| > 1 counted +1 and rising −1, is not zero. Then no margin is a margin: the
   * verdicts fail them all.
   */
  unstable: boolean;
}

function logInterp(f: Float64Array, i: number, frac: number): number {
  return Math.exp(Math.log(f[i - 1]) + frac * (Math.log(f[i]) - Math.log(f[i - 1])));
}

/**
 * Margins of a loop gain T(jω) (T > 0 at low frequency for negative feedback; the closed loop is 1/(1+T)-shaped).
 * Every |T| = 1 crossing is a gain crossover: PM = 180° + ∠T (wrapped to [−180°, 180°)) at each, the smallest
 * reported with the crossover it occurs at. Every passage of ∠T through −180° (mod 360°) is a phase crossover:
 * GM = −|T|dB at each, the one nearest 0 dB reported (a negative value: the gain would have to fall that much for
 * the loop to oscillate — a conditionally stable loop). Modulus margin: min |1 + T| over the sweep.
 */
export function loopMetrics(freq: Float64Array, re: Float64Array, im: Float64Array): LoopMetrics {
  const n = freq.length;
  const magDb = new Float64Array(n);
  const raw = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    magDb[i] = 20 * Math.log10(Math.hypot(re[i], im[i]));
    raw[i] = (Math.atan2(im[i], re[i]) * 180) / Math.PI;
  }
  const phaseDeg = unwrapDeg(raw);
  // Reference the unwrapped phase so the low-frequency end lies in (−180°, 180°].
  if (n > 0) {
    const k = Math.round(phaseDeg[0] / 360);
    if (k !== 0) for (let i = 0; i < n; i++) phaseDeg[i] -= 360 * k;
  }
  // Every |T| = 1 crossing is a gain crossover; with several (a load resonance can dip |T| through 0 dB and back),
  // the margin that matters is the smallest one, and the crossover reported is where it occurs (common practice).
  let crossoverHz: number | null = null;
  let phaseMarginDeg: number | null = null;
  const crossovers: number[] = [];
  for (let i = 1; i < n; i++) {
    if ((magDb[i - 1] >= 0) === (magDb[i] >= 0)) continue;
    const frac = magDb[i - 1] / (magDb[i - 1] - magDb[i]);
    const ph = phaseDeg[i - 1] + frac * (phaseDeg[i] - phaseDeg[i - 1]);
    const f = logInterp(freq, i, frac);
    crossovers.push(f);
    // Margin from the nearest −180° (mod 360°), so an unwrapped phase below −180° gives a negative margin.
    // 180° + ∠T wrapped into [−180°, 180°): an unwrapping jump of 360° across a notch must not inflate the margin.
    const margin = ((((180 + ph) % 360) + 540) % 360) - 180;
    if (phaseMarginDeg === null || margin < phaseMarginDeg) {
      phaseMarginDeg = margin;
      crossoverHz = f;
    }
  }
  let gainMarginDb: number | null = null;
  let phaseCrossoverHz: number | null = null;
  const phaseCrossovers: number[] = [];
  let encirclements = 0;
  // the crossing left of −1 nearest 0 dB where ∠T falls: the one that makes an unstable loop unstable
  let falling: { gm: number; f: number } | null = null;
  for (let i = 1; i < n; i++) {
    // the odd multiple of 180° between the two samples, if any: ∠T passes through −180° (mod 360°) there
    const lo = Math.min(phaseDeg[i - 1], phaseDeg[i]), hi = Math.max(phaseDeg[i - 1], phaseDeg[i]);
    const level = 360 * Math.ceil((lo - 180) / 360) + 180;
    if (!(level > lo && level <= hi) || phaseDeg[i - 1] === phaseDeg[i]) continue;
    const frac = (phaseDeg[i - 1] - level) / (phaseDeg[i - 1] - phaseDeg[i]);
    const f = logInterp(freq, i, frac);
    const gm = -(magDb[i - 1] + frac * (magDb[i] - magDb[i - 1]));
    phaseCrossovers.push(f);
    if (gm < 0) {
      const down = phaseDeg[i] < phaseDeg[i - 1];
      encirclements += down ? 1 : -1;
      if (down && (falling === null || gm > falling.gm)) falling = { gm, f };
    }
    if (gainMarginDb === null || Math.abs(gm) < Math.abs(gainMarginDb)) {
      gainMarginDb = gm;
      phaseCrossoverHz = f;
    }
  }
  // An unstable loop reports the (negative) margin of the crossing behind the instability, not a positive one elsewhere.
  if (encirclements !== 0 && falling !== null) {
    gainMarginDb = falling.gm;
    phaseCrossoverHz = falling.f;
  }
  let modulusMargin = Infinity, modulusMarginHz = NaN;
  for (let i = 0; i < n; i++) {
    const d = Math.hypot(1 + re[i], im[i]);
    if (d < modulusMargin) { modulusMargin = d; modulusMarginHz = freq[i]; }
  }
  return {
    magDb, phaseDeg, phaseMarginDeg, gainMarginDb, crossoverHz, crossovers, phaseCrossoverHz, phaseCrossovers, modulusMargin, modulusMarginHz,
    unstable: encirclements !== 0,
  };
}

/** −3 dB bandwidth relative to the first (lowest-frequency) point, Hz; null if it never drops that far. */
export function bandwidth3dB(freq: Float64Array, magDb: Float64Array): number | null {
  const ref = magDb[0] - 3.0103;
  for (let i = 1; i < freq.length; i++) {
    if (magDb[i - 1] >= ref && magDb[i] < ref) {
      const frac = (magDb[i - 1] - ref) / (magDb[i - 1] - magDb[i]);
      return logInterp(freq, i, frac);
    }
  }
  return null;
}

/** Second-order loop T = ωn²/(s(s+2ζωn)): exact phase margin, degrees (Ogata; REFERENCES §5a). */
export function phaseMarginFromDamping(zeta: number): number {
  return (Math.atan((2 * zeta) / Math.sqrt(Math.sqrt(1 + 4 * zeta ** 4) - 2 * zeta * zeta)) * 180) / Math.PI;
}

/** Percent overshoot of a second-order step: 100·exp(−ζπ/√(1−ζ²)). */
export function overshootFromDamping(zeta: number): number {
  if (zeta >= 1) return 0;
  return 100 * Math.exp((-zeta * Math.PI) / Math.sqrt(1 - zeta * zeta));
}

/** Damping ratio for a percent overshoot (inverse of overshootFromDamping). */
export function dampingFromOvershoot(pct: number): number {
  if (pct <= 0) return 1;
  const l = Math.log(pct / 100);
  return -l / Math.sqrt(Math.PI * Math.PI + l * l);
}

/** Damping ratio giving a phase margin (bisection on phaseMarginFromDamping, which rises monotonically). */
export function dampingFromPhaseMargin(pmDeg: number): number {
  let lo = 0, hi = 5;
  for (let k = 0; k < 80; k++) {
    const mid = (lo + hi) / 2;
    if (phaseMarginFromDamping(mid) < pmDeg) lo = mid; else hi = mid;
  }
  return (lo + hi) / 2;
}
