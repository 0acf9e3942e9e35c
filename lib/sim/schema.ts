/**
 * The netlist contract: plain JSON, SI units, validated with zod. Field names are a contract shared with the design
 * layer, the CLI and stored revisions: fields and kinds may be added, never renamed.
 */
import { z } from "zod";

const finite = () => z.number({ error: "must be a finite number" });
const positive = () => finite().positive({ error: "must be > 0" });
const nonNegative = () => finite().nonnegative({ error: "must be ≥ 0" });
const name = z.string().min(1, { error: "must be a non-empty string" });
const node = z.string().min(1, { error: "node names must be non-empty strings" });

export const pulseWaveSchema = z.object({
  shape: z.literal("pulse"),
  low: finite().default(0),
  high: finite(),
  /** s before the first rising edge */
  delay: nonNegative().default(0),
  /** s; 0 is treated as 1 ps */
  rise: nonNegative().default(1e-9),
  fall: nonNegative().default(1e-9),
  /** s at the high level */
  width: nonNegative(),
  /** s; null = a single pulse */
  period: positive().nullable().default(null),
});
export const sineWaveSchema = z.object({
  shape: z.literal("sine"),
  offset: finite().default(0),
  amplitude: finite(),
  freq: positive(),
  delay: nonNegative().default(0),
});
/** Piecewise-linear wave. "pwl", the shape's earlier name, is still read and becomes "piecewise" when parsed. */
export const piecewiseWaveSchema = z.object({
  shape: z.literal(["piecewise", "pwl"]),
  /** [time s, value] pairs, times non-decreasing; the value holds after the last point */
  points: z.array(z.tuple([nonNegative(), finite()])).min(1, { error: "needs at least one [t, value] point" }),
}).transform((w) => ({ ...w, shape: "piecewise" as const }));
export const waveSchema = z.discriminatedUnion("shape", [pulseWaveSchema, sineWaveSchema, piecewiseWaveSchema]);

const two = z.tuple([node, node]);

const resistor = z.object({ kind: z.literal("resistor"), name, nodes: two, value: positive() });
const capacitor = z.object({
  kind: z.literal("capacitor"), name, nodes: two, value: nonNegative(),
  /** initial volts, used when the transient starts from initial conditions */
  ic: finite().default(0),
});
const inductor = z.object({
  kind: z.literal("inductor"), name, nodes: two, value: positive(),
  /** initial amps, used when the transient starts from initial conditions */
  ic: finite().default(0),
});
const vsource = z.object({
  kind: z.literal("vsource"), name, nodes: two, dc: finite().default(0), ac: finite().default(0),
  /** AC phase in degrees (addition to the contract; default 0) */
  acPhase: finite().default(0),
  wave: waveSchema.nullable().default(null),
});
const isource = z.object({
  kind: z.literal("isource"), name, nodes: two, dc: finite().default(0), ac: finite().default(0),
  acPhase: finite().default(0),
  wave: waveSchema.nullable().default(null),
});
const vcvs = z.object({ kind: z.literal("vcvs"), name, nodes: two, control: two, gain: finite() });
const vccs = z.object({ kind: z.literal("vccs"), name, nodes: two, control: two, gm: finite() });
const switchEl = z.object({
  kind: z.literal("switch"), name, nodes: two, ron: positive().default(0.01), roff: positive().default(1e9),
  /** [time s, "on" | "off"]; the state before the first entry is "off" */
  schedule: z.array(z.tuple([nonNegative(), z.enum(["on", "off"])])).default([]),
  /** s for a change of state (log-interpolated resistance); 0 is treated as 1 ns */
  transition: nonNegative().default(1e-6),
});
const diodeModel = z.strictObject({
  Is: positive().default(1e-14), n: positive().default(1), Rs: nonNegative().default(0),
  Cj0: nonNegative().default(0), Vj: positive().default(0.7), m: finite().min(0).max(0.95).default(0.5),
  tau: nonNegative().default(0), BV: positive().nullable().default(null),
});
const diode = z.object({ kind: z.literal("diode"), name, nodes: two, model: diodeModel.prefault({}) });
const bjtModel = z.strictObject({
  Is: positive().default(1e-14), betaF: positive().default(100), betaR: positive().default(1),
  VA: positive().nullable().default(null),
  Cje0: nonNegative().default(0), Vje: positive().default(0.75), mje: finite().min(0).max(0.95).default(0.33),
  Cjc0: nonNegative().default(0), Vjc: positive().default(0.75), mjc: finite().min(0).max(0.95).default(0.33),
  tauF: nonNegative().default(0), tauR: nonNegative().default(0),
  rb: nonNegative().default(0), rc: nonNegative().default(0), re: nonNegative().default(0),
});
const bjt = z.object({
  kind: z.literal("bjt"), name, nodes: z.tuple([node, node, node]),
  polarity: z.enum(["npn", "pnp"]).default("npn"), model: bjtModel.prefault({}),
});
const mosfetModel = z.strictObject({
  Vth: finite().default(2), K: positive().default(1), lambda: nonNegative().default(0),
  Cgs: nonNegative().default(0), Cgd: nonNegative().default(0),
});
const mosfet = z.object({
  kind: z.literal("mosfet"), name, nodes: z.tuple([node, node, node]),
  polarity: z.enum(["n", "p"]).default("n"), model: mosfetModel.prefault({}),
});
const opampModel = z.strictObject({
  Aol: positive().default(1e5), GBW: positive().default(1e6), fp2: positive().nullable().default(null),
  Rout: nonNegative().default(0), slewRate: positive().nullable().default(null), Vos: finite().default(0),
  Ib: finite().default(0), swingHigh: finite().nullable().default(null), swingLow: finite().nullable().default(null),
  Iout: positive().nullable().default(null),
});
const opamp = z.object({
  kind: z.literal("opamp"), name, nodes: z.tuple([node, node, node, node, node]), model: opampModel.prefault({}),
});

/** Kinds the engine knows, in the order of the union below. */
export const ELEMENT_KINDS = [
  "resistor", "capacitor", "inductor", "vsource", "isource", "vcvs", "vccs", "switch", "diode", "bjt", "mosfet", "opamp",
] as const;

export const elementSchema = z.discriminatedUnion("kind", [
  resistor, capacitor, inductor, vsource, isource, vcvs, vccs, switchEl, diode, bjt, mosfet, opamp,
]);

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
export type Wave = z.output<typeof waveSchema>;
export type SimTolerances = z.output<typeof optionsSchema>;
