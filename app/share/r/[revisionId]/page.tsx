import Link from "next/link";
import { notFound } from "next/navigation";
import { requirePageUser } from "@/lib/auth/current";
import { roleAtLeast } from "@/lib/shared/roles";
import { getRevision } from "@/lib/db/revisions";
import { DomainError } from "@/lib/errors";
import { RevisionView } from "@/components/scenarios/RevisionView";
import { Comments } from "@/components/scenarios/Comments";
import { ForkButton } from "@/components/scenarios/ScenarioButtons";
import { forkScenario } from "@/app/scenarios/[id]/actions";
import { templateTitle } from "@/components/scenarios/RevisionView";
import { BUTTON } from "@/components/shell/classes";
import { formatDateTime } from "@/lib/shared/dates";

export const dynamic = "force-dynamic";
export const metadata = { title: "Shared revision" };

/** The team link to one revision: read-only for every member, with "fork to my drafts" for designers. */
export default async function TeamSharePage({ params }: { params: Promise<{ revisionId: string }> }) {
  const user = await requirePageUser("viewer");
  const { revisionId } = await params;
  const r = await getRevision(user, revisionId).catch((e) => {
    if (e instanceof DomainError && e.status === 404) notFound();
    throw e;
  });
  const latest = r.currentRevisionId === r.id;
  return (
    <main className="mx-auto max-w-6xl px-6 py-8">
      <p className="text-sm text-ink-muted">Shared with {user.teamName} · read-only</p>
      <div className="mt-1 flex flex-wrap items-center gap-3">
        <h1 className="mr-auto text-2xl font-semibold">
          {r.scenarioTitle} <span className="num text-ink-muted">· revision {r.number}</span>
        </h1>
        {roleAtLeast(user.role, "designer") && <ForkButton revisionId={r.id} fork={forkScenario} />}
        {!r.scenarioDeleted && (
          <Link href={`/scenarios/${r.scenarioId}/history`} className={BUTTON}>History</Link>
        )}
      </div>
      <p className="mt-1 text-sm text-ink-muted">
        Saved by {r.authorName} on {formatDateTime(r.createdAt)} · {templateTitle(r.template)}
        {!latest && <span className="ml-2 text-verdict-warn">A newer revision exists.</span>}
        {r.scenarioDeleted && <span className="ml-2 text-verdict-fail">The scenario has been deleted.</span>}
      </p>
      {r.note && <p className="mt-3 rounded border border-hairline bg-white px-4 py-2 text-sm">“{r.note}”</p>}
      <div className="mt-6 grid gap-6 lg:grid-cols-[2fr_1fr] [&>*]:min-w-0">
        <RevisionView body={r.body} />
        {!r.scenarioDeleted && <Comments scenarioId={r.scenarioId} revisionId={r.id} />}
      </div>
    </main>
  );
}
