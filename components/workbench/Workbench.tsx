"use client";
/**
 * The workbench: Circuit (schematic, part values, panels) · Response (plots) · Verdict (figures, checks, cautions),
 * with the studies drawer at the bottom. Owns the live runner and the study pool for the page's lifetime.
 */
import Link from "next/link";
import { useEffect, useMemo, useState } from "react";
import type { Scenario } from "@/lib/design/schema";
import { compileNetlistJson, idealTransconductance } from "@/lib/design/compile";
import { TEMPLATES } from "@/lib/design/templates";
import { safeFileName } from "@/lib/workbench/csv";
import { WorkbenchProvider, useWb, useWbStore } from "./context";
import { LoadSupplyPanel, NetworksPanel, OpampPanel, PartValues, PassPanel, StimulusPanel } from "./Panels";
import { NoisePanel } from "./NoisePanel";
import { CautionsList, ChecksTable, HeadlineFigures, VerdictNote } from "./Verdict";
import { Schematic } from "@/components/schematic/Schematic";
import { BodePlot, StepPlot } from "@/components/plots/ResponsePlots";
import { NoisePlot } from "@/components/plots/NoisePlot";
import type { Marker } from "@/components/plots/UPlotChart";
import type { LiveResult } from "@/lib/workbench/types";
import { formatEng } from "@/lib/units/eng";
import { downloadText } from "@/components/plots/ExportMenu";
import { useEngine } from "./engine";
import { StudiesDrawer } from "./StudiesDrawer";
import { PartUpdateOffer, TeamPartsProvider } from "./team-parts";
import type { PartOption } from "@/lib/db/parts";
import { SaveControl, type SaveFn } from "./SaveControl";
import { TOOL_BUTTON } from "@/components/shell/classes";
import { alignCapture } from "@/lib/traces/compare";
import { useLatestTrace } from "./useLatestTrace";
import { ShareDialog } from "@/components/scenarios/ShareDialog";
import { ForkButton, type Fork } from "@/components/scenarios/ScenarioButtons";
import { useKeptDraft } from "./useKeptDraft";
import { formatDateTime } from "@/lib/shared/dates";

export interface WorkbenchProps {
  scenario: Scenario;
  title: string;
  scenarioId: string | null;
  revisionId: string | null;
  revisionNumber: number | null;
  /** Server action that saves a revision; null when saving is not possible here (a local draft, a viewer). */
  save: SaveFn | null;
  /** Server action that copies the revision into a new scenario of the user; null for roles that may not fork. */
  fork?: Fork | null;
  /** Share links: shown for members who may share; `canPublish` for the owner or a lead (public links). */
  share?: { canPublish: boolean; publicUrl: string } | null;
  /** The team's live parts (pickers and the "newer version" offer); none for a local draft. */
  teamParts?: readonly PartOption[];
}

export function Workbench(props: WorkbenchProps) {
  return (
    <WorkbenchProvider scenario={props.scenario}>
      <TeamPartsProvider parts={props.teamParts ?? []}>
        <WorkbenchInner {...props} />
      </TeamPartsProvider>
    </WorkbenchProvider>
  );
}

function focusField(key: string) {
  const ids: Record<string, string> = {
    load: "field-load-resistance",
    cable: "field-load-cable-length",
    loadSupply: "field-supplies-load",
    command: "field-stimulus-commandHigh",
    opamp: "opamp-preset",
    pass: "pass-preset",
  };
  const id = ids[key] ?? `field-parts-${key}`;
  const el = document.getElementById(id);
  if (!el) return;
  const details = el.closest("details");
  if (details && !details.open) details.open = true;
  el.focus();
  el.scrollIntoView({ block: "nearest" });
}

const BTN = `${TOOL_BUTTON} text-ink`;

