import Link from "next/link";
import { notFound } from "next/navigation";
import { requirePageUser } from "@/lib/auth/current";
import { evidenceProblem, getEntry } from "@/lib/db/library";
import { DomainError } from "@/lib/errors";
import { formatEng } from "@/lib/units/eng";
import { evidenceTolerances } from "@/lib/library/tolerances";
import { StatusBadge } from "@/components/library/StatusBadge";
import { EntryActions } from "@/components/library/EntryActions";
import { EntryHistory } from "@/components/library/EntryHistory";
import { EntryEvidence } from "@/components/library/EntryEvidence";
import { startFromEntryAction } from "../actions";
import { templateTitle } from "@/components/scenarios/RevisionView";
import { formatDate } from "@/lib/shared/dates";

export const dynamic = "force-dynamic";
export const metadata = { title: "Library entry" };

const FIGURES: [string, string, (v: number) => string][] = [
  ["fullScaleCurrent", "Full-scale current", (v) => formatEng(v, "A")],
  ["phaseMarginDeg", "Phase margin (current loop)", (v) => `${v.toFixed(1)}°`],
  ["crossoverHz", "Crossover", (v) => formatEng(v, "Hz")],
  ["overshootPct", "Overshoot", (v) => `${v.toFixed(1)} %`],
  ["riseTime", "Rise time", (v) => formatEng(v, "s")],
  ["settlingTime", "Settling (±1 %)", (v) => formatEng(v, "s")],
  ["worstDissipation", "Worst dissipation", (v) => formatEng(v, "W")],
];

export default async function EntryPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const user = await requirePageUser("viewer");
  const entry = await getEntry(user, id).catch((e) => {
    if (e instanceof DomainError && e.status === 404) notFound();
    throw e;
  });
  const figures = entry.keyFigures as Record<string, number | null | undefined>;
  return (
    <main className="mx-auto max-w-screen-xl space-y-6 px-6 py-8">
      <nav className="text-sm text-ink-muted" aria-label="Breadcrumb"><Link href="/library" className="hover:underline">Library</Link> / {entry.title}</nav>
      <header className="flex flex-wrap items-start justify-between gap-4">
        <div>
          <h1 className="text-2xl font-semibold">{entry.title} <span className="text-base font-normal text-ink-muted">revision {entry.revisionNumber}</span></h1>
          <p className="mt-1 text-sm"><StatusBadge status={entry.status} testId="entry-status" /> <span className="ml-2 text-ink-muted">{templateTitle(entry.template)} · {entry.passElement || "—"} · {entry.loadType || "—"}{entry.currentMax !== null ? ` · ${formatEng(entry.currentMin ?? 0, "A")} – ${formatEng(entry.currentMax, "A")}` : ""}</span></p>
          {entry.validatedByName && <p className="mt-1 text-sm" data-testid="entry-validated-by">Validated by {entry.validatedByName}, {entry.validatedAt ? formatDate(entry.validatedAt) : "—"}</p>}
          {entry.overrideReason && entry.status === "validated" && (
            <p className="mt-1 max-w-2xl rounded border border-verdict-fail/30 bg-red-50 px-3 py-2 text-sm text-verdict-fail" data-testid="entry-override">
              Validated with an override, against failing or missing bench evidence. Reason given: “{entry.overrideReason}”
            </p>
          )}
        </div>
        <p className="text-sm">
          <Link className="text-signal underline" href={`/scenarios/${entry.scenarioId}/review?revision=${entry.revisionId}`}>Review of revision {entry.revisionNumber}</Link>
          {" · "}
          <Link className="text-signal underline" href={`/scenarios/${entry.scenarioId}/traces`}>Bench traces</Link>
        </p>
      </header>
      <div className="grid gap-6 lg:grid-cols-[minmax(0,1fr)_minmax(0,1.6fr)]">
        <div className="space-y-6">
          <section className="rounded border border-hairline bg-white p-4">
            <h2 className="mb-2 font-semibold">Key figures (simulated at submission)</h2>
            <dl className="grid grid-cols-[max-content_1fr] gap-x-4 gap-y-1 text-sm" data-testid="entry-figures">
              {FIGURES.map(([k, label, fmt]) => (
                <div key={k} className="contents"><dt className="text-ink-muted">{label}</dt><dd className="num">{typeof figures[k] === "number" ? fmt(figures[k] as number) : k === "settlingTime" && figures[k] === null ? "not within the record" : "—"}</dd></div>
              ))}
            </dl>
            <h3 className="mt-3 text-sm font-semibold">Submission note</h3>
            <p className="whitespace-pre-wrap text-sm">{entry.note || "—"}</p>
            <p className="mt-2 text-xs text-ink-muted">Evidence: {entry.traces.length} bench trace{entry.traces.length === 1 ? "" : "s"} ({entry.traces.map((t) => t.label).join(", ") || "none stored"}).</p>
          </section>
          <section className="rounded border border-hairline bg-white p-4">
            <h2 className="mb-2 font-semibold">Decision</h2>
            <EntryActions entryId={entry.id} status={entry.status} evidenceProblem={evidenceProblem(entry.evidence)} role={user.role} isSubmitter={entry.submittedBy === user.id} startAction={startFromEntryAction} defaultTitle={`${entry.title} (from library)`} />
          </section>
          <section className="rounded border border-hairline bg-white p-4">
            <h2 className="mb-2 font-semibold">History</h2>
            <EntryHistory events={entry.events} />
          </section>
        </div>
        <EntryEvidence
          body={entry.body}
          traces={entry.traces.map((t) => ({ id: t.id, label: t.label, revisionNumber: t.revisionNumber, sampleCount: t.sampleCount, channels: t.channels.map((c) => ({ name: c.name, unit: c.unit })) }))}
          tolerances={evidenceTolerances(entry.evidence.tolerances)}
          submitted={entry.evidence.comparisons.map((c) => ({ traceId: c.traceId, verdict: c.verdict, rows: c.rows.map((r) => ({ ...r, verdict: r.verdict })) }))}
        />
      </div>
    </main>
  );
}
