/**
 * One way into the engine for everything a page shows about a scenario: the workbench (its two halves on two
 * workers), the review, the bench-trace comparison and the library evidence all call `runScenario` (in a worker).
 * Which analyses run, which of them may fail without failing the run (their messages travel in `failures`), and the
 * time budget of each are the caller's explicit policy, not habits of separate copies.
 */
import type { OpResult, SimOptions } from "../sim";
import { runChecks, type AccuracyBudget, type Caution, type CheckRow } from "./checks";
import {
  runClosedLoop, runLoopGain, runOperatingPoint, runOutputImpedance, runSmallSignalStep, runStep, type LoopGainResult, type SmallSignalStep,
  type StepResult,
} from "./run";
import type { Scenario } from "./schema";
import { noiseCheck, runNoiseStudy, type NoiseStudyResult } from "./noise";

export type AnalysisName = "operatingPoint" | "step" | "loopGain" | "closedLoop" | "outputImpedance" | "noise";

/** Names the pages show in messages. */
export const ANALYSIS_LABELS: Record<AnalysisName, string> = {
  operatingPoint: "Operating point",
  step: "Step response",
  loopGain: "Loop gain",
  closedLoop: "Closed loop",
  outputImpedance: "Output impedance",
  noise: "Noise",
};

export interface RunPolicy {
  /** the analyses to run, in this order */
  analyses: readonly AnalysisName[];
  /** those whose failure fails the whole run (an Error naming the analysis); the others are reported in `failures` */
  required: readonly AnalysisName[];
  /** engine time budget of each analysis, ms */
  budgetMs: number;
  /** polled by the engine: returning true cancels the run */
  shouldStop?: () => boolean;
  /** whether the checks are computed (from the operating point when it ran) */
  checks: boolean;
}

export interface ScenarioRun {
  op: OpResult | null;
  step: (StepResult & { small: SmallSignalStep | null }) | null;
  loop: LoopGainResult | null;
  closed: ReturnType<typeof runClosedLoop> | null;
  zout: ReturnType<typeof runOutputImpedance> | null;
  /** the Noise study (load-current noise over the scenario's band), when asked for */
  noise: NoiseStudyResult | null;
  checks: CheckRow[];
  cautions: Caution[];
  budget: AccuracyBudget | null;
  failures: { analysis: string; message: string }[];
}

function message(e: unknown): string {
  return e instanceof Error ? e.message : String(e);
}

/** A run's failure, naming the analysis (a cancellation passes through untouched). */
export class AnalysisError extends Error {
  constructor(readonly analysis: AnalysisName, cause: unknown) {
    super(`${ANALYSIS_LABELS[analysis]}: ${message(cause)}`);
    this.name = "AnalysisError";
  }
}

function isCancel(e: unknown): boolean {
  return typeof e === "object" && e !== null && (e as { code?: unknown }).code === "cancelled";
}

export function runScenario(s: Scenario, policy: RunPolicy): ScenarioRun {
  const options: SimOptions = { timeBudgetMs: policy.budgetMs, shouldStop: policy.shouldStop };
  const out: ScenarioRun = { op: null, step: null, loop: null, closed: null, zout: null, noise: null, checks: [], cautions: [], budget: null, failures: [] };
  for (const a of policy.analyses) {
    try {
      switch (a) {
        case "operatingPoint": out.op = runOperatingPoint(s, options).op; break;
        case "step": {
          const step = runStep(s, options);
          out.step = { ...step, small: runSmallSignalStep(s, options, step.metrics.initial) };
          break;
        }
        case "loopGain": out.loop = runLoopGain(s, options); break;
        case "closedLoop": out.closed = runClosedLoop(s, options); break;
        case "outputImpedance": out.zout = runOutputImpedance(s, options); break;
        case "noise": out.noise = runNoiseStudy(s, options); break;
      }
    } catch (e) {
      if (isCancel(e)) throw e;
      if (policy.required.includes(a)) throw new AnalysisError(a, e);
      out.failures.push({ analysis: ANALYSIS_LABELS[a], message: message(e) });
    }
  }
  if (policy.checks) {
    const r = runChecks(s, out.op ?? undefined);
    out.checks = r.checks;
    const nc = out.noise ? noiseCheck(out.noise) : null;
    if (nc) out.checks.push(nc);
    out.cautions = r.cautions;
    out.budget = r.budget;
  }
  return out;
}

/** The policies the pages use. */
export const POLICIES = {
  /** the workbench's step half: the step must run */
  workbenchStep: { analyses: ["step"], required: ["step"], checks: false },
  /** the workbench's other half: the loop gain must run; the rest may fail alone */
  workbenchRest: { analyses: ["loopGain", "operatingPoint", "closedLoop", "outputImpedance", "noise"], required: ["loopGain"], checks: true },
  /** review, bench comparison and library evidence: the operating point and the step must run; the loop gain may fail */
  review: { analyses: ["operatingPoint", "step", "loopGain"], required: ["operatingPoint", "step"], checks: true },
} as const satisfies Record<string, Omit<RunPolicy, "budgetMs" | "shouldStop">>;

/** The review policy, with the Noise study added when the scenario sets a noise target (it may fail alone). */
export function reviewPolicy(s: Scenario): Omit<RunPolicy, "budgetMs" | "shouldStop"> {
  const p = POLICIES.review;
  return s.tolerances.noiseTarget === undefined ? p : { ...p, analyses: [...p.analyses, "noise"] };
}
