/**
 * Measured against simulated: align the bench capture's step edge (the 50 % crossing between its noise-robust levels)
 * on the simulation's, measure both with the design layer's step metrics (the workbench's and the review's own
 * functions, with the team's settling band), take the RMS difference over a window, and judge against the team's
 * tolerances. Pure; runs in the browser next to the simulation.
 */
import { z } from "zod";
import { stepMetrics, type StepMetrics } from "@/lib/design/metrics";
import { findStepEdge } from "@/lib/design/step-edge";

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
  /** The capture's own step edge (50 % crossing between its pre-step and final levels), s, on its own time axis. */
  measuredEdge: number;
  /** The simulation's 50 % crossing after its command edge, s: where the measured edge is put. */
  simulatedEdge: number;
  /** The simulated command edge (the stimulus step), s: both records' figures count from it. */
  commandEdge: number;
  /** The design layer's metrics of the aligned capture (levels from the edge finder) and of the simulation. */
  measured: StepMetrics;
  simulated: StepMetrics;
  /** Window of the RMS difference, s, on the simulated time axis. */
  window: [number, number];
  rmsDifference: number;
  rows: ComparisonRow[];
  verdict: Verdict;
}

export interface CompareOptions {
  /** Hand adjustment added to the automatic alignment, s. */
  manualOffset?: number;
  /** The simulated command edge (stimulus step time), s. */
  commandEdge: number;
  /** RMS window, s, on the simulated axis; defaults to the overlap of both records. */
  window?: [number, number];
  tolerances?: Tolerances;
}

/** The unit the simulation is compared in (the load current). */
export const SIMULATED_UNIT = "A";

/**
 * Why a channel cannot be compared with the simulated load current, or null when it can: a channel without a unit,
 * or in another unit, has no figures that mean anything next to amperes (and so no verdicts).
 */
export function cannotCompareReason(unit: string): string | null {
  if (unit === SIMULATED_UNIT) return null;
  if (unit.trim() === "") {
    return "This channel has no unit, so it cannot be compared with the simulated load current in A. Set its unit (and scale) to say what the numbers are.";
  }
  return `This channel is in ${unit}; the simulation is the load current in A. Set its conversion to amperes (a probe factor or the sense resistor) to compare.`;
}

/**
 * Automatic alignment: the shift that puts the measured step edge (the 50 % crossing between its median pre-step
 * and final levels) on the simulated one (the 50 % crossing after the command edge), s.
 */
export function alignmentOffset(measured: Waveform, simulated: Waveform, commandEdge: number): number {
  return findStepEdge(simulated.time, simulated.values, { after: commandEdge }).time - findStepEdge(measured.time, measured.values).time;
}

/**
 * The capture's time axis aligned as the comparison aligns it (its 50 % edge on the simulation's after the command
 * edge), plus a hand offset, s; for overlays. Throws RangeError when either record has no step.
 */
