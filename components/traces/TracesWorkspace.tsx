"use client";
/**
 * The bench-traces page's working area: upload, the revision's traces, measured against simulated, and the
 * submission for validation with the traces and a note. The simulation runs here, in the browser.
 */
import { useCallback, useMemo, useState } from "react";
import { useRouter } from "next/navigation";
import type { Tolerances } from "@/lib/traces/compare";
import { fullScaleCurrent } from "@/lib/design/checks";
import { judgedOvershootPct, judgedSettling } from "@/lib/design/verdicts";
import { formatEng } from "@/lib/units/eng";
import { TraceUpload } from "./TraceUpload";
import { BenchComparison, type ComparisonResult, type TraceMeta } from "./BenchComparison";
import { useSimulation } from "./useSimulation";
import { formatDateTime } from "@/lib/shared/dates";

const SETTING_LABEL: Record<string, string> = {
  probe: "Probe / shunt", verticalScale: "Vertical scale", timebase: "Timebase", bandwidthLimit: "Bandwidth limit", notes: "Notes",
};

export interface WorkspaceTrace extends TraceMeta {
  revisionId: string;
  fileName: string;
  uploaderName: string;
  uploaderId: string;
  createdAt: string;
  duration: number;
  /** Instrument settings as entered (text and numbers). */
  settings: Record<string, string | number | boolean | null>;
}

export interface WorkspaceProps {
  scenarioId: string;
  revisionId: string;
  revisionNumber: number;
  body: unknown;
  traces: WorkspaceTrace[];
  tolerances: Tolerances;
  canUpload: boolean;
  canDeleteAll: boolean;
  userId: string;
  /** Status of this revision's library entry, if any. */
  entry: { id: string; status: string } | null;
}

