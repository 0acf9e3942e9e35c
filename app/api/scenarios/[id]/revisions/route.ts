import { apiRoute } from "@/lib/api/handler";
import { revisionsQuery } from "@/lib/api/schemas";
import { getRevision, listRevisions } from "@/lib/db/revisions";
import { ApiError } from "@/lib/api/errors";

type P = { id: string };

/** GET /api/scenarios/:id/revisions — the history, newest first; ?revision=ID returns that one with its body. */
export const GET = apiRoute<P, undefined, typeof revisionsQuery>({ query: revisionsQuery }, async ({ user, params, query }) => {
  if (query.revision) {
    const r = await getRevision(user, query.revision);
    if (r.scenarioId !== params.id) throw new ApiError(404, "No such revision of this scenario.");
    return r;
  }
  return { revisions: await listRevisions(user, params.id) };
});
