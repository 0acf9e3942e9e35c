"use client";
/** Pieces every study tab shares: parameter words, progress with time left and Cancel, the stale note, axis editing, an overlay chart. */
import { useMemo, useRef, useState } from "react";
import type uPlot from "uplot";
import { formatEng, parseEng } from "@/lib/units/eng";
import { SWEEPABLE_PARAMETERS } from "@/lib/design/studies";
import { setPath, getPath } from "@/lib/workbench/paths";
import { StudyRunner } from "@/lib/workbench/studies";
import { changedApartFrom } from "@/lib/workbench/live";
import type { StudyKind } from "@/lib/workbench/types";
import type { StudyState } from "@/lib/workbench/store";
import { UPlotChart, type Overlay, type UPlotHandle } from "@/components/plots/UPlotChart";
import { AXIS } from "@/components/plots/palette";
import { ExportButtons } from "@/components/plots/ExportMenu";
import { useWb, useWbStore } from "../context";
import { ParamField } from "../Panels";
import { TOOL_BUTTON as BTN, TOOL_BUTTON_PRIMARY as PRIMARY } from "@/components/shell/classes";

export function paramInfo(path: string) {
  return SWEEPABLE_PARAMETERS.find((p) => p.path === path) ?? { path, label: path, unit: "", from: 1, to: 10, scale: "log" as const };
}

export function fmtTime(ms: number | null): string {
  if (ms === null || !Number.isFinite(ms)) return "estimating…";
  if (ms < 1000) return "under a second";
  const s = Math.round(ms / 1000);
  return s < 90 ? `about ${s} s` : `about ${Math.round(s / 60)} min`;
}

export const designChanged = changedApartFrom(["studies"]);

/** A note when the results on show were computed for an earlier version of the design. */
export function StaleNote({ kind, runner }: { kind: StudyKind; runner: StudyRunner | null }) {
  const scenario = useWb((s) => s.scenario);
  const status = useWb((s) => s.studies[kind].status);
  const from = runner?.startedWith(kind) ?? null;
  if (!from || status === "idle" || !designChanged(scenario, from)) return null;
  return <p className="text-[12px] text-verdict-warn" role="status">The design has changed since this study ran: run it again to update.</p>;
}

export function Progress({ kind, state, onCancel }: { kind: StudyKind; state: StudyState<unknown>; onCancel: () => void }) {
  const pct = state.total > 0 ? Math.round((100 * state.done) / state.total) : 0;
  const words: Record<string, string> = {
    idle: "Not run yet", running: `${state.done} of ${state.total} · ${fmtTime(state.etaMs)} left`, done: `Done: ${state.done} of ${state.total}`,
    cancelled: `Cancelled after ${state.done} of ${state.total}`, failed: `Failed: ${state.error ?? ""}`,
  };
  return (
    <div className="flex flex-wrap items-center gap-2">
      <progress className="h-2 w-48 overflow-hidden rounded [&::-moz-progress-bar]:bg-signal [&::-webkit-progress-bar]:bg-hairline [&::-webkit-progress-value]:bg-signal" max={Math.max(1, state.total)} value={state.done} aria-label={`${kind} progress`} data-testid={`study-progress-${kind}`} />
      <span className={`num text-[12px] ${state.status === "failed" ? "text-verdict-fail" : "text-ink-muted"}`} data-testid={`study-status-${kind}`} data-status={state.status} aria-live="polite">
        {state.status === "running" ? `${pct} % · ` : ""}{words[state.status]}
      </span>
      {state.status === "running" && (
        <button type="button" className={BTN} onClick={onCancel} data-testid={`study-cancel-${kind}`}>Cancel</button>
      )}
    </div>
  );
}

/** A study's run button, its progress with Cancel, and the stale note. */
export function RunControls({ kind, label, runner, state }: { kind: StudyKind; label: string; runner: StudyRunner | null; state: StudyState<unknown> }) {
  return (
    <>
      <button type="button" className={PRIMARY} disabled={!runner} onClick={() => runner?.[kind]()} data-testid={`${kind}-run`}>{label}</button>
      <Progress kind={kind} state={state} onCancel={() => runner?.cancel(kind)} />
      <StaleNote kind={kind} runner={runner} />
    </>
  );
}

