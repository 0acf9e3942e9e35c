import Link from "next/link";
import { notFound } from "next/navigation";
import { requirePageUser } from "@/lib/auth/current";
import { getScenarioDetail } from "@/lib/db/scenarios";
import { getRevision } from "@/lib/db/revisions";
import { listTraces } from "@/lib/db/traces";
import { entryForRevision } from "@/lib/db/library";
import { evidenceTolerances, getTeamTolerances } from "@/lib/library/tolerances";
import { DomainError } from "@/lib/errors";
import { ReviewDocument } from "@/components/review/ReviewDocument";
import "./print.css";
import { IslandMark } from "@/components/shell/IslandMark";

export const dynamic = "force-dynamic";
export const metadata = { title: "Review" };

function notFoundOn404(e: unknown): never {
  if (e instanceof DomainError && e.status === 404) notFound();
  throw e;
}

/** The printable design review of a scenario's current revision, or of `?revision=<id>` (an immutable one). */
export default async function ReviewPage({ params, searchParams }: { params: Promise<{ id: string }>; searchParams: Promise<{ revision?: string }> }) {
  const { id } = await params;
  const { revision: revisionParam } = await searchParams;
  const user = await requirePageUser("viewer");
  const scenario = await getScenarioDetail(user, id, { includeDeleted: true }).catch(notFoundOn404);
  const revisionId = revisionParam ?? scenario.revisionId;
  if (!revisionId) notFound();
  const revision = await getRevision(user, revisionId).catch(notFoundOn404);
  if (revision.scenarioId !== id) notFound();
  const [entry, traces, tolerances] = await Promise.all([
    entryForRevision(user, revision.id),
    listTraces(user, id, { revisionId: revision.id }),
    getTeamTolerances(user.teamId),
  ]);
  // Evidence first (what the lead judged), then any other capture of this revision.
  const evidence = new Set(entry?.evidence.traceIds ?? []);
  const ordered = [...traces].sort((a, b) => Number(evidence.has(b.id)) - Number(evidence.has(a.id)));
  return (
    <main className="review-page mx-auto max-w-5xl px-6 py-8">
      <IslandMark />
      <nav className="no-print mb-3 text-sm text-ink-muted" aria-label="Breadcrumb">
        <Link href="/scenarios" className="hover:underline">Scenarios</Link> /{" "}
        <Link href={`/scenarios/${id}`} className="hover:underline">{scenario.title}</Link> / Review ·{" "}
        <Link href={`/scenarios/${id}/traces`} className="text-signal hover:underline">Bench traces</Link>
        {entry && <> · <Link href={`/library/${entry.id}`} className="text-signal hover:underline">Library entry</Link></>}
      </nav>
      <ReviewDocument
        title={scenario.title}
        teamName={user.teamName}
        template={revision.template}
        revision={{ id: revision.id, number: revision.number, authorName: revision.authorName, note: revision.note, createdAt: revision.createdAt, isCurrent: revision.id === scenario.revisionId }}
        body={revision.body}
        entry={entry}
        traces={ordered.map((t) => ({ id: t.id, label: t.label, revisionNumber: t.revisionNumber, sampleCount: t.sampleCount, channels: t.channels.map((c) => ({ name: c.name, unit: c.unit })) }))}
        tolerances={evidenceTolerances(entry?.evidence.tolerances, tolerances)}
        preparedFor={user.name}
        preparedAt={new Date().toISOString()}
      />
    </main>
  );
}
