import type { ReactNode } from "react";
import { notFound } from "next/navigation";
import { headers } from "next/headers";
import { requirePageUser } from "@/lib/auth/current";
import { scenarioRowInTeam } from "@/lib/db/scenarios";
import { db } from "@/lib/db/knex";
import { DomainError } from "@/lib/errors";

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
  // History, review and traces still show a deleted scenario (to restore it); the workbench does not open one.
  const path = (await headers()).get("x-quell-path") ?? "";
  const workbench = new RegExp(`^/scenarios/${id.replace(/[^0-9a-zA-Z-]/g, "")}(?:[?#]|$)`).test(path);
  await scenarioRowInTeam(db(), user, id, { includeDeleted: !workbench }).catch((e: unknown) => {
    if (e instanceof DomainError && e.status === 404) notFound();
    throw e;
  });
  return children;
}
