import "server-only";
/**
 * Checked writes of the team's parts: the role first (403: designers and leads create, edit and retire; viewers
 * read), then the values against the design layer's part schemas (400 naming the field), then the query module.
 */
import { z } from "zod";
import { DomainError } from "@/lib/errors";
import { roleAtLeast, type CurrentUser } from "@/lib/shared/roles";
import { describePartIssues, partInputSchema, partName, partValuesSchema, partsFileSchema, type PartInput } from "@/lib/design/part-records";
import { getPart, insertPart, insertPartVersion, listParts, partKind, retirePart, type PartSummary } from "@/lib/db/parts";

function mustDesign(actor: CurrentUser, what: string): void {
  if (!roleAtLeast(actor.role, "designer")) throw new DomainError(403, `Viewers cannot ${what} parts.`);
}

/** A part's input, checked; the message names the field ("values.GBW: …"). */
export function checkPartInput(input: unknown): PartInput {
  const r = partInputSchema.safeParse(input);
  if (!r.success) throw new DomainError(400, describePartIssues(r.error));
  return r.data;
}

export async function createPart(actor: CurrentUser, input: unknown, note = ""): Promise<PartSummary> {
  mustDesign(actor, "create");
  const part = checkPartInput(input);
  return insertPart(actor, { ...part, note });
}

/** A new version: the values of the part's own kind, and optionally a new name. */
export async function updatePart(actor: CurrentUser, id: string, input: { name?: unknown; values: unknown; note?: string }): Promise<PartSummary> {
  mustDesign(actor, "edit");
  const kind = await partKind(actor, id);
  const values = partValuesSchema(kind).safeParse(input.values);
  if (!values.success) throw new DomainError(400, describePartIssues(new z.ZodError(values.error.issues.map((i) => ({ ...i, path: ["values", ...i.path] })))));
  let name: string | undefined;
  if (input.name !== undefined) {
    const n = partName.safeParse(input.name);
    if (!n.success) throw new DomainError(400, n.error.issues[0]?.message ?? "name: invalid");
    name = n.data;
  }
  return insertPartVersion(actor, id, { name, values: values.data, note: input.note });
}

export async function retire(actor: CurrentUser, id: string): Promise<void> {
  mustDesign(actor, "retire");
  await retirePart(actor, id);
}

/**
 * Imports a parts file (our own JSON shape): every entry checked before anything is written, so a bad file writes
 * nothing and names the field ("parts.2.values.GBW: …"). Each part becomes a new part at version 1.
 */
export async function importParts(actor: CurrentUser, file: unknown): Promise<PartSummary[]> {
  mustDesign(actor, "import");
  const r = partsFileSchema.safeParse(file);
  if (!r.success) throw new DomainError(400, describePartIssues(r.error));
  // names checked before the first write, against the team's live parts and within the file
  const taken = new Set((await listParts(actor)).map((p) => `${p.kind}:${p.name.toLowerCase()}`));
  r.data.parts.forEach((p, i) => {
    const key = `${p.kind}:${p.name.toLowerCase()}`;
    if (taken.has(key)) throw new DomainError(409, `parts.${i}.name: the team already has a part called "${p.name}"; nothing was imported.`);
    taken.add(key);
  });
  const out: PartSummary[] = [];
  for (const p of r.data.parts) out.push(await insertPart(actor, { ...p, note: "imported" }));
  return out;
}

/** The team's live parts (or the given ones) as an export file. */
export async function exportParts(actor: CurrentUser, kind?: "opamp" | "pass"): Promise<z.infer<typeof partsFileSchema>> {
  const list = await listParts(actor, { kind });
  const parts: PartInput[] = [];
  for (const p of list) {
    const d = await getPart(actor, p.id);
    parts.push({ kind: d.kind, name: d.name, values: d.values } as PartInput);
  }
  return { format: "quell-parts", formatVersion: 1, parts };
}
