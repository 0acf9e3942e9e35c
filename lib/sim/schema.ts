/**
 * The netlist contract: plain JSON, SI units, validated with zod. Field names are a contract shared with the design
 * layer, the CLI and stored revisions: fields and kinds may be added, never renamed.
 */
import { z } from "zod";
import { finite, name, nonNegative, positive } from "./fields";
import { elementSchema } from "./registry";

export { ELEMENT_KINDS, elementSchema } from "./registry";
export { waveSchema, pulseWaveSchema, sineWaveSchema, piecewiseWaveSchema, type Wave } from "./fields";

export const analysisSchema = z.discriminatedUnion("kind", [
  z.object({ kind: z.literal("op") }),
  z.object({
    kind: z.literal("dcsweep"), source: name, from: finite(), to: finite(),
    points: z.number().int({ error: "must be an integer" }).min(1, { error: "must be ≥ 1" }).max(1_000_000).default(101),
  }),
  z.object({
    kind: z.literal("ac"), fStart: positive(), fStop: positive(),
    pointsPerDecade: z.number().int({ error: "must be an integer" }).min(1, { error: "must be ≥ 1" }).max(10_000).default(20),
  }),
  z.object({
    kind: z.literal("noise"),
    /** where the noise is measured: a node's voltage (against ground, or `reference`), or a vsource's current */
    output: z.union([
      z.strictObject({ node: name, reference: name.optional() }),
      z.strictObject({ current: name }),
    ], { error: 'must be {"node": …} , {"node": …, "reference": …} or {"current": "<vsource>"}' }),
    /** a vsource or isource the output noise is also referred to */
    input: name.optional(),
    fStart: positive(), fStop: positive(),
    pointsPerDecade: z.number().int({ error: "must be an integer" }).min(1, { error: "must be ≥ 1" }).max(10_000).default(20),
  }),
  z.object({
    kind: z.literal("tran"), tStop: positive(),
    /** s: output resolution; when given (and maxStep is not), also the largest step. Default: none (tStop/50 bounds
     *  the step, and the first steps start from tStop/1000) */
    tStep: positive().nullable().default(null),
    /** s: largest step; null = the accuracy defaults (step ≤ tStep, truncation error per unit step relative to each
     *  charge's full scale; see analysis/tran.ts). Giving it keeps the classic truncation-error tolerance. */
    maxStep: positive().nullable().default(null),
    start: z.enum(["op", "ic"]).default("op"),
  }),
]);

/** Solver tolerances (addition to the contract; every field optional). */
export const optionsSchema = z.strictObject({
  /** relative tolerance for Newton and the truncation-error control */
  reltol: positive().default(1e-3),
  /** V: absolute voltage tolerance */
  vntol: positive().default(1e-6),
  /** A: absolute current tolerance */
  abstol: positive().default(1e-12),
  /** S: conductance across every junction */
  gmin: nonNegative().default(1e-12),
  /** truncation-error over-estimate factor (Nagel 1975 uses 7; 1 here, because step-response metrics such as
   *  overshoot and 0.1 % settling need the tighter time steps) */
  trtol: positive().default(1),
  /** Newton iterations per solve */
  maxNewton: z.number().int().min(3).max(10_000).default(100),
  /** transient steps (accepted + rejected) before a "budget" error */
  maxSteps: z.number().int().min(10).default(2_000_000),
});

export const netlistSchema = z.object({
  /** °C; Vt = kT/q */
  temperature: finite().min(-273.15, { error: "must be above absolute zero" }).default(27),
  elements: z.array(elementSchema).min(1, { error: "needs at least one element" }),
  analysis: analysisSchema,
  options: optionsSchema.prefault({}),
});

/** A netlist as written (model fields and defaults optional). `simulate` and `compile` accept this. */
export type Netlist = z.input<typeof netlistSchema>;
/** A netlist after validation, every default filled in. */
export type ParsedNetlist = z.output<typeof netlistSchema>;
export type NetlistElement = z.input<typeof elementSchema>;
export type ParsedElement = z.output<typeof elementSchema>;
export type Analysis = z.input<typeof analysisSchema>;
export type ParsedAnalysis = z.output<typeof analysisSchema>;
export type SimTolerances = z.output<typeof optionsSchema>;
