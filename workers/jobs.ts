/**
 * What the worker does, as plain functions (tested in Node without a worker): run a scenario through the design
 * layer and shape the results for the plots, and list the buffers to transfer.
 */
import { upgradeScenario } from "@/lib/design/upgrade";
import { runClosedLoop, runLoopGain, runOperatingPoint, runOutputImpedance, runStep } from "@/lib/design/run";
import { runChecks } from "@/lib/design/checks";
import type { Scenario } from "@/lib/design/schema";
import type { BodeView, LiveResult, LoopView, OperatingPointResult, StepView } from "./results";

/** Wall-clock budget of each analysis in a live run, ms: a run never hangs the workbench. */
export const LIVE_BUDGET_MS = 10_000;

function message(e: unknown): string {
  return e instanceof Error ? e.message : String(e);
}

/** A magnitude column in dB (20·log10), as a new array; the input column is left as it is. */
function toDb(mag: Float64Array): Float64Array {
  const out = new Float64Array(mag.length);
  for (let i = 0; i < mag.length; i++) out[i] = 20 * Math.log10(mag[i]!);
  return out;
}

export function stepView(s: Scenario, budgetMs = LIVE_BUDGET_MS): StepView {
  const r = runStep(s, { timeBudgetMs: budgetMs });
  return { time: r.time, ...r.series, metrics: r.metrics };
}

export function loopView(s: Scenario, budgetMs = LIVE_BUDGET_MS): LoopView {
  const r = runLoopGain(s, { timeBudgetMs: budgetMs });
  return {
    freq: r.freq, magDb: r.magDb, phaseDeg: r.phaseDeg,
    phaseMarginDeg: r.phaseMarginDeg, gainMarginDb: r.gainMarginDb, crossoverHz: r.crossoverHz,
  };
}

/** The step half of a live run: its failure fails the run (the page keeps the last good result). */
export function liveStep(json: unknown, budgetMs = LIVE_BUDGET_MS): StepView {
  const s = upgradeScenario(json);
  try {
    return stepView(s, budgetMs);
  } catch (e) {
    throw new Error(`Step response: ${message(e)}`);
  }
}

/**
 * The other half: loop gain (its failure fails the run), then closed loop, output impedance and the operating point,
 * which may fail alone — their messages travel in `failures` — and the checks.
 */
export function liveRest(json: unknown, budgetMs = LIVE_BUDGET_MS): Omit<LiveResult, "step"> {
  const s = upgradeScenario(json);
  const failures: LiveResult["failures"] = [];
  let loop: LoopView;
  try {
    loop = loopView(s, budgetMs);
  } catch (e) {
    throw new Error(`Loop gain: ${message(e)}`);
  }
  let op: OperatingPointResult | null = null;
  try {
    op = runOperatingPoint(s, { timeBudgetMs: budgetMs }).op;
  } catch (e) {
    failures.push({ analysis: "Operating point", message: message(e) });
  }
  let closed: LiveResult["closed"] = null;
  try {
    closed = runClosedLoop(s, { timeBudgetMs: budgetMs });
  } catch (e) {
    failures.push({ analysis: "Closed loop", message: message(e) });
  }
  let zout: BodeView | null = null;
  try {
    const z = runOutputImpedance(s, { timeBudgetMs: budgetMs });
    zout = { freq: z.freq, magDb: toDb(z.magOhm), phaseDeg: z.phaseDeg };
  } catch (e) {
    failures.push({ analysis: "Output impedance", message: message(e) });
  }
  const checks = runChecks(s, op ?? undefined);
  const acc = checks.checks.find((c) => c.id === "accuracy");
  const diss = checks.checks.find((c) => c.id === "dissipation");
  return {
    loop, closed, zout, op,
    checks: checks.checks,
    cautions: checks.cautions,
    fullScaleErrorPct: acc ? acc.value : null,
    worstDissipationW: diss ? diss.value : null,
    failures,
  };
}

/** The whole live run in one thread (the page runs the two halves on two workers at once). */
export function liveRun(json: unknown, budgetMs = LIVE_BUDGET_MS): LiveResult {
  const step = liveStep(json, budgetMs);
  return { step, ...liveRest(json, budgetMs) };
}

/** Every distinct ArrayBuffer under `value` (typed arrays in objects and arrays), for comlink's transfer list. */
export function collectBuffers(value: unknown): ArrayBuffer[] {
  const seen = new Set<ArrayBuffer>();
  const visit = (v: unknown, depth: number) => {
    if (v === null || typeof v !== "object" || depth > 8) return;
    if (ArrayBuffer.isView(v)) {
      if (v.buffer instanceof ArrayBuffer) seen.add(v.buffer);
      return;
    }
    if (Array.isArray(v)) {
      for (const x of v) visit(x, depth + 1);
      return;
    }
    for (const x of Object.values(v as Record<string, unknown>)) visit(x, depth + 1);
  };
  visit(value, 0);
  return [...seen];
}

export { sweep1d, map2d, spread, compensateScan, compensatePick } from "@/lib/design/studies";
