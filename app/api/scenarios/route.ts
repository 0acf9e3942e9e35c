import { apiRoute, json } from "@/lib/api/handler";
import { createScenarioBody, scenarioListQuery } from "@/lib/api/schemas";
import { listScenarios, scenarioFacets } from "@/lib/db/scenarios";
import { createScenario } from "@/lib/scenarios/save";
import { getRevision } from "@/lib/db/revisions";

/** GET /api/scenarios — the team's scenarios: ?q, owner, template, status, sort, dir, page, pageSize, deleted. */
export const GET = apiRoute({ query: scenarioListQuery }, async ({ user, query }) => {
  const list = await listScenarios(user, query);
  return { ...list, facets: await scenarioFacets(user.teamId) };
});

/** POST /api/scenarios — create from a template (or from a revision, e.g. a library entry's). Designers and leads. */
export const POST = apiRoute({ role: "designer", body: createScenarioBody }, async ({ user, body }) => {
  const from = body.fromRevisionId ? await getRevision(user, body.fromRevisionId) : null;
  const created = await createScenario(user, {
    title: body.title,
    template: from?.template ?? body.template,
    body: body.body ?? from?.body,
    note: body.note ?? (from ? `Created from “${from.scenarioTitle}” revision ${from.number}` : undefined),
  });
  return json(created, 201);
});