export function AxisEditor({ base, label }: { base: string; label: string }) {
  const store = useWbStore();
  const path = useWb((s) => getPath(s.scenario, `${base}.path`) as string);
  const scale = useWb((s) => getPath(s.scenario, `${base}.scale`) as string);
  const values = useWb((s) => getPath(s.scenario, `${base}.values`) as number[]);
  const info = paramInfo(path);
  const [listText, setListText] = useState(values.map((v) => formatEng(v, "")).join(", "));
  const [listError, setListError] = useState<string | null>(null);
  const id = base.replace(/\./g, "-");
  return (
    <fieldset className="rounded border border-hairline p-2">
      <legend className="px-1 text-[12px] font-semibold">{label}</legend>
      <div className="flex items-center gap-2 px-2 py-1">
        <label htmlFor={`${id}-path`} className="flex-1 text-[13px]">Parameter</label>
        <select
          id={`${id}-path`}
          className="w-52 rounded border border-hairline bg-white px-1 py-0.5 text-[13px]"
          value={path}
          data-testid={`${id}-path`}
          onChange={(e) => {
            const p = paramInfo(e.target.value);
            store.getState().edit((s) => {
              const cur = getPath(s, base) as Record<string, unknown>;
              return setPath(s, base, { ...cur, path: p.path, from: p.from, to: p.to, scale: p.scale, values: [] });
            });
          }}
        >
          {SWEEPABLE_PARAMETERS.map((p) => <option key={p.path} value={p.path}>{p.label}</option>)}
        </select>
      </div>
      <div className="flex items-center gap-2 px-2 py-1">
        <label htmlFor={`${id}-scale`} className="flex-1 text-[13px]">Spacing</label>
        <select id={`${id}-scale`} className="w-52 rounded border border-hairline bg-white px-1 py-0.5 text-[13px]" value={scale}
          onChange={(e) => store.getState().edit((s) => setPath(s, `${base}.scale`, e.target.value))}>
          <option value="log">logarithmic</option>
          <option value="linear">linear</option>
          <option value="list">list of values</option>
        </select>
      </div>
      {scale === "list" ? (
        <div className="px-2 py-1">
          <label htmlFor={`${id}-list`} className="text-[13px]">Values ({info.unit || "no unit"}), separated by commas</label>
          <input
            id={`${id}-list`}
            className={`num mt-1 w-full rounded border px-1.5 py-0.5 text-[13px] ${listError ? "border-verdict-fail" : "border-hairline"}`}
            value={listText}
            onChange={(e) => setListText(e.target.value)}
            onBlur={() => {
              const parts = listText.split(",").map((t) => t.trim()).filter(Boolean);
              const out: number[] = [];
              for (const t of parts) {
                const r = parseEng(t, info.unit || undefined);
                if (!r.ok) return setListError(`${t}: ${r.error}`);
                out.push(r.value);
              }
              if (out.length === 0) return setListError("Enter at least one value");
              if (out.length > 400) return setListError("At most 400 values");
              setListError(null);
              store.getState().edit((s) => setPath(s, `${base}.values`, out));
            }}
          />
          {listError && <p role="alert" className="text-[12px] text-verdict-fail">{listError}</p>}
        </div>
      ) : (
        <>
          <ParamField spec={{ path: `${base}.from`, label: "From", unit: info.unit }} />
          <ParamField spec={{ path: `${base}.to`, label: "To", unit: info.unit }} />
          <ParamField spec={{ path: `${base}.points`, label: "Points", unit: "", integer: true, min: 1, max: 400 }} />
        </>
      )}
    </fieldset>
  );
}

export const axisOpt = (over: Partial<uPlot.Axis>): uPlot.Axis => ({ stroke: AXIS.stroke, grid: AXIS.grid, ticks: AXIS.ticks, font: AXIS.font, ...over });

export function OverlayChart({ title, overlays, xLog, xUnit, yUnit, scale, testId }: { title: string; overlays: Overlay[]; xLog: boolean; xUnit: string; yUnit: string; scale: string; testId: string }) {
  const ref = useRef<UPlotHandle>(null);
  const bounds = useMemo(() => {
    let x0 = Infinity, x1 = -Infinity, y0 = Infinity, y1 = -Infinity;
    for (const o of overlays) {
      for (let i = 0; i < o.x.length; i++) {
        const x = o.x[i]!, y = o.y[i]!;
        if (!Number.isFinite(x) || !Number.isFinite(y) || (xLog && x <= 0)) continue;
        if (x < x0) x0 = x; if (x > x1) x1 = x; if (y < y0) y0 = y; if (y > y1) y1 = y;
      }
    }
    if (!Number.isFinite(x0)) return null;
    const pad = (y1 - y0) * 0.05 || Math.abs(y1) * 0.05 || 1;
    return { x0, x1, y0: y0 - pad, y1: y1 + pad };
  }, [overlays, xLog]);
  const options = useMemo<Omit<uPlot.Options, "width" | "height">>(() => ({
    legend: { show: false },
    cursor: { drag: { x: true, y: false } },
    scales: { x: { time: false, distr: xLog ? 3 : 1 }, [scale]: { auto: false, range: () => [bounds?.y0 ?? 0, bounds?.y1 ?? 1] } },
    series: [{}, { scale, stroke: "transparent", points: { show: false } }],
    axes: [
      axisOpt({ values: (_u, v) => v.map((x) => (x == null ? "" : formatEng(x, xUnit))) }),
      axisOpt({ scale, size: 56, values: (_u, v) => v.map((x) => (x == null ? "" : formatEng(x, yUnit))) }),
    ],
  }), [xLog, xUnit, yUnit, scale, bounds]);
  const data = useMemo<uPlot.AlignedData>(() => (bounds ? [[bounds.x0, bounds.x1], [bounds.y0, bounds.y1]] : [[], []]), [bounds]);
  return (
    <figure className="rounded border border-hairline bg-white p-2">
      <div className="flex items-center justify-between">
        <h4 className="text-[12px] font-semibold">{title}</h4>
        <ExportButtons name={title} png={() => ref.current?.toPng() ?? null} testId={testId}
          columns={() => overlays.flatMap((o, i) => [{ name: `x${i + 1}`, unit: xUnit, data: o.x }, { name: `y${i + 1}`, unit: yUnit, data: o.y }])} />
      </div>
      <UPlotChart ref={ref} options={options} data={data} over={overlays} height={170} ariaLabel={title} testId={`${testId}-chart`} />
    </figure>
  );
}
