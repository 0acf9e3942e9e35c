/**
 * Building blocks of the netlist schema shared by the element kinds (each kind's schema sits beside its element, see
 * kind.ts and registry.ts): number and name fields with the messages the validator shows, and the source waves.
 */
import { z } from "zod";

export const finite = () => z.number({ error: "must be a finite number" });
export const positive = () => finite().positive({ error: "must be > 0" });
export const nonNegative = () => finite().nonnegative({ error: "must be ≥ 0" });
export const name = z.string().min(1, { error: "must be a non-empty string" });
export const node = z.string().min(1, { error: "node names must be non-empty strings" });
/** two terminals */
export const two = z.tuple([node, node]);
/** three terminals */
export const three = z.tuple([node, node, node]);
/** true: the element's noise sources are left out of a noise analysis (default false) */
export const noiseless = z.boolean({ error: "must be true or false" }).default(false);
/** a grading coefficient of a junction */
export const grading = () => finite().min(0).max(0.95);

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

export type Wave = z.output<typeof waveSchema>;