function Toolbar({ title, scenarioId, revisionId, revisionNumber, save, fork, share }: WorkbenchProps) {
  const store = useWbStore();
  const canUndo = useWb((s) => s.past.length > 0);
  const canRedo = useWb((s) => s.future.length > 0);
  const dirty = useWb((s) => s.dirty);
  const pending = useWb((s) => s.run.pending);
  const elapsed = useWb((s) => s.run.elapsedMs);
  const showOp = useWb((s) => s.showOperatingPoint);
  const template = useWb((s) => s.scenario.template);
  const [shownRevision, setShownRevision] = useState(revisionNumber);
  const [shownRevisionId, setShownRevisionId] = useState(revisionId);
  /** A viewer's edits (and a saved scenario opened without the right to save) are a what-if that is not kept. */
  const whatIf = !save && scenarioId !== null;
  const templateTitle = TEMPLATES.find((t) => t.id === template)?.title ?? template;
  return (
    <div className="flex flex-wrap items-center gap-2 border-b border-hairline bg-white px-4 py-2">
      <h1 className="mr-2 truncate text-[15px] font-semibold" data-testid="scenario-title">{title}</h1>
      <span className="text-[12px] text-ink-muted" data-testid="revision-label">{[templateTitle === title ? null : templateTitle, shownRevision !== null ? `revision ${shownRevision}` : "local draft"].filter(Boolean).join(" · ")}</span>
      <span
        className={`rounded px-1.5 py-0.5 text-[11px] ${dirty && !whatIf ? "bg-verdict-warn/10 text-verdict-warn" : "text-ink-muted"}`}
        data-testid="dirty-indicator"
        aria-live="polite"
        title={whatIf ? "Your role can read and comment: edits here are for trying values out and are not kept" : undefined}
      >
        {whatIf ? (dirty ? "What-if, not kept" : "Read only") : dirty ? "● Unsaved changes" : scenarioId ? "Saved" : "Local draft, not saved"}
      </span>
      {scenarioId && (
        <nav aria-label="Scenario" className="flex gap-3 text-[12px]">
          <Link href={`/scenarios/${scenarioId}/history`} className="text-signal hover:underline">History</Link>
          <Link href={`/scenarios/${scenarioId}/review`} className="text-signal hover:underline">Review</Link>
          <Link href={`/scenarios/${scenarioId}/traces`} className="text-signal hover:underline">Bench traces</Link>
        </nav>
      )}
      <div className="ml-auto flex flex-wrap items-center gap-2">
        <span className="num w-28 text-right text-[11px] text-ink-muted" data-testid="run-status" aria-live="off">
          {pending ? "simulating…" : elapsed !== null ? `ran in ${Math.round(elapsed)} ms` : ""}
        </span>
        <button type="button" className={BTN} disabled={!canUndo} onClick={() => store.getState().undo()} aria-keyshortcuts="Control+Z" data-testid="undo">
          Undo
        </button>
        <button type="button" className={BTN} disabled={!canRedo} onClick={() => store.getState().redo()} aria-keyshortcuts="Control+Shift+Z" data-testid="redo">
          Redo
        </button>
        <label className="flex items-center gap-1 text-[13px]">
          <input type="checkbox" className="accent-signal" checked={showOp} onChange={(e) => store.getState().setShowOperatingPoint(e.target.checked)} data-testid="toggle-op" />
          Operating point
        </label>
        <button
          type="button"
          className={BTN}
          data-testid="export-netlist"
          onClick={() => {
            const s = store.getState().scenario;
            const json = JSON.stringify(compileNetlistJson(s, "step"), null, 2);
            downloadText(safeFileName(`${title} netlist`, "json"), json, "application/json");
          }}
        >
          Netlist JSON
        </button>
        {scenarioId && share && shownRevisionId && shownRevision !== null && (
          <ShareDialog scenarioId={scenarioId} revisionId={shownRevisionId} revisionNumber={shownRevision} canPublish={share.canPublish} publicUrl={share.publicUrl} compact />
        )}
        {fork && shownRevisionId && <ForkButton revisionId={shownRevisionId} fork={fork} label="Fork to my scenarios" compact />}
        <SaveControl scenarioId={scenarioId} revisionId={revisionId} save={save} onSaved={(id, n) => { setShownRevision(n); setShownRevisionId(id); }} />
      </div>
    </div>
  );
}

const NO_FAILURES: { analysis: string; message: string }[] = [];

function RunError() {
  const error = useWb((s) => s.run.error);
  const failures = useWb((s) => s.run.current?.failures ?? NO_FAILURES);
  if (!error && failures.length === 0) return null;
  return (
    <div role="alert" className="rounded border border-verdict-fail/40 bg-verdict-fail/5 px-3 py-2 text-[12px] text-verdict-fail" data-testid="run-error">
      {error && <p><strong>The last run failed:</strong> {error} <span className="text-ink-muted">(showing the last good result)</span></p>}
      {!error && failures.map((f) => <p key={f.analysis}><strong>{f.analysis}:</strong> {f.message}</p>)}
    </div>
  );
}

