"use client";
/**
 * The design review: one printable document with the schematic, part list, operating point, checks and cautions,
 * plots, bench comparison, revision and validation status, and sign-off. The simulation runs in the browser; the
 * print stylesheet (app/scenarios/[id]/review/print.css) turns it into pages.
 */
import { Schematic } from "@/components/schematic/Schematic";
import { WavePlot } from "@/components/traces/WavePlot";
import { BenchComparison, type TraceMeta } from "@/components/traces/BenchComparison";
import { ComparisonTable } from "@/components/traces/ComparisonTable";
import { useSimulation } from "@/components/traces/useSimulation";
import { explainFigures } from "@/lib/design/explain";
import { smallSignalWords } from "@/lib/design/words";
import { StatusBadge } from "@/components/library/StatusBadge";
import { EntryHistory } from "@/components/library/EntryHistory";
import type { LibraryEntryDetail } from "@/lib/db/library";
import type { Tolerances } from "@/lib/traces/compare";
import { formatEng } from "@/lib/units/eng";
import { ChecksTable } from "./ChecksTable";
import { templateTitle } from "@/components/scenarios/RevisionView";
import { PartList } from "./PartList";
import { OperatingPoint } from "./OperatingPoint";
import type { ReactNode } from "react";
import { formatDateTime } from "@/lib/shared/dates";

export interface ReviewProps {
  title: string;
  teamName: string;
  template: string;
  revision: { id: string; number: number; authorName: string; note: string; createdAt: string; isCurrent: boolean };
  body: unknown;
  entry: LibraryEntryDetail | null;
  traces: TraceMeta[];
  tolerances: Tolerances;
  preparedFor: string;
  /** When the page was served (ISO), so server and browser render the same text. */
  preparedAt: string;
}

function Section({ id, title, children }: { id: string; title: string; children: ReactNode }) {
  return (
    <section className="review-section relative min-w-0 overflow-x-auto rounded border border-hairline bg-white p-4" data-testid={`review-${id}`} aria-labelledby={`h-${id}`}>
      <h2 id={`h-${id}`} className="mb-3 text-lg font-semibold">{title}</h2>
      {children}
    </section>
  );
}

const when = (iso: string | null | undefined) => (iso ? formatDateTime(iso) : "—");

