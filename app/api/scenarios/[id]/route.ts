import { apiRoute, json } from "@/lib/api/handler";
import { patchScenarioBody } from "@/lib/api/schemas";
import { getScenarioDetail, restoreScenario, softDeleteScenario, updateScenarioMeta } from "@/lib/db/scenarios";
import { saveRevision } from "@/lib/scenarios/save";

type P = { id: string };

/** GET /api/scenarios/:id — the scenario with its current revision. */
export const GET = apiRoute<P>({}, async ({ user, params }) => getScenarioDetail(user, params.id));

/**
 * PATCH /api/scenarios/:id — `{ baseRevisionId, body, note }` saves a new revision (409 with the current one when
 * the base is stale); `title`/`status` change the scenario; `restore: true` undoes a delete (owner or lead).
 */
export const PATCH = apiRoute<P, typeof patchScenarioBody>({ role: "designer", body: patchScenarioBody }, async ({ user, params, body }) => {
  if (body.restore) await restoreScenario(user, params.id);
  let revision: { revisionId: string; number: number } | undefined;
  if (body.body !== undefined && body.baseRevisionId) {
    const r = await saveRevision(user, { scenarioId: params.id, baseRevisionId: body.baseRevisionId, note: body.note ?? "", body: body.body });
    if (!r.ok) return json({ error: r.message, conflict: r.conflict }, 409);
    revision = { revisionId: r.revisionId, number: r.number };
  }
  if (body.title !== undefined || body.status !== undefined) await updateScenarioMeta(user, params.id, { title: body.title, status: body.status });
  return { ...(await getScenarioDetail(user, params.id)), saved: revision ?? null };
});

/** DELETE /api/scenarios/:id — soft delete (owner or lead); PATCH with restore brings it back. */
export const DELETE = apiRoute<P>({ role: "designer" }, async ({ user, params }) => {
  await softDeleteScenario(user, params.id);
  return new Response(null, { status: 204 });
});
