/**
 * The simulation a bench capture is compared with, and what the review shows: operating point, step response,
 * loop gain and checks of one scenario, through lib/design's runners. Runs in the browser (client components call
 * it; the server stays stateless).
 */
import { runLoopGain, runOperatingPoint, runStep, type LoopGainResult } from "@/lib/design/run";
import { runChecks, type CheckRow, type Caution, type AccuracyBudget } from "@/lib/design/checks";
import type { Scenario } from "@/lib/design/schema";
import type { OpResult } from "@/lib/sim";

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
}

/** The step response the scenario's stimulus asks for. Throws the engine's SimError on failure. */
export function simulateStep(s: Scenario): SimulatedStep {
  const r = runStep(s);
  return {
    time: r.time,
    iLoad: r.series.iLoad,
    vCommand: r.series.vCommand ?? null,
    vOpampOut: r.series.vOpampOut ?? null,
    vPass: r.series.vPass ?? null,
    stepTime: s.stimulus.stepTime,
  };
}

/** Everything the review and the lead's comparison need, in one call. */
export function simulateForReview(s: Scenario): ReviewSimulation {
  const { op } = runOperatingPoint(s);
  const step = simulateStep(s);
  let loop: LoopGainResult | null = null;
  let loopError: string | null = null;
  try {
    loop = runLoopGain(s);
  } catch (e) {
    loopError = e instanceof Error ? e.message : String(e);
  }
  const { checks, cautions, budget } = runChecks(s, op);
  return { op, step, loop, loopError, checks, cautions, budget };
}
