/**
 * What the review, the bench-trace comparison and the library evidence show of one scenario: operating point, step
 * response (with the design layer's metrics and the small-signal step), loop gain and checks — shaped from the one
 * scenario run of lib/design (runScenario with the review policy), which the worker computes.
 */
import type { OpResult } from "../sim";
import type { AccuracyBudget, Caution, CheckRow } from "./checks";
import type { StepMetrics } from "./metrics";
import type { LoopGainResult, SmallSignalStep } from "./run";
import type { ScenarioRun } from "./scenario-run";
import type { Scenario } from "./schema";
import type { NoiseContributor } from "./noise";

export interface SimulatedStep {
  /** s */
  time: Float64Array;
  /** load current, A (positive in the regulated direction) */
  iLoad: Float64Array;
  /** command at the source, V */
  vCommand: Float64Array | null;
  /** op-amp output, V */
  vOpampOut: Float64Array | null;
  /** collector/drain of the pass device, V */
  vPass: Float64Array | null;
  /** when the stimulus steps, s */
  stepTime: number;
  /** the design layer's step metrics (the workbench's figures) */
  metrics: StepMetrics;
  /** the linearised circuit's step, null for load and supply steps */
  small: SmallSignalStep | null;
}

export interface ReviewSimulation {
  op: OpResult;
  step: SimulatedStep;
  /** null when the loop-gain run failed (`loopError` says why) */
  loop: LoopGainResult | null;
  loopError: string | null;
  checks: CheckRow[];
  cautions: Caution[];
  budget: AccuracyBudget;
  /** when the scenario sets a noise target: the load-current noise over the band and the top contributors */
  noise: { rms: number; target: number; band: { low: number; high: number }; top: NoiseContributor[] } | null;
}

/** Shape a review-policy run (operating point and step required, so both are there). */
export function toReviewSimulation(s: Scenario, run: ScenarioRun): ReviewSimulation {
  if (!run.op || !run.step || !run.budget) throw new Error("A review needs the operating point, the step and the checks");
  const r = run.step;
  return {
    op: run.op,
    step: {
      time: r.time, iLoad: r.series.iLoad, vCommand: r.series.vCommand, vOpampOut: r.series.vOpampOut, vPass: r.series.vPass,
      stepTime: s.stimulus.stepTime, metrics: r.metrics, small: r.small,
    },
    loop: run.loop,
    loopError: run.failures.find((f) => f.analysis === "Loop gain")?.message ?? null,
    checks: run.checks,
    cautions: run.cautions,
    budget: run.budget,
    noise: run.noise && run.noise.target !== null
      ? { rms: run.noise.rms, target: run.noise.target, band: run.noise.band, top: run.noise.ranked.slice(0, 3) }
      : null,
  };
}
