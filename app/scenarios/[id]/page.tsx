import { notFound } from "next/navigation";
import { getScenarioWithRevision } from "@/lib/db/scenarios";
import { currentUser, requirePageUser, roleAtLeast } from "@/lib/auth/current";
import { tryUpgradeScenario } from "@/lib/design/upgrade";
import { publicBaseUrl } from "@/lib/shared/tokens";
import { livePartOptions } from "@/lib/db/parts";
import { Workbench } from "@/components/workbench/Workbench";
import { IslandMark } from "@/components/shell/IslandMark";
import { forkScenario, saveScenarioRevision } from "./actions";

export const dynamic = "force-dynamic";

export async function generateMetadata({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const [row, user] = await Promise.all([getScenarioWithRevision(id), currentUser()]);
  return { title: row && user && row.teamId === user.teamId ? row.title : "Scenario" };
}

export default async function ScenarioPage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requirePageUser("viewer"); // members of the scenario's team only (404 for others)
  const { id } = await params;
  const row = await getScenarioWithRevision(id);
  if (!row || row.teamId !== user.teamId) notFound();
  const opened = tryUpgradeScenario(row.body);
  if (!opened.ok) {
    return (
      <main className="mx-auto max-w-2xl px-6 py-10">
        <h1 className="text-xl font-semibold">{row.title}</h1>
        <p role="alert" className="mt-4 rounded border border-verdict-fail/40 bg-verdict-fail/5 p-3 text-sm text-verdict-fail">
          Revision {row.revisionNumber} cannot be opened: {opened.error}
        </p>
      </main>
    );
  }
  return (
    <>
      <IslandMark />
      <Workbench
        key={row.id}
        scenario={opened.scenario}
        title={row.title}
        scenarioId={row.id}
        revisionId={row.revisionId}
        revisionNumber={row.revisionNumber}
        save={roleAtLeast(user.role, "designer") ? saveScenarioRevision : null}
        fork={roleAtLeast(user.role, "designer") ? forkScenario : null}
        share={roleAtLeast(user.role, "designer") ? { canPublish: user.role === "lead" || row.ownerId === user.id, publicUrl: publicBaseUrl() } : null}
        teamParts={await livePartOptions(user)}
      />
    </>
  );
}