/** Closed-loop markers: the −3 dB bandwidth and, where the response rises above its low-frequency gain, the peak. */
function closedMarkers(closed: LiveResult["closed"]): Marker[] | undefined {
  if (!closed) return undefined;
  const m: Marker[] = [];
  if (closed.bandwidthHz !== null) m.push({ x: closed.bandwidthHz, label: `−3 dB ${formatEng(closed.bandwidthHz, "Hz")}`, color: "#0F766E" });
  if (closed.peakingHz !== null && closed.peakingDb >= 0.1) m.push({ x: closed.peakingHz, label: `peaking ${closed.peakingDb.toFixed(1)} dB`, color: "#B45309" });
  return m;
}

/**
 * The latest bench trace over the simulated step (a toggle), aligned as the bench comparison aligns it: the capture's
 * 50 % edge on the simulation's after the command edge.
 */
function useBenchOverlay(scenarioId: string | null, on: boolean) {
  const current = useWb((s) => s.run.current);
  const stepTime = useWb((s) => s.scenario.stimulus.stepTime);
  const latest = useLatestTrace(scenarioId, on);
  return useMemo(() => {
    if (latest.status !== "done" || !current?.step) return { overlay: null, note: latest.status === "none" ? "No bench trace in amperes yet." : latest.status === "error" ? `Bench trace: ${latest.error}` : latest.status === "loading" ? "Loading the bench trace…" : null };
    try {
      const t = latest.trace;
      const aligned = alignCapture({ time: t.time, values: t.values }, { time: current.step.time, values: current.step.iLoad }, stepTime);
      return { overlay: { time: aligned.time, values: t.values, label: `${t.label} (${t.channel}), aligned ${formatEng(aligned.offset, "s")}` }, note: null };
    } catch (e) {
      return { overlay: null, note: `Bench trace not drawn: ${(e as Error).message}` };
    }
  }, [latest, current, stepTime]);
}

function ResponseZone({ scenarioId }: { scenarioId: string | null }) {
  const current = useWb((s) => s.run.current);
  const previous = useWb((s) => s.run.previous);
  const scenario = useWb((s) => s.scenario);
  const [tab, setTab] = useState<"closed" | "zout" | "noise">("closed");
  const transconductance = useMemo(() => {
    try {
      const g = idealTransconductance(scenario);
      return Number.isFinite(g) ? g : null;
    } catch {
      return null;
    }
  }, [scenario]);
  const [bench, setBench] = useState(false);
  const overlay = useBenchOverlay(scenarioId, bench);
  return (
    <div className="space-y-2">
      <RunError />
      {scenarioId && (
        <div className="flex items-center gap-3 text-[12px] text-ink-muted">
          <label className="flex items-center gap-1">
            <input type="checkbox" checked={bench} onChange={(e) => setBench(e.target.checked)} aria-label="Show the latest bench trace" data-testid="bench-overlay-toggle" />
            Show the latest bench trace
          </label>
          {overlay.note && <span role="status" data-testid="bench-overlay-note">{overlay.note}</span>}
        </div>
      )}
      <StepPlot step={current?.step ?? null} ghost={previous?.step ?? null} measured={bench ? overlay.overlay : null} hasPass={scenario.template !== "howland"} transconductance={transconductance} />
      <BodePlot id="loop" title="Loop gain" bode={current?.loop ?? null} ghost={previous?.loop ?? null} loop={current?.loop ?? null} magUnit="dB"
        second={current?.loop?.local !== undefined && current?.loop?.local !== null ? { label: "local op-amp loop", bode: current.loop.local } : null} />
      <div>
        <div role="tablist" aria-label="More responses" className="flex gap-1">
          {([["closed", "Closed loop"], ["zout", "Output impedance"], ["noise", "Noise"]] as const).map(([k, label]) => (
            <button
              key={k}
              role="tab"
              type="button"
              aria-selected={tab === k}
              className={`rounded-t border border-b-0 border-hairline px-3 py-1 text-[12px] ${tab === k ? "bg-white font-semibold" : "bg-paper text-ink-muted"}`}
              onClick={() => setTab(k)}
              data-testid={`tab-${k}`}
            >
              {label}
            </button>
          ))}
        </div>
        <div role="tabpanel">
          {tab === "closed" ? (
            <BodePlot id="closed" title="Closed loop" bode={current?.closed ?? null} ghost={previous?.closed ?? null} magUnit="dB(A/V)" height={130}
              extraMarkers={closedMarkers(current?.closed ?? null)} />
          ) : tab === "zout" ? (
            <BodePlot id="zout" title="Output impedance" bode={current?.zout ?? null} ghost={previous?.zout ?? null} magUnit="dBΩ" height={130} />
          ) : (
            <NoisePlot noise={current?.noise ?? null} ghost={previous?.noise ?? null} height={130} />
          )}
        </div>
      </div>
    </div>
  );
}

