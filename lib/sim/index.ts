/**
 * Quell's circuit engine: modified nodal analysis with operating point, DC sweep, AC, noise and transient analyses;
 * diode, Ebers–Moll BJT, square-law MOSFET and macro op-amp models. Pure TypeScript (runs in a Web Worker or Node).
 *
 *   const result = simulate(netlist, { timeBudgetMs: 5000, shouldStop, onProgress });
 *
 * `compile(netlist)` validates and builds the topology once and returns an object whose `run()` can be called
 * repeatedly (each run restarts from a zero guess; device limiting state is reused as a warm start). Build a new one
 * when element values change — compiling is cheap next to solving.
 *
 * Module map: schema.ts (zod netlist contract) · registry.ts (every element kind: schema, factory, topology rules;
 * each defined beside its element via kind.ts) · fields.ts (shared schema fields, waves) · ground.ts · netlist.ts (validation, topology rules) · errors.ts (SimError) ·
 * circuit.ts (unknowns, stamp positions, integration state) · compile.ts (netlist → circuit) · elements/ (stamps and
 * device models) · lu.ts (dense LU with partial pivoting, the benchmark's comparison; production code does not import
 * it) · sparse.ts (LU with a reused order and fill pattern, the hot path) · checkpoint.ts (budget and cancellation) ·
 * analysis/ (newton.ts DC solve and continuation, dc.ts, ac.ts, tran.ts, noise.ts) · waves.ts · results.ts · cli.ts (Node only).
 */
import { analysisSchema, type Analysis, type Netlist, type ParsedNetlist } from "./schema";
import { parseNetlist } from "./netlist";
import { buildCircuit } from "./compile";
import type { Circuit } from "./circuit";
import { runDcSweep, runOp } from "./analysis/dc";
import { runAc, runAcMulti, type AcExcitation } from "./analysis/ac";
import { runTran } from "./analysis/tran";
import { runNoise } from "./analysis/noise";
import { runLinearStep, type LinearStepResult } from "./analysis/linstep";
import { SimError } from "./errors";
import { rulesOf } from "./registry";
import type { SimResult } from "./results";

export { netlistSchema, elementSchema, analysisSchema, waveSchema, ELEMENT_KINDS } from "./schema";
export type { Netlist, ParsedNetlist, NetlistElement, ParsedElement, Analysis, ParsedAnalysis, Wave, SimTolerances } from "./schema";
export { parseNetlist, isGround } from "./netlist";
export { SimError, isSimError, type SimErrorCode } from "./errors";
export { resultToJSON } from "./results";
export type { SimResult, OpResult, DcSweepResult, AcResult, TranResult, NoiseResult, ComplexColumn, DeviceInfo } from "./results";
export type { NoiseOutput, NoiseSpec } from "./analysis/noise";
export { integratePower } from "./analysis/noise";
export type { AcExcitation } from "./analysis/ac";
export type { LinearStepResult } from "./analysis/linstep";
import type { AcResult, OpResult } from "./results";
export { transportCurrents } from "./elements/bjt";
export { logFrequencies } from "./analysis/ac";

export interface SimOptions {
  /** wall-clock budget, ms (default 30 000); exceeding it throws SimError "budget" */
  timeBudgetMs?: number;
  /** polled between steps/iterations; returning true throws SimError "cancelled" */
  shouldStop?: () => boolean;
  /** fraction done, 0..1 (sweeps, AC and transient) */
  onProgress?: (fraction: number) => void;
}

export const DEFAULT_TIME_BUDGET_MS = 30_000;

