import type { ReactNode } from "react";
import { notFound } from "next/navigation";
import { requirePageUser } from "@/lib/auth/current";
import { scenarioRowInTeam } from "@/lib/db/scenarios";
import { db } from "@/lib/db/knex";
import { DomainError } from "@/lib/db/errors";

export const dynamic = "force-dynamic";

/**
 * Decides access to every page of a scenario (workbench, history, review, bench traces) before anything streams:
 * this layout sits outside the Suspense boundary of loading.tsx, so an anonymous visitor gets a real redirect to
 * sign-in and another team's member a real 404, instead of a 200 with the answer inside the streamed body.
 * The pages check again for themselves.
 */
export default async function ScenarioAccessLayout({ children, params }: { children: ReactNode; params: Promise<{ id: string }> }) {
  const user = await requirePageUser("viewer");
  const { id } = await params;
  await scenarioRowInTeam(db(), user, id, { includeDeleted: true }).catch((e: unknown) => {
    if (e instanceof DomainError && e.status === 404) notFound();
    throw e;
  });
  return children;
}