function CircuitZone() {
  const store = useWbStore();
  const scenario = useWb((s) => s.scenario);
  const selected = useWb((s) => s.selectedPart);
  const op = useWb((s) => s.run.current?.op ?? null);
  const showOp = useWb((s) => s.showOperatingPoint);
  return (
    <div className="space-y-2">
      <div className="rounded border border-hairline bg-white p-1">
        <Schematic
          scenario={scenario}
          selected={selected}
          op={op}
          showOp={showOp}
          onSelect={(k) => {
            store.getState().selectPart(k);
            focusField(k);
          }}
        />
      </div>
      <PartUpdateOffer />
      <PartValues />
      <NetworksPanel />
      <LoadSupplyPanel />
      <StimulusPanel />
      <OpampPanel />
      <PassPanel />
      <NoisePanel />
    </div>
  );
}

function useShortcuts() {
  const store = useWbStore();
  useEffect(() => {
    const onKey = (e: KeyboardEvent) => {
      if (!(e.ctrlKey || e.metaKey) || e.altKey) return;
      const k = e.key.toLowerCase();
      if (k !== "z" && k !== "y") return;
      const t = e.target as HTMLElement | null;
      // While a text is being typed the browser's own undo edits it; a field showing its applied value lets the
      // workbench undo the last edit.
      if (t && (t.tagName === "TEXTAREA" || (t.tagName === "INPUT" && (t as HTMLInputElement).type === "text" && t.dataset.editing === "true"))) return;
      e.preventDefault();
      if (k === "y" || e.shiftKey) store.getState().redo();
      else store.getState().undo();
    };
    window.addEventListener("keydown", onKey);
    return () => window.removeEventListener("keydown", onKey);
  }, [store]);
}

function WorkbenchInner(props: WorkbenchProps) {
  const engine = useEngine();
  const [drawer, setDrawer] = useState(false);
  useShortcuts();
  const kept = useKeptDraft(props.scenarioId, props.revisionId, props.save !== null);
  return (
    <div className="flex min-h-[calc(100vh-3rem)] flex-col pb-10" data-testid="workbench">
      <Toolbar {...props} />
      {kept.offer && (
        <div role="region" aria-label="Unsaved edits" className="flex flex-wrap items-center gap-2 border-b border-verdict-warn/40 bg-verdict-warn/5 px-4 py-2 text-[13px]" data-testid="draft-offer">
          <span>You have unsaved edits to this scenario from {formatDateTime(kept.offer.savedAt)}, kept in this browser.</span>
          <button type="button" className={`${TOOL_BUTTON} text-ink`} onClick={kept.restore} data-testid="draft-restore">Restore my edits</button>
          <button type="button" className={`${TOOL_BUTTON} text-ink`} onClick={kept.discard} data-testid="draft-discard">Discard them</button>
        </div>
      )}
      <div className="grid flex-1 grid-cols-1 gap-3 p-3 md:grid-cols-[minmax(300px,380px)_minmax(0,1fr)] xl:grid-cols-[minmax(320px,380px)_minmax(0,1fr)_340px]">
        <section aria-label="Circuit" className="min-w-0 md:max-h-[calc(100vh-11rem)] xl:max-h-[calc(100vh-9rem)] md:overflow-y-auto md:pr-1">
          <h2 className="sr-only">Circuit</h2>
          <CircuitZone />
        </section>
        <section aria-label="Response" className="min-w-0 md:max-h-[calc(100vh-11rem)] xl:max-h-[calc(100vh-9rem)] md:overflow-y-auto">
          <h2 className="sr-only">Response</h2>
          <ResponseZone scenarioId={props.scenarioId} />
        </section>
        <section aria-label="Verdict" className="min-w-0 space-y-3 md:col-span-2 xl:col-span-1 xl:max-h-[calc(100vh-9rem)] xl:overflow-y-auto">
          <h2 className="sr-only">Verdict</h2>
          <HeadlineFigures />
          <VerdictNote />
          <div className="overflow-x-auto rounded border border-hairline bg-white p-2">
            <h3 className="mb-1 text-[13px] font-semibold">Checks</h3>
            <ChecksTable />
          </div>
          <div className="rounded border border-hairline bg-white p-2">
            <h3 className="mb-1 text-[13px] font-semibold">Cautions</h3>
            <CautionsList />
          </div>
        </section>
      </div>
      <StudiesDrawer open={drawer} onToggle={() => setDrawer((d) => !d)} engine={engine} />
    </div>
  );
}