export function TracesWorkspace(p: WorkspaceProps) {
  const router = useRouter();
  const sim = useSimulation(p.body);
  const [results, setResults] = useState<Record<string, ComparisonResult>>({});
  const [note, setNote] = useState("");
  const thisRevision = p.traces.filter((t) => t.revisionId === p.revisionId);
  const [selected, setSelected] = useState<string[]>([]);
  const [message, setMessage] = useState<{ ok: boolean; text: string } | null>(null);
  const [busy, setBusy] = useState(false);
  const chosen = selected.length ? selected.filter((id) => thisRevision.some((t) => t.id === id)) : thisRevision.map((t) => t.id);

  const onResult = useCallback((r: ComparisonResult | null) => {
    if (r) setResults((prev) => ({ ...prev, [r.traceId]: r }));
  }, []);

  const keyFigures = useMemo(() => {
    if (sim.status !== "done") return {};
    // the workbench's figures (design-layer step metrics, current loop), so the library shows what the designer saw:
    // overshoot and settling as the headline cards judge them, the worse of the full and the small-signal step
    const m = sim.sim.step.metrics;
    const small = sim.sim.step.small;
    const os = judgedOvershootPct(m.overshootPct, small);
    const diss = sim.sim.checks.find((c) => c.id === "dissipation");
    return {
      fullScaleCurrent: fullScaleCurrent(sim.scenario),
      overshootPct: Number.isFinite(os) ? os : null,
      settlingTime: judgedSettling(m, small).settlingTime1pct,
      riseTime: m.riseTime,
      worstDissipation: diss ? diss.value : null,
      phaseMarginDeg: sim.sim.loop?.phaseMarginDeg ?? null,
      crossoverHz: sim.sim.loop?.crossoverHz ?? null,
    };
  }, [sim]);

  async function deleteTrace(id: string) {
    const r = await fetch(`/api/traces/${id}`, { method: "DELETE" });
    if (!r.ok) setMessage({ ok: false, text: (await r.json().catch(() => ({}))).error ?? `Delete failed (HTTP ${r.status})` });
    router.refresh();
  }

  async function submit() {
    setBusy(true);
    setMessage(null);
    try {
      const comparisons = chosen.flatMap((id) => {
        const r = results[id];
        if (!r) return [];
        return [{ traceId: id, channel: r.channel, offset: r.comparison.offset, verdict: r.comparison.verdict, rows: r.comparison.rows.map(({ note: _n, ...row }) => row) }];
      });
      const res = await fetch("/api/library", {
        method: "POST",
        headers: { "content-type": "application/json" },
        body: JSON.stringify({ scenarioId: p.scenarioId, revisionId: p.revisionId, note, traceIds: chosen, keyFigures, comparisons }),
      });
      const body = await res.json().catch(() => ({}));
      if (!res.ok) {
        const fe = body.fieldErrors ? Object.values(body.fieldErrors as Record<string, string[]>)[0]?.[0] : null;
        setMessage({ ok: false, text: fe ?? body.error ?? `Submission failed (HTTP ${res.status})` });
        return;
      }
      setMessage({ ok: true, text: "Submitted for validation: the team's leads have been told." });
      router.refresh();
    } finally {
      setBusy(false);
    }
  }

  const canSubmit = p.canUpload && (!p.entry || p.entry.status === "draft");
  return (
    <div className="grid gap-6 lg:grid-cols-[minmax(0,1fr)_minmax(0,1.4fr)]">
      <section className="space-y-6">
        {p.canUpload && (
          <div className="rounded border border-hairline bg-white p-4">
            <h2 className="mb-2 font-semibold">Upload a bench trace</h2>
            <TraceUpload scenarioId={p.scenarioId} revisionId={p.revisionId} revisionNumber={p.revisionNumber} onUploaded={() => router.refresh()} />
          </div>
        )}
        <div className="rounded border border-hairline bg-white p-4">
          <h2 className="mb-2 font-semibold">Bench traces</h2>
          {p.traces.length === 0 ? (
            <p className="text-sm text-ink-muted">None yet.</p>
          ) : (
            <ul className="divide-y divide-hairline text-sm" data-testid="trace-list">
              {p.traces.map((t) => (
                <li key={t.id} className="flex items-center justify-between gap-2 py-2">
                  <span>
                    <span className="font-medium">{t.label}</span>{" "}
                    {Object.keys(t.settings).length > 0 && (
                      <span className="block text-xs text-ink-muted">{Object.entries(t.settings).map(([k, v]) => `${SETTING_LABEL[k] ?? k}: ${v}`).join(" · ")}</span>
                    )}
                    <span className="text-xs text-ink-muted num">rev {t.revisionNumber} · {t.sampleCount.toLocaleString("en")} samples · {formatEng(t.duration, "s")} · {t.channels.map((c) => `${c.name} [${c.unit}]`).join(", ")} · {t.uploaderName}, {formatDateTime(t.createdAt)}</span>
                  </span>
                  {(p.canDeleteAll || t.uploaderId === p.userId) && (
                    <button type="button" className="text-xs text-verdict-fail underline" onClick={() => void deleteTrace(t.id)} aria-label={`Delete ${t.label}`}>Delete</button>
                  )}
                </li>
              ))}
            </ul>
          )}
        </div>
        {canSubmit && (
          <div className="rounded border border-hairline bg-white p-4" data-testid="submit-form">
            <h2 className="mb-2 font-semibold">Submit revision {p.revisionNumber} for validation</h2>
            {thisRevision.length === 0 ? (
              <p className="text-sm text-ink-muted">Upload at least one trace of revision {p.revisionNumber} first.</p>
            ) : (
              <>
                <fieldset className="mb-2 text-sm">
                  <legend className="text-xs text-ink-muted">Evidence</legend>
                  {thisRevision.map((t) => (
                    <label key={t.id} className="flex items-center gap-2">
                      <input type="checkbox" checked={chosen.includes(t.id)} onChange={(e) => setSelected(e.target.checked ? [...new Set([...chosen, t.id])] : chosen.filter((x) => x !== t.id))} />
                      {t.label} {results[t.id] ? <span className="text-xs text-ink-muted">(compared: {results[t.id].comparison.verdict})</span> : <span className="text-xs text-ink-muted">(not compared yet: pick it above)</span>}
                    </label>
                  ))}
                </fieldset>
                <label className="flex flex-col text-sm">
                  <span className="text-xs text-ink-muted">Note for the reviewer</span>
                  <textarea className="rounded border border-hairline p-2" rows={3} value={note} onChange={(e) => setNote(e.target.value)} maxLength={4000} aria-label="Note for the reviewer" />
                </label>
                <button type="button" onClick={() => void submit()} disabled={busy || chosen.length === 0} className="mt-2 rounded bg-signal px-3 py-1.5 text-sm font-medium text-white disabled:opacity-50">
                  {busy ? "Submitting…" : "Submit for validation"}
                </button>
              </>
            )}
          </div>
        )}
        {message && <p role={message.ok ? "status" : "alert"} className={`text-sm ${message.ok ? "text-verdict-pass" : "text-verdict-fail"}`} data-testid="submit-message">{message.text}</p>}
        {p.entry && (
          <p className="text-sm" data-testid="entry-status">
            Library entry for revision {p.revisionNumber}: <strong>{p.entry.status}</strong> — <a className="text-signal underline" href={`/library/${p.entry.id}`}>open it</a>
          </p>
        )}
      </section>
      <section className="rounded border border-hairline bg-white p-4">
        <h2 className="mb-2 font-semibold">Measured against simulated</h2>
        {sim.status === "running" && <p role="status" className="text-sm text-ink-muted">Simulating the step response…</p>}
        {sim.status === "error" && <p role="alert" className="text-sm text-verdict-fail">{sim.error}</p>}
        {sim.status === "done" && <BenchComparison traces={p.traces} step={sim.sim.step} tolerances={p.tolerances} onResult={onResult} canCorrect={p.canUpload} onCorrected={() => router.refresh()} />}
      </section>
    </div>
  );
}
