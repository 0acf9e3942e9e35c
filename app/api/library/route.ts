import { z } from "zod";
import { apiRoute, json } from "@/lib/api/handler";
import { libraryFacets, libraryFiltersSchema, listEntries, submitSchema } from "@/lib/db/library";
import { submitForValidation } from "@/lib/library/workflow";

/** Query strings arrive as strings; an empty filter (`status=`) means no filter. */
const query = z.preprocess(
  (raw) => Object.fromEntries(Object.entries(raw as Record<string, string>).filter(([, v]) => v !== "")),
  libraryFiltersSchema,
);

/** GET /api/library?q=&template=&status=&loadType=&passElement=&currentMin=&currentMax= — the team's entries. */
export const GET = apiRoute({ query }, async ({ user, query }) => ({
  entries: await listEntries(user, query),
  facets: await libraryFacets(user.teamId),
}));

const submitBody = submitSchema.extend({ scenarioId: z.string().uuid() });

/**
 * POST /api/library — submit a revision for validation: `{ scenarioId, revisionId?, note, traceIds, keyFigures?,
 * comparisons? }` (designers and leads). 201 with `{ entryId, status, mailFailures }`.
 */
export const POST = apiRoute({ role: "designer", body: submitBody }, async ({ user, body }) => {
  const { scenarioId, ...rest } = body;
  return json(await submitForValidation(user, scenarioId, rest), 201);
});