export function ReviewDocument(p: ReviewProps) {
  const sim = useSimulation(p.body);
  const scenario = sim.scenario;
  // the workbench's figures: design-layer step metrics and the current loop's margins, with the same notes
  const figures = sim.status === "done" ? sim.sim.step.metrics : null;
  const notes = sim.status === "done" && scenario
    ? explainFigures(scenario, sim.sim.loop, sim.sim.loop?.loops.local ?? null, { ...sim.sim.step, vOpampOut: sim.sim.step.vOpampOut ?? [], vPass: sim.sim.step.vPass ?? [] })
    : [];
  const entry = p.entry;
  const validated = entry?.status === "validated";
  return (
    <article className="review-doc space-y-4" data-testid="review-document" data-sim-status={sim.status}>
      <header className="review-section flex flex-wrap items-start justify-between gap-4 border-b border-hairline pb-3">
        <div>
          <p className="text-xs uppercase tracking-wide text-ink-muted">Design review · {p.teamName}</p>
          <h1 className="text-2xl font-semibold">{p.title}</h1>
          <p className="text-sm text-ink-muted">
            Template {templateTitle(p.template)} · revision {p.revision.number}{p.revision.isCurrent ? " (current)" : ""} by {p.revision.authorName}, {when(p.revision.createdAt)}
          </p>
        </div>
        <div className="flex items-center gap-2 no-print">
          <button type="button" onClick={() => window.print()} className="rounded bg-signal px-3 py-1.5 text-sm font-medium text-white">Print or save as PDF</button>
        </div>
      </header>

      {sim.status === "running" && (
        <p role="status" className="flex items-center gap-3 text-sm text-ink-muted">
          Simulating revision {p.revision.number} in the background…
          <button type="button" onClick={sim.cancel} className="rounded border border-hairline px-2 py-0.5 text-xs text-ink no-print">Stop</button>
        </p>
      )}
      {sim.status === "error" && <p role="alert" className="text-sm text-verdict-fail">{sim.error}</p>}

      <Section id="schematic" title="Schematic">
        {scenario ? (
          <div className="review-schematic overflow-x-auto">
            <Schematic scenario={scenario} selected={null} onSelect={() => undefined} op={sim.status === "done" ? sim.sim.op : null} showOp={sim.status === "done"} />
          </div>
        ) : <p className="text-sm text-ink-muted">No schematic: the revision does not hold a complete scenario.</p>}
      </Section>

      <Section id="part-list" title="Part list">
        {scenario ? <PartList scenario={scenario} /> : <p className="text-sm text-ink-muted">—</p>}
      </Section>

      <Section id="operating-point" title="Operating point">
        {sim.status === "done" ? <OperatingPoint op={sim.sim.op} /> : <p className="text-sm text-ink-muted">{sim.status === "running" ? "Computing…" : "Not available."}</p>}
      </Section>

      <Section id="checks-section" title="Checks and cautions">
        {sim.status === "done" ? <ChecksTable checks={sim.sim.checks} cautions={sim.sim.cautions} /> : <p className="text-sm text-ink-muted">{sim.status === "running" ? "Computing…" : "Not available."}</p>}
      </Section>

      <Section id="plots" title="Step response">
        {sim.status === "done" ? (
          <div className="space-y-3">
            <WavePlot testId="review-step-plot" title="Load current" yUnit="A" markers={[{ t: sim.sim.step.stepTime, label: "step" }]}
              series={[{ label: "Load current", time: sim.sim.step.time, values: sim.sim.step.iLoad, color: "#0072B2" }]} />
            <WavePlot title="Op-amp output and pass-device voltage" yUnit="V"
              series={[
                ...(sim.sim.step.vOpampOut ? [{ label: "Op-amp output", time: sim.sim.step.time, values: sim.sim.step.vOpampOut, color: "#009E73" }] : []),
                ...(sim.sim.step.vPass ? [{ label: "Collector/drain", time: sim.sim.step.time, values: sim.sim.step.vPass, color: "#CC79A7" }] : []),
              ]} />
            {figures && (
              <p className="num text-sm" data-testid="review-step-figures">
                Rise time {figures.riseTime === null ? "—" : formatEng(figures.riseTime, "s")} · overshoot {figures.overshootPct.toFixed(1)} %
                {sim.status === "done" && sim.sim.step.small ? ` (${smallSignalWords(sim.sim.step.small)})` : ""} · settling (±1 %) {figures.settlingTime1pct === null ? "not within the record" : formatEng(figures.settlingTime1pct, "s")} · ringing {figures.ringing.frequencyHz === null ? "none" : formatEng(figures.ringing.frequencyHz, "Hz")}{figures.ringing.estimatorsAgree === false && figures.ringing.uncertaintyHz !== null ? ` (± ${formatEng(figures.ringing.uncertaintyHz, "Hz")}: the estimators disagree)` : ""}
              </p>
            )}
            {notes.length > 0 && (
              <div className="rounded border border-hairline px-3 py-2 text-sm" data-testid="review-notes">
                <p className="font-semibold">Why the figures disagree</p>
                {notes.map((n) => <p key={n}>{n}</p>)}
              </div>
            )}
          </div>
        ) : <p className="text-sm text-ink-muted">{sim.status === "running" ? "Computing…" : "Not available."}</p>}
      </Section>

      <Section id="loop" title="Loop gain">
        {sim.status === "done" && sim.sim.loop ? (
          <div className="space-y-2">
            <WavePlot testId="review-loop-plot" title="Loop gain magnitude" yUnit="dB" xUnit="Hz" logX height={180}
              markers={sim.sim.loop.crossovers.map((f) => ({ t: f, label: f === sim.sim.loop!.crossoverHz ? "crossover" : "0 dB" }))}
              series={[
                { label: "|T| current loop, dB", time: sim.sim.loop.freq, values: sim.sim.loop.magDb, color: "#0072B2" },
                ...(sim.sim.loop.loops.local ? [{ label: "|T| local op-amp loop, dB", time: sim.sim.loop.loops.local.freq, values: sim.sim.loop.loops.local.magDb, color: "#56B4E9" }] : []),
              ]} />
            <WavePlot title="Loop gain phase" yUnit="°" xUnit="Hz" logX height={160}
              series={[
                { label: "∠T current loop, degrees", time: sim.sim.loop.freq, values: sim.sim.loop.phaseDeg, color: "#D55E00" },
                ...(sim.sim.loop.loops.local ? [{ label: "∠T local op-amp loop, degrees", time: sim.sim.loop.loops.local.freq, values: sim.sim.loop.loops.local.phaseDeg, color: "#E69F00" }] : []),
              ]} />
            <p className="num text-sm" data-testid="review-loop-figures">
              Current loop (broken between the op-amp's output and the base/gate resistor): phase margin {sim.sim.loop.phaseMarginDeg === null ? "—" : `${sim.sim.loop.phaseMarginDeg.toFixed(1)}°`} · crossover {sim.sim.loop.crossoverHz === null ? "—" : formatEng(sim.sim.loop.crossoverHz, "Hz")}{sim.sim.loop.crossovers.length > 1 ? ` (least margin of ${sim.sim.loop.crossovers.length} crossings)` : ""} · gain margin {sim.sim.loop.gainMarginDb === null ? "—" : `${sim.sim.loop.gainMarginDb.toFixed(1)} dB`} · modulus margin {sim.sim.loop.modulusMargin.toFixed(2)}{sim.sim.loop.unstable ? " · the closed loop is unstable: T(jω) encircles −1, so no margin is a margin" : ""}
              {sim.sim.loop.loops.local && sim.sim.loop.loops.local.phaseMarginDeg !== null ? ` · local op-amp loop: phase margin ${sim.sim.loop.loops.local.phaseMarginDeg.toFixed(1)}°` : ""}
            </p>
          </div>
        ) : <p className="text-sm text-ink-muted">{sim.status === "running" ? "Computing…" : sim.status === "done" ? `Not available: ${sim.sim.loopError}` : "Not available."}</p>}
      </Section>

      {sim.status === "done" && sim.sim.noise && (
        <Section id="noise" title="Noise">
          <p className="num text-sm" data-testid="review-noise-figure">
            Load-current noise {formatEng(sim.sim.noise.band.low, "Hz")}–{formatEng(sim.sim.noise.band.high, "Hz")}: {formatEng(sim.sim.noise.rms, "A")} rms
            {" "}(target {formatEng(sim.sim.noise.target, "A")}: {sim.sim.noise.rms > sim.sim.noise.target ? "fail" : sim.sim.noise.rms > 0.8 * sim.sim.noise.target ? "warn" : "pass"})
          </p>
          <p className="text-sm" data-testid="review-noise-contributors">
            Largest contributors: {sim.sim.noise.top.map((c) => `${c.element} ${(c.share * 100).toFixed(0)} % (${formatEng(c.rms, "A")} rms)`).join(" · ")}
          </p>
        </Section>
      )}

      <Section id="bench" title="Bench comparison">
        {entry && entry.evidence.comparisons.length > 0 && (
          <div className="mb-4 space-y-3">
            <p className="text-sm text-ink-muted">As submitted (tolerances of the team at submission):</p>
            {entry.evidence.comparisons.map((c) => (
              <div key={c.traceId}>
                <p className="text-sm font-medium">{entry.traces.find((t) => t.id === c.traceId)?.label ?? c.traceId}</p>
                <ComparisonTable rows={c.rows.map((r) => ({ ...r, verdict: r.verdict }))} verdict={c.verdict} testId={`submitted-comparison-${c.traceId}`} />
              </div>
            ))}
          </div>
        )}
        {p.traces.length === 0 ? (
          <p className="text-sm text-ink-muted">No bench traces for this revision.</p>
        ) : sim.status === "done" ? (
          <BenchComparison traces={p.traces} step={sim.sim.step} tolerances={p.tolerances} />
        ) : <p className="text-sm text-ink-muted">Waiting for the simulation…</p>}
      </Section>

      <Section id="status" title="Revision and validation status">
        <dl className="grid grid-cols-[max-content_1fr] gap-x-4 gap-y-1 text-sm">
          <dt className="text-ink-muted">Revision</dt><dd>{p.revision.number}, by {p.revision.authorName}, {when(p.revision.createdAt)}</dd>
          <dt className="text-ink-muted">Revision note</dt><dd className="whitespace-pre-wrap">{p.revision.note || "—"}</dd>
          <dt className="text-ink-muted">Library status</dt><dd>{entry ? <StatusBadge status={entry.status} testId="review-library-status" /> : <span data-testid="review-library-status">not submitted</span>}</dd>
          {entry && <><dt className="text-ink-muted">Submitted</dt><dd>{entry.submittedByName ?? "—"}, {when(entry.submittedAt)}</dd></>}
          {entry && <><dt className="text-ink-muted">Submission note</dt><dd className="whitespace-pre-wrap">{entry.note || "—"}</dd></>}
        </dl>
        {entry && <div className="mt-3"><h3 className="mb-1 text-sm font-semibold">History</h3><EntryHistory events={entry.events} /></div>}
      </Section>

      <Section id="sign-off" title="Sign-off">
        {validated ? (
          <>
            <p className="text-sm" data-testid="review-signed-off">Validated by <strong>{entry?.validatedByName}</strong> on {when(entry?.validatedAt)}.</p>
            {entry?.overrideReason && (
              <p className="mt-1 text-sm text-verdict-fail" data-testid="review-override">
                Validated with an override, against failing or missing bench evidence. Reason given: “{entry.overrideReason}”
              </p>
            )}
          </>
        ) : (
          <p className="text-sm text-ink-muted" data-testid="review-signed-off">Not signed off: {entry ? `the entry is ${entry.status}` : "this revision has not been submitted for validation"}.</p>
        )}
        <div className="mt-6 grid grid-cols-2 gap-8 text-sm">
          <div><div className="h-10 border-b border-ink" /><p className="mt-1 text-xs text-ink-muted">Designer: {entry?.submittedByName ?? p.revision.authorName} — signature and date</p></div>
          <div><div className="h-10 border-b border-ink" /><p className="mt-1 text-xs text-ink-muted">Reviewer (lead): {entry?.validatedByName ?? ""} — signature and date</p></div>
        </div>
        <p className="mt-4 text-xs text-ink-muted">Prepared for {p.preparedFor} on {when(p.preparedAt)}. Cautions are reminders, not approval: follow your local codes and licensed practice.</p>
      </Section>
    </article>
  );
}
