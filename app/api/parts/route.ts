import { z } from "zod";
import { apiRoute, json } from "@/lib/api/handler";
import { listParts, partFiltersSchema } from "@/lib/db/parts";
import { createPart, exportParts, importParts } from "@/lib/parts/workflow";
import { storedText } from "@/lib/shared/text";

/** Query strings arrive as strings; an empty filter (`kind=`) means no filter. `export=1` answers the export file. */
const query = z.preprocess(
  (raw) => Object.fromEntries(Object.entries(raw as Record<string, string>).filter(([, v]) => v !== "")),
  partFiltersSchema.extend({ export: z.literal("1", { error: "export must be 1" }).optional() }),
);

/**
 * GET /api/parts?kind=opamp|pass&q=&retired=include|exclude|only — the team's parts (any member). With `export=1`,
 * the team's live parts as a parts file (`{ format: "quell-parts", formatVersion: 1, parts }`) to download.
 */
export const GET = apiRoute({ query }, async ({ user, query }) => {
  if (query.export) {
    const file = await exportParts(user, query.kind);
    return json(file, 200, { "content-disposition": `attachment; filename="parts-${user.teamName.replace(/[^\w-]+/g, "-").toLowerCase()}.json"` });
  }
  return { parts: await listParts(user, query) };
});

const body = z.union([
  z.object({ format: z.string() }).passthrough(),
  z.object({ kind: z.unknown(), name: z.unknown(), values: z.unknown(), note: storedText("note").max(2000, "note: at most 2000 characters").optional() }).strict(),
], { error: "Give a part ({ kind, name, values, note? }) or a parts file ({ format: \"quell-parts\", formatVersion: 1, parts })" });

/**
 * POST /api/parts — designers and leads. `{ kind, name, values, note? }` creates a part at version 1 (201 with the
 * part); a parts file imports every part in it (201 with `{ parts }`), all or nothing. A bad value is 400 naming the
 * field ("values.GBW: …", "parts.2.values.GBW: …"); a name the team already uses is 409.
 */
export const POST = apiRoute({ role: "designer", body }, async ({ user, body }) => {
  if ("format" in body) return json({ parts: await importParts(user, body) }, 201);
  const { note, ...part } = body;
  return json(await createPart(user, part, note ?? ""), 201);
});
