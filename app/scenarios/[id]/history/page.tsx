import Link from "next/link";
import { notFound } from "next/navigation";
import { requirePageUser } from "@/lib/auth/current";
import { getScenarioDetail } from "@/lib/db/scenarios";
import { DomainError } from "@/lib/errors";
import { RevisionHistory } from "@/components/scenarios/RevisionHistory";
import { ShareDialog } from "@/components/scenarios/ShareDialog";
import { Comments } from "@/components/scenarios/Comments";
import { ForkButton, DeleteButton } from "@/components/scenarios/ScenarioButtons";
import { SaveRevisionForm } from "@/components/scenarios/SaveRevisionForm";
import { StatusSelect } from "@/components/scenarios/StatusSelect";
import { TEMPLATE_CHOICES } from "@/lib/design/scenarioBody";
import { SCENARIO_STATUSES } from "@/lib/shared/statuses";
import { tryUpgradeScenario } from "@/lib/design/upgrade";
import { publicBaseUrl } from "@/lib/shared/tokens";
import { forkScenario, saveScenarioRevision, setScenarioDeleted } from "../actions";

export const dynamic = "force-dynamic";
export const metadata = { title: "History" };

export default async function HistoryPage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requirePageUser("viewer");
  const { id } = await params;
  const s = await getScenarioDetail(user, id, { includeDeleted: true }).catch((e) => {
    if (e instanceof DomainError && e.status === 404) notFound();
    throw e;
  });
  // The form starts from the revision as the current schema reads it (older versions upgraded), else as stored.
  const upgraded = tryUpgradeScenario(s.body);
  const editable = upgraded.ok ? upgraded.scenario : s.body;
  const templateTitle = TEMPLATE_CHOICES.find((t) => t.id === s.template)?.title ?? s.template;
  return (
    <main className="mx-auto max-w-6xl px-6 py-8">
      <p className="text-sm text-ink-muted">
        <Link href="/scenarios" className="hover:underline">Scenarios</Link> /{" "}
        {s.deletedAt ? s.title : <Link href={`/scenarios/${s.id}`} className="hover:underline">{s.title}</Link>}
      </p>
      <div className="mt-1 flex flex-wrap items-center gap-3">
        <h1 className="mr-auto text-2xl font-semibold">History of {s.title}</h1>
        {s.can.share && s.revisionId && s.revisionNumber !== null && (
          <ShareDialog scenarioId={s.id} revisionId={s.revisionId} revisionNumber={s.revisionNumber} canPublish={s.can.delete} publicUrl={publicBaseUrl()} />
        )}
        {s.can.edit && <StatusSelect scenarioId={s.id} status={s.status} statuses={[...new Set<string>([...SCENARIO_STATUSES, s.status])]} />}
        {s.can.share && s.revisionId && <ForkButton revisionId={s.revisionId} fork={forkScenario} label="Fork" />}
        {s.can.delete && <DeleteButton scenarioId={s.id} deleted={!!s.deletedAt} setDeleted={setScenarioDeleted} />}
      </div>
      <p className="mt-1 text-sm text-ink-muted">
        {templateTitle} · owner {s.ownerName} · status {s.status}
        {s.deletedAt && <span className="ml-2 font-medium text-verdict-fail">Deleted — restore it to edit</span>}
      </p>
      <div className="mt-6 grid gap-6 lg:grid-cols-[2fr_1fr] [&>*]:min-w-0">
        <div className="space-y-6">
          <RevisionHistory scenarioId={s.id} />
          {s.can.edit && s.revisionId && s.revisionNumber !== null && (
            <SaveRevisionForm scenarioId={s.id} baseRevisionId={s.revisionId} baseNumber={s.revisionNumber} body={editable} save={saveScenarioRevision} />
          )}
        </div>
        <Comments scenarioId={s.id} revisionId={s.revisionId ?? undefined} />
      </div>
    </main>
  );
}
