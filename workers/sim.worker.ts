/**
 * The simulation worker: exposes the live run and the study chunks through comlink. Thin by design — it calls the
 * pure jobs in ./jobs (the design layer) and hands the Float64Array buffers back with `transfer` (moved, never
 * copied). `SimWorkerApi` is derived from `api`, so the client's types follow these signatures.
 */
import { expose, transfer } from "comlink";
import type { Scenario, SweepAxis } from "@/lib/design/schema";
import type { CompensateScanRow, CompensateSettings, MapMetric } from "@/lib/design/studies";
import { upgradeScenario } from "@/lib/design/upgrade";
import { collectBuffers, compensatePick, compensateScan, liveRest, liveRun, liveStep, map2d, reviewRun, spread, sweep1d } from "./jobs";

/** Engine budget of one study run, ms. */
const STUDY_RUN_BUDGET_MS = 20_000;

function moved<T>(r: T): T {
  return transfer(r, collectBuffers(r));
}

const api = {
  /** Everything the workbench shows for one scenario: OP, step, loop gain, closed loop, Zout, checks. */
  live(scenario: unknown) {
    return moved(liveRun(scenario));
  },
  /** The step response alone (run beside `liveRest` on a second worker). */
  liveStep(scenario: unknown) {
    return moved(liveStep(scenario));
  },
  /** Loop gain, closed loop, output impedance, operating point and checks. */
  liveRest(scenario: unknown) {
    return moved(liveRest(scenario));
  },
  /** What the review, the bench comparison and the library evidence show (operating point, step, loop gain, checks). */
  review(scenario: unknown) {
    return moved(reviewRun(scenario));
  },
  /** Points [start, end) of a 1D sweep. */
  sweep(scenario: Scenario, axis: SweepAxis, start: number, end: number) {
    return moved(sweep1d(upgradeScenario(scenario), axis, { timeBudgetMs: STUDY_RUN_BUDGET_MS }, { start, end }));
  },
  /** Cells [start, end) (row-major) of a 2D map. */
  map(scenario: Scenario, settings: { x: SweepAxis; y: SweepAxis; metric: MapMetric }, start: number, end: number) {
    return moved(map2d(upgradeScenario(scenario), settings, { timeBudgetMs: STUDY_RUN_BUDGET_MS }, { start, end }));
  },
  /** Runs [start, end) of a tolerance spread. */
  spread(scenario: Scenario, settings: { runs: number; seed: number }, start: number, end: number) {
    const r = spread(upgradeScenario(scenario), settings, { timeBudgetMs: STUDY_RUN_BUDGET_MS }, { start, end });
    // The summary is recomputed on the page from all chunks together.
    return moved({ seed: r.seed, runs: r.runs, errorPctFs: r.errorPctFs, phaseMarginDeg: r.phaseMarginDeg, noiseRms: r.noiseRms, failures: r.failures });
  },
  /** Phase-margin scan of compensation candidates [start, end). */
  compensateScan(scenario: Scenario, settings: CompensateSettings, start: number, end: number) {
    return compensateScan(upgradeScenario(scenario), settings, { timeBudgetMs: STUDY_RUN_BUDGET_MS }, { start, end });
  },
  /** The pick among scanned candidates (step runs over the load corners). */
  compensatePick(scenario: Scenario, settings: CompensateSettings, rows: CompensateScanRow[]) {
    return compensatePick(upgradeScenario(scenario), settings, rows, { timeBudgetMs: STUDY_RUN_BUDGET_MS });
  },
};

export type SimWorkerApi = typeof api;

expose(api);
