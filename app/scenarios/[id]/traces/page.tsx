import Link from "next/link";
import { notFound } from "next/navigation";
import { requirePageUser, roleAtLeast } from "@/lib/auth/current";
import { getScenarioDetail } from "@/lib/db/scenarios";
import { listTraces } from "@/lib/db/traces";
import { entryForRevision } from "@/lib/db/library";
import { getTeamTolerances } from "@/lib/library/tolerances";
import { DomainError } from "@/lib/errors";
import { TracesWorkspace } from "@/components/traces/TracesWorkspace";
import { IslandMark } from "@/components/shell/IslandMark";

export const dynamic = "force-dynamic";
export const metadata = { title: "Bench traces" };

export default async function TracesPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const user = await requirePageUser("viewer");
  const scenario = await getScenarioDetail(user, id).catch((e) => {
    if (e instanceof DomainError && e.status === 404) notFound();
    throw e;
  });
  if (!scenario.revisionId || scenario.revisionNumber === null) notFound();
  const [traces, tolerances, entry] = await Promise.all([
    listTraces(user, id),
    getTeamTolerances(user.teamId),
    entryForRevision(user, scenario.revisionId),
  ]);
  return (
    <main className="mx-auto max-w-screen-2xl px-6 py-8">
      <IslandMark />
      <nav className="mb-2 text-sm text-ink-muted" aria-label="Breadcrumb">
        <Link href="/scenarios" className="hover:underline">Scenarios</Link> /{" "}
        <Link href={`/scenarios/${id}`} className="hover:underline">{scenario.title}</Link> / Bench traces
      </nav>
      <div className="mb-6 flex flex-wrap items-baseline justify-between gap-2">
        <h1 className="text-2xl font-semibold">Bench traces — {scenario.title}</h1>
        <p className="text-sm">
          Revision {scenario.revisionNumber} · <Link className="text-signal underline" href={`/scenarios/${id}/review`}>Review</Link> ·{" "}
          <Link className="text-signal underline" href="/library">Library</Link>
        </p>
      </div>
      <TracesWorkspace
        scenarioId={id}
        revisionId={scenario.revisionId}
        revisionNumber={scenario.revisionNumber}
        body={scenario.body}
        traces={traces.map((t) => ({
          id: t.id, label: t.label, revisionId: t.revisionId, revisionNumber: t.revisionNumber, sampleCount: t.sampleCount,
          channels: t.channels.map((c) => ({ name: c.name, unit: c.unit })), fileName: t.fileName, uploaderName: t.uploaderName,
          uploaderId: t.uploaderId, createdAt: t.createdAt, duration: t.duration,
          // What the uploader entered about the instrument (the parsing options are kept apart under "parse").
          settings: Object.fromEntries(
            Object.entries(t.settings).filter(([k, v]) => k !== "parse" && (v === null || ["string", "number", "boolean"].includes(typeof v))),
          ) as Record<string, string | number | boolean | null>,
        }))}
        tolerances={tolerances}
        canUpload={roleAtLeast(user.role, "designer") && !scenario.deletedAt}
        canDeleteAll={user.role === "lead"}
        userId={user.id}
        entry={entry ? { id: entry.id, status: entry.status } : null}
      />
    </main>
  );
}
