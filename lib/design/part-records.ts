/**
 * The team's own parts as the design layer sees them: the values of an op-amp (the macro model plus the datasheet
 * figures the checks use) or of a pass device (model parameters and ratings), a part's input shape, the import/export
 * file of our own, and putting a part's version into a scenario (values plus id and version, so the revision
 * reproduces whatever becomes of the part).
 */
import { z } from "zod";
import { opampSchema, passSchema, type Scenario } from "./schema";

export const PART_KINDS = ["opamp", "pass"] as const;
export type PartKind = (typeof PART_KINDS)[number];

/** An op-amp part's values: the scenario's op-amp fields (without the preset name and part link). */
export const opampPartValues = opampSchema.omit({ preset: true, part: true }).strict();
/** A pass device's values: the scenario's pass-device fields (without the preset name and part link). */
export const passPartValues = passSchema.omit({ preset: true, part: true }).strict();
export type OpampPartValues = z.infer<typeof opampPartValues>;
export type PassPartValues = z.infer<typeof passPartValues>;

/** A part's name: our own words, up to 80 characters, no control characters. */
export const partName = z
  .string({ error: "name must be text" })
  .trim()
  .min(1, "name: give the part a name")
  .max(80, "name: at most 80 characters")
  // eslint-disable-next-line no-control-regex
  .refine((s) => !/[\u0000-\u001f\u007f]/.test(s), "name: no control characters");

/** What creating a part (or one entry of an import file) gives. */
export const partInputSchema = z.discriminatedUnion("kind", [
  z.object({ kind: z.literal("opamp"), name: partName, values: opampPartValues }).strict(),
  z.object({ kind: z.literal("pass"), name: partName, values: passPartValues }).strict(),
], { error: "kind must be opamp or pass" });
export type PartInput = z.infer<typeof partInputSchema>;

/** The values for a kind (a new version keeps its part's kind). */
export function partValuesSchema(kind: PartKind) {
  return kind === "opamp" ? opampPartValues : passPartValues;
}

/** The export/import file: `{ format: "quell-parts", formatVersion: 1, parts: [{ kind, name, values }] }`. */
export const PARTS_FILE_FORMAT = "quell-parts" as const;
export const partsFileSchema = z.object({
  format: z.literal(PARTS_FILE_FORMAT, { error: `format must be "${PARTS_FILE_FORMAT}"` }),
  formatVersion: z.literal(1, { error: "formatVersion must be 1" }),
  parts: z.array(partInputSchema).min(1, "parts: the file holds no parts").max(200, "parts: at most 200 parts per file"),
}).strict();
export type PartsFile = z.infer<typeof partsFileSchema>;

/** A stored part version as the scenario needs it. */
export interface PartVersionRecord {
  id: string;
  version: number;
  kind: PartKind;
  name: string;
  values: unknown;
}

/**
 * The scenario with a part's version as its op-amp or pass device: the values, the part's name as the preset name,
 * and the part's id and version. Throws RangeError naming the field when the values do not fit (a pass device of the
 * wrong kind for the template is left to the scenario schema, which names `pass.kind`).
 */
export function applyPart(s: Scenario, part: PartVersionRecord): Scenario {
  const ref = { id: part.id, version: part.version };
  if (part.kind === "opamp") {
    const v = opampPartValues.safeParse(part.values);
    if (!v.success) throw new RangeError(`values.${v.error.issues[0]?.path.join(".")}: ${v.error.issues[0]?.message}`);
    return { ...s, opamp: { ...v.data, preset: part.name, part: ref } };
  }
  const v = passPartValues.safeParse(part.values);
  if (!v.success) throw new RangeError(`values.${v.error.issues[0]?.path.join(".")}: ${v.error.issues[0]?.message}`);
  return { ...s, pass: { ...v.data, preset: part.name, part: ref } };
}

/** The values of a scenario's op-amp or pass device, as a part's values (the starting point of a new part). */
export function partValuesFrom(s: Scenario, kind: PartKind): OpampPartValues | PassPartValues {
  if (kind === "opamp") {
    const { preset: _p, part: _r, ...values } = s.opamp;
    return values;
  }
  const { preset: _p, part: _r, ...values } = s.pass;
  return values;
}

/** A readable first problem: "parts.2.values.GBW: Gain–bandwidth must be above zero". */
export function describePartIssues(error: z.ZodError): string {
  return error.issues.slice(0, 5).map((i) => `${i.path.length ? i.path.join(".") : "file"}: ${i.message}`).join("; ");
}
