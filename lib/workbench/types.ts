/**
 * What the workbench shows, in the shape the plots want: Float64Array columns straight from the worker (transferred,
 * never reshaped on the main thread), the design layer's metric and check types unchanged.
 */
import type { Caution, CheckRow } from "@/lib/design/checks";
import type { Scenario } from "@/lib/design/schema";
import type { StepMetrics } from "@/lib/design/metrics";
import type { CompensateResult, CompensateScanRow, MapResult, SpreadResult, SweepResult } from "@/lib/design/studies";
import type { WorkbenchState, WorkbenchStore } from "./store";

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
}

/** The current loop (the headline) with the op-amp's local loop beside it (null for the Howland pump). */
export interface LoopView extends BodeView, LoopFigures {
  local: (BodeView & LoopFigures) | null;
}

export interface OperatingPointResult {
  nodes: Record<string, number>;
  currents: Record<string, number>;
  devices: Record<string, object>;
}

export interface LiveResult {
  step: StepView | null;
  loop: LoopView | null;
  /** closed-loop transconductance Iload/Vcommand, magnitude in dB(A/V) */
  closed: (BodeView & { bandwidthHz: number | null; peakingDb: number; peakingHz: number | null }) | null;
  /** output impedance seen by the load, magnitude in dBΩ */
  zout: BodeView | null;
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

/** One chunk of a study, as the worker streams it back: the design layer's chunk results as they are. */
export type SweepChunk = SweepResult;
export type MapChunk = MapResult;
export type SpreadChunk = SpreadResult;
/** Compensate streams its scan rows, then one chunk with the pick. */
export type CompensateChunk = { scan: CompensateScanRow[]; result: null } | { scan: null; result: CompensateResult };

export type StudyChunks = { sweep: SweepChunk; map: MapChunk; spread: SpreadChunk; compensate: CompensateChunk };
export type StudyKind = keyof StudyChunks;
export const STUDY_KINDS: readonly StudyKind[] = ["sweep", "map", "spread", "compensate"];

export type WbState = WorkbenchState<Scenario, LiveResult, StudyChunks>;
export type WbStore = WorkbenchStore<Scenario, LiveResult, StudyChunks>;
