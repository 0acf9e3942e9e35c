/**
 * Measured against simulated: align the bench capture on the simulated step edge (automatically, plus a hand
 * offset), compare rise time, overshoot, settling time and ringing frequency, take the RMS difference over a window,
 * and give a verdict against the team's tolerances. Pure; runs in the browser next to the simulation.
 */
import { z } from "zod";
import { findStepEdge, interpolateAt, stepFigures, type StepFigures } from "./metrics";

/** The team's tolerances for the verdict (stored per team in library_settings). */
export const tolerancesSchema = z.object({
  /** Rise time may differ by this much, % of the simulated value. */
  riseTimePct: z.number().positive().max(1000),
  /** Overshoot may differ by this many percentage points. */
  overshootPts: z.number().positive().max(1000),
  /** Settling time may differ by this much, % of the simulated value. */
  settlingTimePct: z.number().positive().max(1000),
  /** Ringing frequency may differ by this much, %. */
  ringingPct: z.number().positive().max(1000),
  /** RMS difference over the window, % of the simulated step amplitude. */
  rmsPctOfStep: z.number().positive().max(1000),
  /** Settling band, % of the step amplitude. */
  settleBandPct: z.number().positive().max(50),
});
export type Tolerances = z.infer<typeof tolerancesSchema>;

/** Starting tolerances for a team that has not set its own (common practice for bench-vs-model agreement). */
export const DEFAULT_TOLERANCES: Tolerances = {
  riseTimePct: 20,
  overshootPts: 5,
  settlingTimePct: 25,
  ringingPct: 15,
  rmsPctOfStep: 5,
  settleBandPct: 2,
};

export type Verdict = "pass" | "warn" | "fail";

export interface Waveform {
  time: Float64Array;
  values: Float64Array;
}

export interface ComparisonRow {
  key: "riseTime" | "overshoot" | "settlingTime" | "ringing" | "rms";
  label: string;
  /** Unit of measured/simulated ("s", "%", "Hz", or the waveform's unit). */
  unit: string;
  measured: number | null;
  simulated: number | null;
  /** Difference measured − simulated, in `differenceUnit`. */
  difference: number | null;
  differenceUnit: "%" | "pts";
  tolerance: number;
  verdict: Verdict;
  note?: string;
}

export interface Comparison {
  /** Shift added to the measured time axis, s (automatic + manual). */
  offset: number;
  /** The automatic part: simulated edge − measured edge, s. */
  autoOffset: number;
  measured: StepFigures;
  simulated: StepFigures;
  /** Window of the RMS difference, s, on the simulated time axis. */
  window: [number, number];
  rmsDifference: number;
  rows: ComparisonRow[];
  verdict: Verdict;
}

export interface CompareOptions {
  /** Hand adjustment added to the automatic alignment, s. */
  manualOffset?: number;
  /** Simulated step edge, s, when the stimulus says it (otherwise found at the 50 % crossing). */
  simulatedEdge?: number;
  /** RMS window, s, on the simulated axis; defaults to the overlap of both records. */
  window?: [number, number];
  tolerances?: Tolerances;
}

/**
 * Automatic alignment: the shift that puts the measured 50 % crossing on the simulated one, s. With the simulated
 * stimulus time given, the simulated levels are taken from the stimulus onwards (robust to adaptive time steps).
 */
export function alignmentOffset(measured: Waveform, simulated: Waveform, simulatedEdge?: number): number {
  let simHalf: number;
  if (simulatedEdge === undefined) simHalf = findStepEdge(simulated.time, simulated.values);
  else {
    const f = stepFigures(simulated.time, simulated.values, { edgeTime: simulatedEdge });
    if (f.halfCrossing === null) throw new RangeError("the simulated response never reaches halfway to its final value");
    simHalf = f.halfCrossing;
  }
  return simHalf - findStepEdge(measured.time, measured.values);
}

/** A copy of the measured time axis shifted by `offset`, s. */
export function shiftTime(time: Float64Array, offset: number): Float64Array {
  const out = new Float64Array(time.length);
  for (let i = 0; i < time.length; i++) out[i] = time[i] + offset;
  return out;
}

