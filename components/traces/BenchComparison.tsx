"use client";
/**
 * Measured against simulated for one bench trace: the capture aligned on the simulated step edge (automatically,
 * adjustable by hand), overlaid on the simulated load current, and the figures compared against the team's
 * tolerances. Everything here runs in the browser.
 */
import { useEffect, useMemo, useState } from "react";
import useSWR from "swr";
import { cannotCompareReason, compareStep, shiftTime, type Comparison, type Tolerances } from "@/lib/traces/compare";
import type { SimulatedStep } from "@/lib/design/review";
import { formatEng } from "@/lib/units/eng";
import { WavePlot } from "./WavePlot";
import { ChannelCorrection } from "./ChannelCorrection";
import { ComparisonTable } from "./ComparisonTable";

export interface TraceMeta {
  id: string;
  label: string;
  revisionNumber: number;
  sampleCount: number;
  channels: { name: string; unit: string }[];
}

interface TraceSamples {
  id: string;
  time: number[];
  channels: { name: string; unit: string; values: number[] }[];
}

const fetchJson = async (url: string) => {
  const r = await fetch(url);
  const body = await r.json().catch(() => ({}));
  if (!r.ok) throw new Error(body.error ?? `HTTP ${r.status}`);
  return body;
};

export interface ComparisonResult {
  traceId: string;
  channel: number;
  comparison: Comparison;
}

