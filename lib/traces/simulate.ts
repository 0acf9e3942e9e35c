/**
 * The simulation a bench capture is compared with, and what the review shows: operating point, step response and
 * checks of one scenario. Runs in the browser (client components call it; the server stays stateless).
 *
 * Uses lib/design's compiler and checks and lib/sim's engine directly. When lib/design grows its own runners
 * (runStep, runOperatingPoint), this module should call them instead.
 */
import { compileNetlistJson, NAMES } from "@/lib/design/compile";
import { runChecks, type CheckRow, type Caution, type AccuracyBudget } from "@/lib/design/checks";
import type { Scenario } from "@/lib/design/schema";
import { simulate, type OpResult, type TranResult } from "@/lib/sim";

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
  checks: CheckRow[];
  cautions: Caution[];
  budget: AccuracyBudget;
}

/** Operating point of the scenario at its operating command. Throws the engine's SimError on failure. */
export function simulateOperatingPoint(s: Scenario): OpResult {
  return simulate(compileNetlistJson(s, "op") as never) as OpResult;
}

/** The step response the scenario's stimulus asks for. Throws the engine's SimError on failure. */
export function simulateStep(s: Scenario): SimulatedStep {
  const r = simulate(compileNetlistJson(s, "step") as never) as TranResult;
  const iLoad = r.currents[NAMES.ammeter];
  if (!iLoad) throw new Error(`the step netlist has no load ammeter ${NAMES.ammeter}`);
  return {
    time: r.time,
    iLoad,
    vCommand: r.nodes[NAMES.nodeCommand] ?? null,
    vOpampOut: r.nodes[NAMES.nodeOpampOut] ?? null,
    vPass: r.nodes[NAMES.nodePass] ?? null,
    stepTime: s.stimulus.stepTime,
  };
}

/** Everything the review and the lead's comparison need, in one call. */
export function simulateForReview(s: Scenario): ReviewSimulation {
  const op = simulateOperatingPoint(s);
  const step = simulateStep(s);
  const { checks, cautions, budget } = runChecks(s, op as unknown as Parameters<typeof runChecks>[1]);
  return { op, step, checks, cautions, budget };
}