export interface CompiledNetlist {
  /** the validated netlist with defaults filled in */
  readonly netlist: ParsedNetlist;
  /** user node names, in unknown order (ground excluded) */
  readonly nodeNames: readonly string[];
  /** size of the MNA system */
  readonly unknowns: number;
  /** Run the netlist's analysis, or another one on the same circuit. */
  run(options?: SimOptions, analysis?: Analysis): SimResult;
  /**
   * One operating point, then an AC analysis per excitation set (the netlist's AC analysis, or `analysis`, which
   * must be of kind "ac"). Each set names sources whose AC magnitude/phase it replaces; the others keep the
   * netlist's. The OP, the linearisation and each frequency's factorisation are shared, so n sets cost little more
   * than one AC run. `op` is the operating point the small-signal model was taken at.
   */
  runAcMulti(excitations: readonly AcExcitation[], options?: SimOptions, analysis?: Analysis): { op: OpResult; results: AcResult[] };
  /**
   * Small-signal step: the circuit linearised at its operating point (as for AC) driven by a unit step of `source`'s
   * AC excitation rising over `edge` s, in `steps` equal steps to `tStop`. Node voltages and voltage-source currents
   * are deviations from the operating point per unit of input.
   */
  runLinearStep(source: string, tStop: number, steps: number, edge: number, options?: SimOptions): LinearStepResult;
}

function prepare(c: Circuit, options: SimOptions): void {
  c.deadline = performance.now() + (options.timeBudgetMs ?? DEFAULT_TIME_BUDGET_MS);
  c.shouldStop = options.shouldStop;
  c.newtonIterations = 0;
  c.srcScale = 1;
  c.gshunt = 0;
}

function execute(c: Circuit, netlist: ParsedNetlist, analysis: ParsedNetlist["analysis"], options: SimOptions): SimResult {
  prepare(c, options);
  switch (analysis.kind) {
    case "op": return runOp(c);
    case "dcsweep": return runDcSweep(c, analysis.source, analysis.from, analysis.to, analysis.points, options.onProgress);
    case "ac": return runAc(c, analysis.fStart, analysis.fStop, analysis.pointsPerDecade, options.onProgress);
    case "tran": return runTran(c, analysis, options.onProgress);
    case "noise": return runNoise(c, analysis, options.onProgress);
  }
}

export function compile(netlist: Netlist | ParsedNetlist): CompiledNetlist {
  const parsed = parseNetlist(netlist);
  const c = buildCircuit(parsed);
  const pick = (analysis: Analysis | undefined): ParsedNetlist["analysis"] => {
    if (!analysis) return parsed.analysis;
    const r = analysisSchema.safeParse(analysis);
    if (!r.success) throw new SimError("invalid", `Invalid analysis: ${r.error.issues.map((i) => `field "${i.path.join(".")}" ${i.message}`).join("; ")}`);
    const a = r.data;
    if (a.kind === "dcsweep" && !parsed.elements.some((e) => e.name === a.source && rulesOf(e).sweepable)) {
      throw new SimError("invalid", `Invalid analysis: field "source" names "${a.source}", which is not a vsource or isource`);
    }
    return a;
  };
  return {
    netlist: parsed,
    nodeNames: c.userNodeNames,
    unknowns: c.n,
    run(options: SimOptions = {}, analysis?: Analysis): SimResult {
      return execute(c, parsed, pick(analysis), options);
    },
    runAcMulti(excitations: readonly AcExcitation[], options: SimOptions = {}, analysis?: Analysis) {
      const a = pick(analysis);
      if (a.kind !== "ac") throw new SimError("invalid", `Invalid analysis: field "kind" must be "ac" for runAcMulti (got "${a.kind}")`);
      if (excitations.length === 0) throw new SimError("invalid", "Invalid excitations: at least one excitation set is needed");
      prepare(c, options);
      const op = runOp(c);
      const results = runAcMulti(c, a.fStart, a.fStop, a.pointsPerDecade, excitations, options.onProgress, true);
      return { op, results };
    },
    runLinearStep(source: string, tStop: number, steps: number, edge: number, options: SimOptions = {}) {
      prepare(c, options);
      return runLinearStep(c, source, tStop, steps, edge);
    },
  };
}

/** Validate and run the netlist's analysis. Throws SimError (see errors.ts for the codes). */
export function simulate(netlist: Netlist | ParsedNetlist, options: SimOptions = {}): SimResult {
  // the budget covers validation and compilation too (a large netlist's dense matrices take a while to build)
  const start = performance.now();
  const compiled = compile(netlist);
  const budget = options.timeBudgetMs ?? DEFAULT_TIME_BUDGET_MS;
  return compiled.run({ ...options, timeBudgetMs: budget - (performance.now() - start) });
}
