import "server-only";
/** The team's tolerances of the measured-vs-simulated verdict: stored by lib/db, checked here against lib/traces. */
import type { Knex } from "knex";
import { DomainError } from "@/lib/errors";
import type { CurrentUser } from "@/lib/shared/roles";
import { storedTeamTolerances, storeTeamTolerances } from "@/lib/db/library";
import { DEFAULT_TOLERANCES, tolerancesSchema, type Tolerances } from "@/lib/traces/compare";

/** The team's tolerances; the defaults when none are stored (or what is stored no longer parses). */
export async function getTeamTolerances(teamId: string, trx?: Knex | Knex.Transaction): Promise<Tolerances> {
  const parsed = tolerancesSchema.safeParse(await storedTeamTolerances(teamId, trx));
  return parsed.success ? parsed.data : DEFAULT_TOLERANCES;
}

/** Leads set the team's tolerances. */
export async function setTeamTolerances(actor: CurrentUser, tolerances: Tolerances): Promise<Tolerances> {
  if (actor.role !== "lead") throw new DomainError(403, "Only a lead can set the team's tolerances.");
  const t = tolerancesSchema.parse(tolerances);
  await storeTeamTolerances(actor, t);
  return t;
}

/** The tolerances an entry was submitted under (kept in its evidence); `fallback` for entries without them. */
export function evidenceTolerances(stored: unknown, fallback: Tolerances = DEFAULT_TOLERANCES): Tolerances {
  const parsed = tolerancesSchema.safeParse(stored);
  return parsed.success ? parsed.data : fallback;
}
