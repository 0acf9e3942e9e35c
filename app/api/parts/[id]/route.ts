import { z } from "zod";
import { apiRoute, json } from "@/lib/api/handler";
import { getPart, getPartVersion } from "@/lib/db/parts";
import { retire, updatePart } from "@/lib/parts/workflow";
import { storedText } from "@/lib/shared/text";

type P = { id: string };

const query = z.object({
  version: z.coerce.number({ error: "version must be a number" }).int("version must be a whole number").min(1, "version starts at 1").optional(),
}).strict();

/** GET /api/parts/:id — the part with its versions (any member); `?version=N` that version alone. */
export const GET = apiRoute<P, undefined, typeof query>({ query }, async ({ user, params, query }) =>
  query.version ? getPartVersion(user, params.id, query.version) : getPart(user, params.id));

const patchBody = z.object({
  name: z.unknown().optional(),
  values: z.record(z.string(), z.unknown(), { error: "values must be an object" }),
  note: storedText("note").max(2000, "note: at most 2000 characters").optional(),
}).strict();

/** PATCH /api/parts/:id — `{ values, name?, note? }` makes a new version (designers and leads); 400 names the field. */
export const PATCH = apiRoute<P, typeof patchBody>({ role: "designer", body: patchBody }, async ({ user, params, body }) =>
  updatePart(user, params.id, body));

/** DELETE /api/parts/:id — retires the part (designers and leads): 204. Its versions stay for old revisions. */
export const DELETE = apiRoute<P>({ role: "designer" }, async ({ user, params }) => {
  await retire(user, params.id);
  return new Response(null, { status: 204, headers: { "cache-control": "no-store" } });
});
