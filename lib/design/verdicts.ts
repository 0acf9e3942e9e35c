/**
 * The thresholds the headline figures are judged by, in one place so the workbench, the review page, the share page
 * and the CLI judge alike. Every one is common practice for a robust analogue loop, not a standard: a team that
 * needs other limits sets its own targets (the overshoot target is the scenario's).
 */
import type { Verdict } from "./checks";
import type { StepMetrics } from "./metrics";

export type { Verdict };

/** Phase margin of the current loop: ≥ 45° pass, ≥ 30° warn, below fail (common practice). */
export const PHASE_MARGIN_PASS_DEG = 45;
export const PHASE_MARGIN_WARN_DEG = 30;
/** Gain margin: ≥ 10 dB pass, ≥ 6 dB warn (common practice). */
export const GAIN_MARGIN_PASS_DB = 10;
export const GAIN_MARGIN_WARN_DB = 6;
/**
 * Modulus margin min |1 + T|: ≥ 0.5 pass (sensitivity peak ≤ 2, i.e. ≤ 6 dB), ≥ 0.33 warn (≤ 3); common practice
 * in control texts (e.g. Åström & Murray, Feedback Systems, ch. on loop shaping — from memory).
 */
export const MODULUS_MARGIN_PASS = 0.5;
export const MODULUS_MARGIN_WARN = 1 / 3;

/**
 * `unstable`: the loop gain encircles −1 (LoopMetrics.unstable). A closed loop that oscillates has no margins to
 * judge, so every margin verdict is then a fail, whatever its number says.
 */
export function phaseMarginVerdict(pm: number | null, unstable = false): Verdict | null {
  if (unstable) return "fail";
  if (pm === null) return null;
  return pm >= PHASE_MARGIN_PASS_DEG ? "pass" : pm >= PHASE_MARGIN_WARN_DEG ? "warn" : "fail";
}

/** Null when there is no −180° crossing (no gain margin to judge). A negative margin (conditionally stable) warns. */
export function gainMarginVerdict(gm: number | null, unstable = false): Verdict | null {
  if (unstable) return "fail";
  if (gm === null) return null;
  if (gm < 0) return "warn";
  return gm >= GAIN_MARGIN_PASS_DB ? "pass" : gm >= GAIN_MARGIN_WARN_DB ? "warn" : "fail";
}

export function modulusMarginVerdict(mm: number | null, unstable = false): Verdict | null {
  if (unstable) return "fail";
  if (mm === null || !Number.isFinite(mm)) return null;
  return mm >= MODULUS_MARGIN_PASS ? "pass" : mm >= MODULUS_MARGIN_WARN ? "warn" : "fail";
}

/**
 * The overshoot a design is judged on: the worse of the step as specified (the full, large-signal step) and its
 * linearised twin (the small-signal step: what a small command change or a disturbance near the operating point
 * does). A clamp, a rail or slewing can hold the full step still while the loop, or a load resonance, rings at every
 * small change; a design review judges the worse. A linearised step that grows counts as unbounded (Infinity).
 */
export function judgedOvershootPct(fullPct: number, small: { metrics: Pick<StepMetrics, "overshootPct">; grows: boolean } | null): number {
  if (!small) return fullPct;
  return small.grows ? Infinity : Math.max(fullPct, small.metrics.overshootPct);
}

/** Overshoot against the scenario's target: pass within it, warn up to twice it plus 5 points, fail beyond. */
export function overshootVerdict(os: number | null, maxOvershootPct: number): Verdict | null {
  if (os === null) return null;
  return os <= maxOvershootPct ? "pass" : os <= 2 * maxOvershootPct + 5 ? "warn" : "fail";
}

/** Settling times from the step, s (null: not within the record). */
export type SettlingLike = Pick<StepMetrics, "settlingTime1pct" | "settlingTime01pct">;

/**
 * The settling a design is judged on, as for the overshoot: the slower of the full step and the small-signal step
 * (a band not reached within either record is not reached; a linearised step that grows never settles). `small`
 * says the small-signal step is the slower at ±1 %.
 */
export function judgedSettling(full: SettlingLike, small: { metrics: SettlingLike; grows: boolean } | null): SettlingLike & { small: boolean } {
  if (!small) return { ...full, small: false };
  if (small.grows) return { settlingTime1pct: null, settlingTime01pct: null, small: true };
  const slower = (a: number | null, b: number | null) => (a === null || b === null ? null : Math.max(a, b));
  const a = full.settlingTime1pct, b = small.metrics.settlingTime1pct;
  return {
    settlingTime1pct: slower(a, b),
    settlingTime01pct: slower(full.settlingTime01pct, small.metrics.settlingTime01pct),
    small: b === null ? a !== null : a !== null && b > a,
  };
}

/** Settled within ±1 % and ±0.1 %: pass; ±1 % only: warn; not even ±1 % within the record: fail. */
export function settlingVerdict(m: SettlingLike | null): Verdict | null {
  if (!m) return null;
  return m.settlingTime1pct === null ? "fail" : m.settlingTime01pct === null ? "warn" : "pass";
}
