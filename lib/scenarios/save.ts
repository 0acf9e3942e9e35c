import "server-only";
/**
 * Checked writes of scenarios: the role first (403), then the body against the design layer's scenario schema
 * (400, 413), then the query module. The query modules store what they are given and know nothing of designs.
 */
import { DomainError } from "@/lib/errors";
import { roleAtLeast, type CurrentUser } from "@/lib/shared/roles";
import { checkScenarioBody, starterBody } from "@/lib/design/scenarioBody";
import { insertScenario } from "@/lib/db/scenarios";
import { insertRevision, type SaveResult } from "@/lib/db/revisions";

/** A designer creates a scenario with its first revision: the given body, or the template's starting one. */
export async function createScenario(
  actor: CurrentUser,
  input: { title: string; template: string; body?: unknown; note?: string },
): Promise<{ id: string; revisionId: string; number: number }> {
  if (!roleAtLeast(actor.role, "designer")) throw new DomainError(403, "Viewers cannot create scenarios.");
  const body = checkScenarioBody(input.body ?? starterBody(input.template));
  return insertScenario(actor, { title: input.title, body, note: input.note });
}

/** Saves a new revision on top of `baseRevisionId`; a stale base comes back as a conflict (see insertRevision). */
export async function saveRevision(
  actor: CurrentUser,
  input: { scenarioId: string; baseRevisionId: string; note: string; body: unknown },
): Promise<SaveResult> {
  if (!roleAtLeast(actor.role, "designer")) throw new DomainError(403, "Viewers cannot save scenarios.");
  const body = checkScenarioBody(input.body);
  return insertRevision(actor, { ...input, body });
}