export function BenchComparison(props: {
  traces: TraceMeta[];
  step: SimulatedStep;
  tolerances: Tolerances;
  /** Called with each new comparison (for the submission's evidence). */
  onResult?: (r: ComparisonResult | null) => void;
  initialTraceId?: string;
  readOnly?: boolean;
  /** Designers and leads may correct a channel's unit and scale after upload (the server checks). */
  canCorrect?: boolean;
  /** Called after a correction is stored (e.g. to refresh the trace list). */
  onCorrected?: () => void;
}) {
  const { traces, step, tolerances, onResult } = props;
  const [traceId, setTraceId] = useState(props.initialTraceId ?? traces[0]?.id ?? "");
  const meta = traces.find((t) => t.id === traceId) ?? traces[0];
  const defaultChannel = meta ? Math.max(0, meta.channels.findIndex((c) => c.unit === "A")) : 0;
  const [channel, setChannel] = useState(defaultChannel);
  const [manualUs, setManualUs] = useState(0);
  /** RMS window, µs after the simulated step; blank = the whole overlap of the two records. */
  const [windowUs, setWindowUs] = useState<{ from: string; to: string }>({ from: "", to: "" });
  useEffect(() => setChannel(defaultChannel), [traceId, defaultChannel]);

  const { data, error, isLoading, mutate } = useSWR<TraceSamples>(meta ? `/api/traces/${meta.id}` : null, fetchJson);

  const measured = useMemo(() => {
    if (!data || !data.channels[channel]) return null;
    return { time: Float64Array.from(data.time), values: Float64Array.from(data.channels[channel].values), unit: data.channels[channel].unit };
  }, [data, channel]);

  const unitProblem = measured ? cannotCompareReason(measured.unit) : null;
  const result = useMemo((): { ok: true; c: Comparison } | { ok: false; error: string } | null => {
    if (!measured) return null;
    // No figures, and so no verdicts, for a channel whose numbers are not amperes.
    if (cannotCompareReason(measured.unit)) return null;
    try {
      const from = windowUs.from.trim() === "" ? null : Number(windowUs.from);
      const to = windowUs.to.trim() === "" ? null : Number(windowUs.to);
      if ((from !== null && !Number.isFinite(from)) || (to !== null && !Number.isFinite(to))) return { ok: false, error: "RMS window: enter numbers of µs after the step" };
      if (from !== null && to !== null && !(to > from)) return { ok: false, error: "RMS window: the end must come after the start" };
      const window: [number, number] | undefined =
        from === null && to === null
          ? undefined
          : [from === null ? -Infinity : step.stepTime + from * 1e-6, to === null ? Infinity : step.stepTime + to * 1e-6];
      const c = compareStep(measured, { time: step.time, values: step.iLoad }, { manualOffset: manualUs * 1e-6, commandEdge: step.stepTime, tolerances, window });
      return { ok: true, c };
    } catch (e) {
      return { ok: false, error: e instanceof Error ? e.message : String(e) };
    }
  }, [measured, step, manualUs, tolerances, windowUs]);

  useEffect(() => {
    if (!onResult) return;
    onResult(result?.ok && meta ? { traceId: meta.id, channel, comparison: result.c } : null);
  }, [result, meta, channel, onResult]);

  if (!meta) return <p className="text-sm text-ink-muted">No bench traces yet: upload a capture to compare it with the simulation.</p>;

  const spanUs = (step.time[step.time.length - 1] - step.time[0]) * 1e6;
  return (
    <div className="space-y-3" data-testid="bench-comparison">
      {!props.readOnly && (
        <div className="flex flex-wrap items-end gap-4 text-sm no-print">
          <label className="flex flex-col">
            <span className="text-xs text-ink-muted">Bench trace</span>
            <select className="rounded border border-hairline bg-white px-2 py-1" value={meta.id} onChange={(e) => { setTraceId(e.target.value); setManualUs(0); }} aria-label="Bench trace">
              {traces.map((t) => <option key={t.id} value={t.id}>{t.label} (rev {t.revisionNumber})</option>)}
            </select>
          </label>
          <label className="flex flex-col">
            <span className="text-xs text-ink-muted">Channel</span>
            <select className="rounded border border-hairline bg-white px-2 py-1" value={channel} onChange={(e) => setChannel(Number(e.target.value))} aria-label="Channel">
              {meta.channels.map((c, i) => <option key={i} value={i}>{c.name} ({c.unit || "no unit"})</option>)}
            </select>
          </label>
          <label className="flex flex-col">
            <span className="text-xs text-ink-muted">Hand offset, µs (added to the automatic alignment)</span>
            <span className="flex items-center gap-2">
              <input type="range" min={-spanUs / 10} max={spanUs / 10} step={spanUs / 2000} value={manualUs} onChange={(e) => setManualUs(Number(e.target.value))} aria-label="Hand offset slider" />
              <input type="number" className="num w-24 rounded border border-hairline px-2 py-1" value={Number(manualUs.toFixed(3))} step="any" onChange={(e) => setManualUs(Number(e.target.value) || 0)} aria-label="Hand offset in microseconds" />
            </span>
          </label>
          <fieldset className="flex items-end gap-2">
            <legend className="text-xs text-ink-muted">RMS window, µs after the step (blank: whole overlap)</legend>
            <input className="num w-20 rounded border border-hairline px-2 py-1" value={windowUs.from} placeholder="from" inputMode="decimal" onChange={(e) => setWindowUs({ ...windowUs, from: e.target.value })} aria-label="RMS window start in microseconds" />
            <input className="num w-20 rounded border border-hairline px-2 py-1" value={windowUs.to} placeholder="to" inputMode="decimal" onChange={(e) => setWindowUs({ ...windowUs, to: e.target.value })} aria-label="RMS window end in microseconds" />
          </fieldset>
        </div>
      )}
      {props.canCorrect && !props.readOnly && data?.channels[channel] && (
        <ChannelCorrection
          key={`${meta.id}-${channel}`}
          traceId={meta.id}
          channel={channel}
          current={data.channels[channel]}
          onSaved={() => { void mutate(); props.onCorrected?.(); }}
        />
      )}
      {unitProblem && (
        <p role="alert" className="text-sm text-verdict-warn" data-testid="unit-warning">
          Cannot compare: {unitProblem}
        </p>
      )}
      {isLoading && <p role="status" className="text-sm text-ink-muted">Loading the trace…</p>}
      {error && <p role="alert" className="text-sm text-verdict-fail">Could not load the trace: {error.message}</p>}
      {result && !result.ok && <p role="alert" className="text-sm text-verdict-fail">Cannot compare: {result.error}</p>}
      {result?.ok && measured && (
        <>
          <WavePlot
            testId="comparison-plot"
            title="Load current: measured (aligned) over simulated"
            yUnit={measured.unit || "A"}
            xRange={[step.time[0], step.time[step.time.length - 1]]}
            markers={[
              { t: step.stepTime, label: "command edge" },
              { t: result.c.simulatedEdge, label: "simulated 50 %" },
              { t: result.c.measuredEdge + result.c.offset, label: "measured 50 %" },
            ]}
            series={[
              { label: "Simulated load current", time: step.time, values: step.iLoad, color: "#0072B2" },
              { label: `Measured: ${meta.label}`, time: shiftTime(measured.time, result.c.offset), values: measured.values, color: "#D55E00" },
            ]}
          />
          <p className="text-xs text-ink-muted num" data-testid="alignment-edges">
            Edges: measured step (50 % between its pre-step and final levels) at {formatEng(result.c.measuredEdge, "s")} in the capture;
            simulated 50 % crossing at {formatEng(result.c.simulatedEdge, "s")}, {formatEng(result.c.simulatedEdge - result.c.commandEdge, "s")} after the command edge at {formatEng(result.c.commandEdge, "s")}.
          </p>
          <p className="text-xs text-ink-muted num">
            Alignment: automatic {formatEng(result.c.autoOffset, "s")} + hand {formatEng(manualUs * 1e-6, "s")} = {formatEng(result.c.offset, "s")};
            RMS window {formatEng(result.c.window[0], "s")} to {formatEng(result.c.window[1], "s")}.
          </p>
          <ComparisonTable rows={result.c.rows} verdict={result.c.verdict} />
        </>
      )}
    </div>
  );
}
