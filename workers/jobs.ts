/**
 * What the worker does, as plain functions (tested in Node without a worker): run a scenario through the design
 * layer and shape the results for the plots, and list the buffers to transfer.
 */
import { upgradeScenario } from "@/lib/design/upgrade";
import type { LoopGainResult, LoopResult } from "@/lib/design/run";
import { POLICIES, reviewPolicy, runScenario } from "@/lib/design/scenario-run";
import type { NoiseStudyResult } from "@/lib/design/noise";
import { toReviewSimulation, type ReviewSimulation } from "@/lib/design/review";
import type { BodeView, LiveResult, LoopFigures, LoopView, NoiseView, StepView } from "./results";

/** How many contributors the Noise plot draws beside the total. */
export const NOISE_TOP_CONTRIBUTORS = 4;

/** The Noise study as the plot wants it: the total and the top contributors' densities, the band and its figure. */
export function noiseView(r: NoiseStudyResult): NoiseView {
  const top = r.ranked.slice(0, NOISE_TOP_CONTRIBUTORS);
  return {
    freq: r.freq, density: r.density, rms: r.rms, band: r.band, target: r.target,
    ranked: r.ranked,
    top: top.map((c) => ({ element: c.element, share: c.share, density: r.contributions[c.element]! })),
  };
}

/** Wall-clock budget of each analysis in a live run, ms: a run never hangs the workbench. */
export const LIVE_BUDGET_MS = 10_000;

/** A magnitude column in dB (20·log10), as a new array; the input column is left as it is. */
function toDb(mag: Float64Array): Float64Array {
  const out = new Float64Array(mag.length);
  for (let i = 0; i < mag.length; i++) out[i] = 20 * Math.log10(mag[i]!);
  return out;
}

function loopFigures(r: LoopResult): BodeView & LoopFigures {
  return {
    freq: r.freq, magDb: r.magDb, phaseDeg: r.phaseDeg,
    phaseMarginDeg: r.phaseMarginDeg, gainMarginDb: r.gainMarginDb, crossoverHz: r.crossoverHz, crossovers: r.crossovers,
    modulusMargin: r.modulusMargin, modulusMarginHz: r.modulusMarginHz, unstable: r.unstable,
  };
}

/** The current loop's gain (the headline) and the op-amp's local loop, as the plots want them. */
export function loopView(r: LoopGainResult): LoopView {
  return { ...loopFigures(r.loops.current), local: r.loops.local ? loopFigures(r.loops.local) : null };
}

/** The step half of a live run (workbench-step policy: its failure fails the run; the page keeps the last good result). */
export function liveStep(json: unknown, budgetMs = LIVE_BUDGET_MS, shouldStop?: () => boolean): StepView {
  const s = upgradeScenario(json);
  const r = runScenario(s, { ...POLICIES.workbenchStep, budgetMs, shouldStop }).step!;
  return { time: r.time, ...r.series, metrics: r.metrics, small: r.small };
}

/**
 * The other half (workbench-rest policy): loop gain (its failure fails the run), then operating point, closed loop and
 * output impedance, which may fail alone — their messages travel in `failures` — and the checks.
 */
export function liveRest(json: unknown, budgetMs = LIVE_BUDGET_MS, shouldStop?: () => boolean): Omit<LiveResult, "step"> {
  const s = upgradeScenario(json);
  const r = runScenario(s, { ...POLICIES.workbenchRest, budgetMs, shouldStop });
  const acc = r.checks.find((c) => c.id === "accuracy");
  const diss = r.checks.find((c) => c.id === "dissipation");
  return {
    loop: loopView(r.loop!),
    closed: r.closed,
    zout: r.zout ? { freq: r.zout.freq, magDb: toDb(r.zout.magOhm), phaseDeg: r.zout.phaseDeg } : null,
    noise: r.noise ? noiseView(r.noise) : null,
    op: r.op,
    checks: r.checks,
    cautions: r.cautions,
    fullScaleErrorPct: acc ? acc.value : null,
    worstDissipationW: diss ? diss.value : null,
    failures: r.failures,
  };
}

/** The whole live run in one thread (the page runs the two halves on two workers at once). */
export function liveRun(json: unknown, budgetMs = LIVE_BUDGET_MS): LiveResult {
  const step = liveStep(json, budgetMs);
  return { step, ...liveRest(json, budgetMs) };
}

/** What the review, the bench comparison and the library evidence show (review policy). */
export function reviewRun(json: unknown, budgetMs = LIVE_BUDGET_MS): ReviewSimulation {
  const s = upgradeScenario(json);
  return toReviewSimulation(s, runScenario(s, { ...reviewPolicy(s), budgetMs }));
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