export function alignCapture(measured: Waveform, simulated: Waveform, commandEdge: number, manualOffset = 0): { time: Float64Array; offset: number } {
  const offset = alignmentOffset(measured, simulated, commandEdge) + manualOffset;
  return { time: shiftTime(measured.time, offset), offset };
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
  let j = 1;
  const st = simulated.time, sv = simulated.values, m = st.length;
  for (let i = 0; i < measured.time.length; i++) {
    const t = measured.time[i];
    if (t < t0 || t > t1) continue;
    // Linear interpolation of the simulation at t (measured times increase, so j only moves forward).
    let v: number;
    if (t <= st[0]) v = sv[0];
    else if (t >= st[m - 1]) v = sv[m - 1];
    else {
      while (j < m - 1 && st[j] < t) j++;
      const f = (t - st[j - 1]) / (st[j] - st[j - 1]);
      v = sv[j - 1] + f * (sv[j] - sv[j - 1]);
    }
    const d = measured.values[i] - v;
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

function settlingRow(measured: number | null, simulated: number | null, bandPct: number, tolerance: number): ComparisonRow {
  const label = `Settling time ±${bandPct} %`;
  if (measured === null || simulated === null) {
    const which = measured === null && simulated === null ? "in either record" : measured === null ? "in the measurement" : "in the simulation";
    return {
      key: "settlingTime", label, unit: "s", measured, simulated, difference: null, differenceUnit: "%", tolerance, verdict: "warn",
      note: `not within the record ${which}`,
    };
  }
  return relativeRow("settlingTime", label, "s", measured, simulated, tolerance);
}

function ringingRow(measured: StepMetrics, simulated: StepMetrics, tolerance: number): ComparisonRow {
  const row = relativeRow("ringing", "Ringing frequency", "Hz", measured.ringing.frequencyHz, simulated.ringing.frequencyHz, tolerance);
  const m = measured.ringing;
  if (m.frequencyHz !== null && m.uncertaintyHz !== null && m.estimatorsAgree === false) {
    const pct = (m.uncertaintyHz / m.frequencyHz) * 100;
    row.note = `measured ±${pct.toFixed(1)} %: the estimators disagree`;
  }
  return row;
}

/** Align, measure both, compare, and judge. Throws RangeError when either waveform has no step. */
export function compareStep(measured: Waveform, simulated: Waveform, options: CompareOptions): Comparison {
  const tol = options.tolerances ?? DEFAULT_TOLERANCES;
  const band = tol.settleBandPct / 100;
  const commandEdge = options.commandEdge;
  const simEdge = findStepEdge(simulated.time, simulated.values, { after: commandEdge });
  const measEdge = findStepEdge(measured.time, measured.values);
  const autoOffset = simEdge.time - measEdge.time;
  const offset = autoOffset + (options.manualOffset ?? 0);
  const shifted: Waveform = { time: shiftTime(measured.time, offset), values: measured.values };

  // One measurement: the design layer's step metrics (as on the workbench and the review), both counted from the
  // command edge. The simulation with its own levels, exactly as the workbench reads it; the capture with the edge
  // finder's medians, which scope noise cannot move.
  const sim = stepMetrics(simulated.time, simulated.values, commandEdge, { settleBand: band });
  const meas = stepMetrics(shifted.time, shifted.values, commandEdge, { settleBand: band, initial: measEdge.initial, final: measEdge.final });
  const simAmplitude = sim.final - sim.initial;

  const overlap: [number, number] = [
    Math.max(shifted.time[0], simulated.time[0]),
    Math.min(shifted.time[shifted.time.length - 1], simulated.time[simulated.time.length - 1]),
  ];
  // A window is clipped to the overlap (either end may be open: ±Infinity).
  const window: [number, number] = options.window
    ? [Math.max(options.window[0], overlap[0]), Math.min(options.window[1], overlap[1])]
    : overlap;
  const rms = rmsDifference(shifted, simulated, window[0], window[1]);
  const rmsPct = (rms / Math.abs(simAmplitude)) * 100;

  const overshootDiff = meas.overshootPct - sim.overshootPct;
  const rows: ComparisonRow[] = [
    relativeRow("riseTime", "Rise time 10–90 %", "s", meas.riseTime, sim.riseTime, tol.riseTimePct),
    {
      key: "overshoot", label: "Overshoot", unit: "%", measured: meas.overshootPct, simulated: sim.overshootPct,
      difference: overshootDiff, differenceUnit: "pts", tolerance: tol.overshootPts, verdict: grade(Math.abs(overshootDiff), tol.overshootPts),
    },
    settlingRow(meas.settlingTime, sim.settlingTime, tol.settleBandPct, tol.settlingTimePct),
    ringingRow(meas, sim, tol.ringingPct),
    {
      key: "rms", label: "RMS difference", unit: "% of step", measured: rmsPct, simulated: 0,
      difference: rmsPct, differenceUnit: "%", tolerance: tol.rmsPctOfStep, verdict: grade(rmsPct, tol.rmsPctOfStep),
    },
  ];
  const verdict: Verdict = rows.some((r) => r.verdict === "fail") ? "fail" : rows.some((r) => r.verdict === "warn") ? "warn" : "pass";
  return {
    offset, autoOffset, measuredEdge: measEdge.time, simulatedEdge: simEdge.time, commandEdge,
    measured: meas, simulated: sim, window, rmsDifference: rms, rows, verdict,
  };
}
