/** Time-dependent source values and their corners (transient breakpoints). */
import type { Wave } from "./fields";

const MIN_EDGE = 1e-12;

/**
 * Steps per period a sine allows at most: 64 samples per period put every peak within 1 − cos(π/64) = 0.12 % of
 * the amplitude of a computed point, so a peak is never stepped over and a plot drawn through the points is true.
 */
export const SINE_STEPS_PER_PERIOD = 64;
/**
 * Steps per period a pulse train allows at most. Its corners are breakpoints already; the bound keeps the step from
 * growing past a fraction of the period, so each pulse's response is resolved alike from the first to the last.
 */
export const PULSE_STEPS_PER_PERIOD = 16;

/** Largest transient step (s) a wave allows: a fraction of its period for periodic waves, Infinity otherwise. */
export function waveMaxStep(w: Wave): number {
  switch (w.shape) {
    case "sine": return 1 / (w.freq * SINE_STEPS_PER_PERIOD);
    case "pulse": return w.period === null ? Infinity : w.period / PULSE_STEPS_PER_PERIOD;
    default: return Infinity;
  }
}

/** Value of a wave at time t (s). */
export function waveValue(w: Wave, t: number): number {
  switch (w.shape) {
    case "pulse": {
      const rise = Math.max(w.rise, MIN_EDGE);
      const fall = Math.max(w.fall, MIN_EDGE);
      let tt = t - w.delay;
      if (tt <= 0) return w.low;
      if (w.period !== null) tt = tt % w.period;
      if (tt < rise) return w.low + ((w.high - w.low) * tt) / rise;
      tt -= rise;
      if (tt <= w.width) return w.high;
      tt -= w.width;
      if (tt < fall) return w.high + ((w.low - w.high) * tt) / fall;
      return w.low;
    }
    case "sine":
      if (t <= w.delay) return w.offset;
      return w.offset + w.amplitude * Math.sin(2 * Math.PI * w.freq * (t - w.delay));
    case "piecewise": {
      const p = w.points;
      if (t <= p[0][0]) return p[0][1];
      for (let i = 1; i < p.length; i++) {
        const [t1, v1] = p[i];
        if (t <= t1) {
          const [t0, v0] = p[i - 1];
          return t1 === t0 ? v1 : v0 + ((v1 - v0) * (t - t0)) / (t1 - t0);
        }
      }
      return p[p.length - 1][1];
    }
  }
}

/** Append the wave's corners in (0, tStop] to out. */
export function waveBreakpoints(w: Wave, tStop: number, out: number[]): void {
  switch (w.shape) {
    case "pulse": {
      const rise = Math.max(w.rise, MIN_EDGE);
      const fall = Math.max(w.fall, MIN_EDGE);
      const offs = [0, rise, rise + w.width, rise + w.width + fall];
      for (let k = 0; ; k++) {
        const base = w.delay + (w.period === null ? 0 : k * w.period);
        if (base > tStop) break;
        for (const o of offs) if (base + o > 0 && base + o <= tStop) out.push(base + o);
        if (w.period === null || out.length > 1_000_000) break;
      }
      return;
    }
    case "sine":
      if (w.delay > 0 && w.delay <= tStop) out.push(w.delay);
      return;
    case "piecewise":
      for (const [t] of w.points) if (t > 0 && t <= tStop) out.push(t);
      return;
  }
}
