/**
 * What a live run returns, in the shape the plots want: Float64Array columns straight from the worker (transferred,
 * never reshaped on the main thread), the design layer's metric and check types unchanged. Declared beside the
 * worker that produces them; the workbench re-exports them (lib/workbench/types.ts).
 */
import type { OperatingPointData } from "@/lib/design/op-words";
import type { Caution, CheckRow } from "@/lib/design/checks";
import type { StepMetrics } from "@/lib/design/metrics";

export interface StepView {
  time: Float64Array;
  /** load current, A */
  iLoad: Float64Array;
  /** command voltage, V */
  vCommand: Float64Array;
  /** op-amp output, V */
  vOpampOut: Float64Array;
  /** collector/drain voltage, V */
  vPass: Float64Array;
  metrics: StepMetrics;
  /** the linearised circuit's step (same edge, same command change), null for load and supply steps */
  small: SmallSignalStepView | null;
}

export interface SmallSignalStepView {
  time: Float64Array;
  iLoad: Float64Array;
  metrics: StepMetrics;
  /** the linearised step grows: its closed loop is unstable (lib/design/run.ts SmallSignalStep) */
  grows: boolean;
}

export interface BodeView {
  freq: Float64Array;
  magDb: Float64Array;
  phaseDeg: Float64Array;
}

/** One loop's margins (see lib/design/metrics.ts loopMetrics). */
export interface LoopFigures {
  phaseMarginDeg: number | null;
  gainMarginDb: number | null;
  crossoverHz: number | null;
  /** every 0 dB crossing, Hz */
  crossovers: number[];
  modulusMargin: number;
  modulusMarginHz: number;
  /** T(jω) encircles −1: the closed loop is unstable and no margin is a margin */
  unstable: boolean;
}

/** The current loop (the headline) with the op-amp's local loop beside it (null for the Howland pump). */
export interface LoopView extends BodeView, LoopFigures {
  local: (BodeView & LoopFigures) | null;
}

/** The Noise study for the plot (lib/design/noise.ts): load-current noise density, A/√Hz, and its band's RMS. */
export interface NoiseView {
  freq: Float64Array;
  /** total load-current noise density, A/√Hz */
  density: Float64Array;
  /** RMS over the band, A */
  rms: number;
  band: { low: number; high: number };
  /** the scenario's target, A RMS (null = none) */
  target: number | null;
  /** every contributor by its share of the band's noise power, largest first */
  ranked: { element: string; rms: number; share: number }[];
  /** the top contributors' densities, A/√Hz */
  top: { element: string; share: number; density: Float64Array }[];
}

/** The operating point as the design layer reads it (lib/design/op-words.ts). */
export type OperatingPointResult = OperatingPointData;

export interface LiveResult {
  step: StepView | null;
  loop: LoopView | null;
  /** closed-loop transconductance Iload/Vcommand, magnitude in dB(A/V) */
  closed: (BodeView & { bandwidthHz: number | null; peakingDb: number; peakingHz: number | null }) | null;
  /** output impedance seen by the load, magnitude in dBΩ */
  zout: BodeView | null;
  /** load-current noise (null when the noise run failed: see failures) */
  noise: NoiseView | null;
  op: OperatingPointResult | null;
  checks: CheckRow[];
  cautions: Caution[];
  /** worst-case DC error, % of full scale */
  fullScaleErrorPct: number | null;
  /** worst-case pass-device dissipation, W */
  worstDissipationW: number | null;
  /** analyses that failed, with the engine's message (the others still show) */
  failures: { analysis: string; message: string }[];
}