/** RMS of measured − simulated over [t0, t1], sampled at the measured points (simulated interpolated linearly). */
export function rmsDifference(measured: Waveform, simulated: Waveform, t0: number, t1: number): number {
  let sum = 0;
  let count = 0;
  let hint = 0;
  for (let i = 0; i < measured.time.length; i++) {
    const t = measured.time[i];
    if (t < t0 || t > t1) continue;
    const r = interpolateAt(simulated.time, simulated.values, t, hint);
    hint = r.i;
    const d = measured.values[i] - r.v;
    sum += d * d;
    count++;
  }
  if (count === 0) throw new RangeError("the RMS window holds no measured samples: adjust the offset or the window");
  return Math.sqrt(sum / count);
}

function grade(diffAbs: number, tolerance: number): Verdict {
  if (diffAbs <= tolerance) return "pass";
  if (diffAbs <= 2 * tolerance) return "warn";
  return "fail";
}

function relativeRow(
  key: ComparisonRow["key"], label: string, unit: string, measured: number | null, simulated: number | null, tolerance: number,
): ComparisonRow {
  if (measured === null && simulated === null) {
    return { key, label, unit, measured, simulated, difference: null, differenceUnit: "%", tolerance, verdict: "pass", note: "absent in both" };
  }
  if (measured === null || simulated === null || simulated === 0) {
    return {
      key, label, unit, measured, simulated, difference: null, differenceUnit: "%", tolerance, verdict: "warn",
      note: measured === null ? "not found in the measurement" : "not found in the simulation",
    };
  }
  const difference = ((measured - simulated) / Math.abs(simulated)) * 100;
  return { key, label, unit, measured, simulated, difference, differenceUnit: "%", tolerance, verdict: grade(Math.abs(difference), tolerance) };
}

/** Align, measure both, compare, and judge. Throws RangeError when either waveform has no step. */
export function compareStep(measured: Waveform, simulated: Waveform, options: CompareOptions = {}): Comparison {
  const tol = options.tolerances ?? DEFAULT_TOLERANCES;
  const band = tol.settleBandPct / 100;
  const autoOffset = alignmentOffset(measured, simulated, options.simulatedEdge);
  const offset = autoOffset + (options.manualOffset ?? 0);
  const shifted: Waveform = { time: shiftTime(measured.time, offset), values: measured.values };

  const sim = stepFigures(simulated.time, simulated.values, { settleBand: band, edgeTime: options.simulatedEdge });
  // Once aligned, the measured capture shares the simulated time origin: count its settling and peak from there.
  const meas = stepFigures(shifted.time, shifted.values, {
    settleBand: band,
    edgeTime: options.simulatedEdge ?? sim.edgeTime,
  });

  const overlap: [number, number] = [
    Math.max(shifted.time[0], simulated.time[0]),
    Math.min(shifted.time[shifted.time.length - 1], simulated.time[simulated.time.length - 1]),
  ];
  // A window is clipped to the overlap (either end may be open: ±Infinity).
  const window: [number, number] = options.window
    ? [Math.max(options.window[0], overlap[0]), Math.min(options.window[1], overlap[1])]
    : overlap;
  const rms = rmsDifference(shifted, simulated, window[0], window[1]);
  const rmsPct = (rms / Math.abs(sim.amplitude)) * 100;

  const overshootDiff = meas.overshootPct - sim.overshootPct;
  const rows: ComparisonRow[] = [
    relativeRow("riseTime", "Rise time 10–90 %", "s", meas.riseTime, sim.riseTime, tol.riseTimePct),
    {
      key: "overshoot", label: "Overshoot", unit: "%", measured: meas.overshootPct, simulated: sim.overshootPct,
      difference: overshootDiff, differenceUnit: "pts", tolerance: tol.overshootPts, verdict: grade(Math.abs(overshootDiff), tol.overshootPts),
    },
    relativeRow("settlingTime", `Settling time ±${tol.settleBandPct} %`, "s", meas.settlingTime, sim.settlingTime, tol.settlingTimePct),
    relativeRow("ringing", "Ringing frequency", "Hz", meas.ringingHz, sim.ringingHz, tol.ringingPct),
    {
      key: "rms", label: "RMS difference", unit: "% of step", measured: rmsPct, simulated: 0,
      difference: rmsPct, differenceUnit: "%", tolerance: tol.rmsPctOfStep, verdict: grade(rmsPct, tol.rmsPctOfStep),
    },
  ];
  const verdict: Verdict = rows.some((r) => r.verdict === "fail") ? "fail" : rows.some((r) => r.verdict === "warn") ? "warn" : "pass";
  return { offset, autoOffset, measured: meas, simulated: sim, window, rmsDifference: rms, rows, verdict };
}
