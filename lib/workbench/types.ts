/**
 * What the workbench holds: the worker's live-run results (declared beside the worker, workers/results.ts) and the
 * studies' chunks as the design layer returns them, plus the store's types.
 */
import type { Scenario } from "@/lib/design/schema";
import type { LiveResult } from "@/workers/results";
import type { CompensateResult, CompensateScanRow, MapResult, SpreadResult, SweepResult } from "@/lib/design/studies";
import type { WorkbenchState, WorkbenchStore } from "./store";

export type { BodeView, LiveResult, LoopFigures, LoopView, NoiseView, OperatingPointResult, SmallSignalStepView, StepView } from "@/workers/results";

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
