"use client";
/**
 * Studies open in a drawer from the bottom, over the response zone: Sweep (1D overlays and metric against the
 * parameter), Map (2D heatmap), Spread (tolerance Monte Carlo histograms) and Compensate (with Apply). Each shows
 * a progress bar, the time left, and Cancel.
 */
import { useEffect, useMemo, useRef, useState } from "react";
import type uPlot from "uplot";
import { formatEng, parseEng } from "@/lib/units/eng";
import { SWEEPABLE_PARAMETERS, mergeSpread, summarizeSpread, type MapMetric, type SnubberTuneResult, type SpreadDraw } from "@/lib/design/studies";
import { E_SERIES_NAMES, type ESeriesName } from "@/lib/design/eseries";
import { setPath, getPath } from "@/lib/workbench/paths";
import { StudyRunner } from "@/lib/workbench/studies";
import { changedApartFrom } from "@/lib/workbench/live";
import type { StudyKind } from "@/lib/workbench/types";
import type { StudyState } from "@/lib/workbench/store";
import { UPlotChart, type Overlay, type UPlotHandle } from "@/components/plots/UPlotChart";
import { Heatmap } from "@/components/plots/Heatmap";
import { Histogram } from "@/components/plots/Histogram";
import { AXIS, OKABE_ITO } from "@/components/plots/palette";
import { ExportButtons } from "@/components/plots/ExportMenu";
import { useWb, useWbStore } from "./context";
import { ParamField } from "./Panels";
import type { Engine } from "./engine";

const BTN = "rounded border border-hairline bg-white px-2.5 py-1 text-[13px] hover:bg-paper focus-visible:outline-2 focus-visible:outline-signal disabled:opacity-40";
const PRIMARY = "rounded bg-signal px-3 py-1 text-[13px] font-semibold text-white hover:bg-signal-dark focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-signal disabled:opacity-40";

function paramInfo(path: string) {
  return SWEEPABLE_PARAMETERS.find((p) => p.path === path) ?? { path, label: path, unit: "", from: 1, to: 10, scale: "log" as const };
}

function fmtTime(ms: number | null): string {
  if (ms === null || !Number.isFinite(ms)) return "estimating…";
  if (ms < 1000) return "under a second";
  const s = Math.round(ms / 1000);
  return s < 90 ? `about ${s} s` : `about ${Math.round(s / 60)} min`;
}

const designChanged = changedApartFrom(["studies"]);

/** A note when the results on show were computed for an earlier version of the design. */
function StaleNote({ kind, runner }: { kind: StudyKind; runner: StudyRunner | null }) {
  const scenario = useWb((s) => s.scenario);
  const status = useWb((s) => s.studies[kind].status);
  const from = runner?.startedWith(kind) ?? null;
  if (!from || status === "idle" || !designChanged(scenario, from)) return null;
  return <p className="text-[12px] text-verdict-warn" role="status">The design has changed since this study ran: run it again to update.</p>;
}

function Progress({ kind, state, onCancel }: { kind: StudyKind; state: StudyState<unknown>; onCancel: () => void }) {
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

function AxisEditor({ base, label }: { base: string; label: string }) {
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

const axisOpt = (over: Partial<uPlot.Axis>): uPlot.Axis => ({ stroke: AXIS.stroke, grid: AXIS.grid, ticks: AXIS.ticks, font: AXIS.font, ...over });

function OverlayChart({ title, overlays, xLog, xUnit, yUnit, scale, testId }: { title: string; overlays: Overlay[]; xLog: boolean; xUnit: string; yUnit: string; scale: string; testId: string }) {
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

function SweepTab({ runner }: { runner: StudyRunner | null }) {
  const state = useWb((s) => s.studies.sweep);
  const axisPath = useWb((s) => s.scenario.studies.sweep.path);
  const info = paramInfo(axisPath);
  const merged = useMemo(() => {
    const chunks = state.chunks;
    if (chunks.length === 0) return null;
    const first = chunks[0]!;
    const n = first.values.length;
    const pm = new Float64Array(n).fill(NaN), os = new Float64Array(n).fill(NaN), ts = new Float64Array(n).fill(NaN), nz = new Float64Array(n).fill(NaN);
    for (const c of chunks) {
      for (let i = 0; i < n; i++) {
        if (!Number.isNaN(c.phaseMarginDeg[i]!)) pm[i] = c.phaseMarginDeg[i]!;
        if (!Number.isNaN(c.overshootPct[i]!)) os[i] = c.overshootPct[i]!;
        if (!Number.isNaN(c.settlingTime1pct[i]!)) ts[i] = c.settlingTime1pct[i]!;
        if (c.noiseRms && !Number.isNaN(c.noiseRms[i]!)) nz[i] = c.noiseRms[i]!;
      }
    }
    const points = chunks.flatMap((c) => c.points).sort((a, b) => a.index - b.index);
    const failures = chunks.flatMap((c) => c.failures);
    return { path: first.path, values: first.values, pm, os, ts, nz, points, failures, n };
  }, [state.chunks]);
  const colour = (i: number) => OKABE_ITO[i % OKABE_ITO.length]!;
  const stepOverlays = useMemo<Overlay[]>(() => merged?.points.filter((p) => p.step).map((p) => ({ x: p.step!.time, y: p.step!.iLoad, stroke: colour(p.index), scale: "y", width: 1.5 })) ?? [], [merged]);
  const bodeOverlays = useMemo<Overlay[]>(() => merged?.points.filter((p) => p.loop).map((p) => ({ x: p.loop!.freq, y: p.loop!.magDb, stroke: colour(p.index), scale: "y", width: 1.5 })) ?? [], [merged]);
  const metricOverlays = useMemo<Overlay[]>(() => merged ? [{ x: merged.values, y: merged.pm, stroke: OKABE_ITO[0], scale: "y", width: 2 }] : [], [merged]);
  const osOverlays = useMemo<Overlay[]>(() => merged ? [{ x: merged.values, y: merged.os, stroke: OKABE_ITO[1], scale: "y", width: 2 }] : [], [merged]);
  const noiseOverlays = useMemo<Overlay[]>(() => merged ? [{ x: merged.values, y: merged.nz, stroke: OKABE_ITO[2], scale: "y", width: 2 }] : [], [merged]);
  const xLog = (merged?.values[0] ?? 0) > 0;
  return (
    <div className="grid gap-3 lg:grid-cols-[320px_minmax(0,1fr)]">
      <div className="max-w-md space-y-2">
        <AxisEditor base="studies.sweep" label="Sweep axis" />
        <div className="flex items-center gap-2">
          <button type="button" className={PRIMARY} disabled={!runner} onClick={() => runner?.sweep()} data-testid="sweep-run">Run sweep</button>
        </div>
        <Progress kind="sweep" state={state} onCancel={() => runner?.cancel("sweep")} />
        <StaleNote kind="sweep" runner={runner} />
        {merged && merged.failures.length > 0 && (
          <ul className="text-[12px] text-verdict-fail">{merged.failures.map((f) => <li key={f.index}>Point {f.index + 1}: {f.message}</li>)}</ul>
        )}
      </div>
      <div className="min-w-0 space-y-2">
        {merged ? (
          <>
            <ul className="flex flex-wrap gap-x-3 gap-y-1 text-[12px]" aria-label="Sweep curves" data-testid="sweep-legend">
              {merged.points.map((p) => (
                <li key={p.index} className="num flex items-center gap-1" data-testid="sweep-curve">
                  <span className="inline-block h-0.5 w-4" style={{ background: colour(p.index) }} aria-hidden />
                  {formatEng(p.value, info.unit)}
                </li>
              ))}
            </ul>
            <div className="grid gap-2 xl:grid-cols-2">
              <OverlayChart title="Load current, one curve per value" overlays={stepOverlays} xLog={false} xUnit="s" yUnit="A" scale="y" testId="sweep-step" />
              <OverlayChart title="Loop gain magnitude" overlays={bodeOverlays} xLog xUnit="Hz" yUnit="dB" scale="y" testId="sweep-bode" />
              <OverlayChart title={`Current-loop phase margin against ${info.label.toLowerCase()}`} overlays={metricOverlays} xLog={xLog} xUnit={info.unit} yUnit="°" scale="y" testId="sweep-pm" />
              <OverlayChart title={`Overshoot against ${info.label.toLowerCase()}`} overlays={osOverlays} xLog={xLog} xUnit={info.unit} yUnit="%" scale="y" testId="sweep-os" />
              <OverlayChart title={`Load-current noise (RMS over the band) against ${info.label.toLowerCase()}`} overlays={noiseOverlays} xLog={xLog} xUnit={info.unit} yUnit="A" scale="y" testId="sweep-noise" />
            </div>
          </>
        ) : (
          <p className="text-[13px] text-ink-muted">Choose a parameter and run: each value gets its own step response and loop gain, and the metrics are plotted against the parameter.</p>
        )}
      </div>
    </div>
  );
}

const METRICS: { id: MapMetric; label: string; unit: string }[] = [
  { id: "overshootPct", label: "Overshoot", unit: "%" },
  { id: "phaseMarginDeg", label: "Phase margin (current loop)", unit: "°" },
  { id: "settlingTime1pct", label: "Settling time (±1 %)", unit: "s" },
  { id: "noiseRms", label: "Load-current noise (RMS over the noise band)", unit: "A" },
];

function MapTab({ runner }: { runner: StudyRunner | null }) {
  const store = useWbStore();
  const state = useWb((s) => s.studies.map);
  const metric = useWb((s) => s.scenario.studies.map.metric);
  const ref = useRef<{ toPng(): string | null }>(null);
  const merged = useMemo(() => {
    const chunks = state.chunks;
    if (chunks.length === 0) return null;
    const f = chunks[0]!;
    const values = new Float64Array(f.values.length).fill(NaN);
    const failed = new Set<number>();
    for (const c of chunks) {
      for (let i = 0; i < values.length; i++) if (!Number.isNaN(c.values[i]!)) values[i] = c.values[i]!;
      for (const x of c.failures) failed.add(x.index);
    }
    return { ...f, values, failed };
  }, [state.chunks]);
  const m = METRICS.find((x) => x.id === (merged?.metric ?? metric))!;
  return (
    <div className="grid gap-3 lg:grid-cols-[320px_minmax(0,1fr)]">
      <div className="max-w-md space-y-2">
        <AxisEditor base="studies.map.x" label="Across (x)" />
        <AxisEditor base="studies.map.y" label="Up (y)" />
        <div className="flex items-center gap-2 px-2">
          <label htmlFor="map-metric" className="flex-1 text-[13px]">Metric</label>
          <select id="map-metric" className="w-52 rounded border border-hairline bg-white px-1 py-0.5 text-[13px]" value={metric}
            onChange={(e) => store.getState().edit((s) => setPath(s, "studies.map.metric", e.target.value))}>
            {METRICS.map((x) => <option key={x.id} value={x.id}>{x.label}</option>)}
          </select>
        </div>
        <button type="button" className={PRIMARY} disabled={!runner} onClick={() => runner?.map()} data-testid="map-run">Run map</button>
        <Progress kind="map" state={state} onCancel={() => runner?.cancel("map")} />
        <StaleNote kind="map" runner={runner} />
      </div>
      <div className="min-w-0">
        {merged ? (
          <figure className="rounded border border-hairline bg-white p-2">
            <div className="flex items-center justify-between">
              <h4 className="text-[12px] font-semibold">{m.label}</h4>
              <ExportButtons name={`Map of ${m.label}`} png={() => ref.current?.toPng() ?? null} testId="map-export"
                columns={() => {
                  const nx = merged.xValues.length;
                  const xs: number[] = [], ys: number[] = [], vs: number[] = [];
                  for (let k = 0; k < merged.values.length; k++) { xs.push(merged.xValues[k % nx]!); ys.push(merged.yValues[Math.floor(k / nx)]!); vs.push(merged.values[k]!); }
                  return [{ name: paramInfo(merged.xPath).label, unit: paramInfo(merged.xPath).unit, data: xs }, { name: paramInfo(merged.yPath).label, unit: paramInfo(merged.yPath).unit, data: ys }, { name: m.label, unit: m.unit, data: vs }];
                }} />
            </div>
            <Heatmap ref={ref} xValues={merged.xValues} yValues={merged.yValues} values={merged.values} failed={merged.failed}
              xLabel={paramInfo(merged.xPath).label} yLabel={paramInfo(merged.yPath).label} xUnit={paramInfo(merged.xPath).unit} yUnit={paramInfo(merged.yPath).unit}
              metricLabel={m.label} metricUnit={m.unit} />
          </figure>
        ) : (
          <p className="text-[13px] text-ink-muted">A grid of runs over two parameters, coloured by the metric. Cells fill in as the workers finish them.</p>
        )}
      </div>
    </div>
  );
}

/** The part deviations that produced a worst-case run (relative in %, offset in V, bias in A, β absolute). */
function WorstDraw({ title, draw }: { title: string; draw: SpreadDraw }) {
  const abs: Record<string, string> = { vos: "V", ib: "A", betaF: "" };
  return (
    <details className="rounded border border-hairline bg-white px-2 py-1 text-[12px]">
      <summary className="cursor-pointer">{title}</summary>
      <ul className="num mt-1 grid grid-cols-2 gap-x-4 sm:grid-cols-3">
        {Object.entries(draw).map(([k, v]) => (
          <li key={k}>{k}: {k in abs ? formatEng(v, abs[k]!) : `${v >= 0 ? "+" : ""}${(v * 100).toFixed(2)} %`}</li>
        ))}
      </ul>
    </details>
  );
}

function HistFigure({ title, h, label, unit, color, testId }: { title: string; h: { edges: Float64Array; counts: Float64Array }; label: string; unit: string; color: string; testId: string }) {
  const ref = useRef<{ toPng(): string | null }>(null);
  return (
    <figure className="rounded border border-hairline bg-white p-2">
      <div className="flex items-center justify-between">
        <h4 className="text-[12px] font-semibold">{title}</h4>
        <ExportButtons name={title} png={() => ref.current?.toPng() ?? null} testId={`${testId}-export`}
          columns={() => [
            { name: `${label} bin low`, unit, data: h.edges.subarray(0, h.counts.length) },
            { name: `${label} bin high`, unit, data: h.edges.subarray(1) },
            { name: "runs", data: h.counts },
          ]} />
      </div>
      <Histogram ref={ref} edges={h.edges} counts={h.counts} label={label} unit={unit} color={color} testId={testId} />
    </figure>
  );
}

function SpreadTab({ runner }: { runner: StudyRunner | null }) {
  const state = useWb((s) => s.studies.spread);
  const scenario = useWb((s) => s.scenario);
  const summary = useMemo(() => {
    if (state.chunks.length === 0) return null;
    const merged = mergeSpread(state.chunks);
    return { merged, sum: summarizeSpread(scenario, merged) };
    // The summary belongs to the run's chunks; the scenario only names the draws of the worst runs.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [state.chunks]);
  return (
    <div className="grid gap-3 lg:grid-cols-[320px_minmax(0,1fr)]">
      <div className="max-w-md space-y-2">
        <ParamField spec={{ path: "studies.spread.runs", label: "Runs", unit: "", integer: true, min: 1, max: 100000 }} />
        <ParamField spec={{ path: "studies.spread.seed", label: "Seed", unit: "", integer: true }} />
        <ParamField spec={{ path: "tolerances.resistor", label: "Resistor tolerance", unit: "%", min: 0, max: 50, scale: 100 }} />
        <ParamField spec={{ path: "tolerances.sense", label: "Sense-resistor tolerance", unit: "%", min: 0, max: 50, scale: 100 }} />
        <ParamField spec={{ path: "tolerances.capacitor", label: "Capacitor tolerance", unit: "%", min: 0, max: 50, scale: 100 }} />
        <button type="button" className={PRIMARY} disabled={!runner} onClick={() => runner?.spread()} data-testid="spread-run">Run spread</button>
        <Progress kind="spread" state={state} onCancel={() => runner?.cancel("spread")} />
        <StaleNote kind="spread" runner={runner} />
      </div>
      <div className="min-w-0">
        {summary ? (
          <div className="space-y-2">
            <div className="grid gap-2 xl:grid-cols-2">
              <HistFigure title="Output-current error, % of full scale" h={summary.sum.errorHistogram} label="error" unit="% FS" color={OKABE_ITO[0]} testId="spread-error-hist" />
              <HistFigure title="Phase margin" h={summary.sum.pmHistogram} label="phase margin" unit="°" color={OKABE_ITO[1]} testId="spread-pm-hist" />
            </div>
            <table className="num text-[12px]" data-testid="spread-summary">
              <tbody>
                <tr><th scope="row" className="pr-3 text-left font-medium">Error mean ± σ</th><td>{summary.sum.errorPctFs.mean.toFixed(3)} ± {summary.sum.errorPctFs.std.toFixed(3)} % FS</td></tr>
                <tr><th scope="row" className="pr-3 text-left font-medium">Error range</th><td>{summary.sum.errorPctFs.min.toFixed(3)} … {summary.sum.errorPctFs.max.toFixed(3)} % FS</td></tr>
                <tr><th scope="row" className="pr-3 text-left font-medium">Phase margin, lowest</th><td>{summary.sum.phaseMarginDeg.min.toFixed(1)}° (run {summary.sum.worstPhaseMargin ? summary.sum.worstPhaseMargin.index + 1 : "—"})</td></tr>
                <tr><th scope="row" className="pr-3 text-left font-medium">Runs that failed</th><td>{summary.merged.failures.length}</td></tr>
              </tbody>
            </table>
            {summary.sum.worstError && <WorstDraw title={`Worst current error: run ${summary.sum.worstError.index + 1}, ${summary.sum.worstError.errorPctFs.toFixed(3)} % FS`} draw={summary.sum.worstError.draw} />}
            {summary.sum.worstPhaseMargin && <WorstDraw title={`Lowest phase margin: run ${summary.sum.worstPhaseMargin.index + 1}, ${summary.sum.worstPhaseMargin.phaseMarginDeg.toFixed(1)}°`} draw={summary.sum.worstPhaseMargin.draw} />}
          </div>
        ) : (
          <p className="text-[13px] text-ink-muted">Draws every part within its tolerance (seeded, repeatable) and shows how the output current and the phase margin spread.</p>
        )}
      </div>
    </div>
  );
}

/** The load-snubber search: what it tried (one row per capacitor) and, when one meets the targets, its own Apply. */
function SnubberResult({ result }: { result: SnubberTuneResult }) {
  const store = useWbStore();
  const [applied, setApplied] = useState(false);
  useEffect(() => setApplied(false), [result]);
  const c = result.chosen;
  return (
    <div className="mt-2 border-t border-hairline pt-2" data-testid="compensate-snubber">
      <table className="num w-full text-[12px]">
        <caption className="text-left text-[12px] font-semibold">Load snubbers tried (with the present compensation)</caption>
        <thead><tr className="text-left text-ink-muted"><th>C</th><th>best R</th><th>margin</th><th>overshoot</th><th>meets</th></tr></thead>
        <tbody>
          {result.tried.map((t) => (
            <tr key={t.capacitance}>
              <td>{formatEng(t.capacitance, "F")}</td><td>{formatEng(t.resistance, "Ω")}</td>
              <td>{Number.isFinite(t.minPhaseMarginDeg) ? `${t.minPhaseMarginDeg.toFixed(1)}°` : "—"}</td>
              <td>{t.worstOvershootPct === null ? "—" : `${t.worstOvershootPct.toFixed(1)} %`}</td>
              <td>{t.meets ? "yes" : "no"}</td>
            </tr>
          ))}
        </tbody>
      </table>
      {c && (
        <button type="button" className={`${PRIMARY} mt-2`} data-testid="compensate-apply-snubber"
          onClick={() => {
            store.getState().edit((s) => ({ ...s, networks: { ...s.networks, loadSnubber: { resistance: c.resistance, capacitance: c.capacitance } } }));
            setApplied(true);
          }}>
          Apply the load snubber {formatEng(c.resistance, "Ω")} + {formatEng(c.capacitance, "F")}
        </button>
      )}
      {applied && <span className="ml-2 text-[12px] text-verdict-pass" role="status">Applied — undo with Ctrl+Z</span>}
    </div>
  );
}

function CompensateTab({ runner }: { runner: StudyRunner | null }) {
  const store = useWbStore();
  const state = useWb((s) => s.studies.compensate);
  const series = useWb((s) => s.scenario.studies.compensate.series);
  const tune = useWb((s) => s.scenario.studies.compensate.tuneBaseResistor);
  const tuneSnubber = useWb((s) => s.scenario.studies.compensate.tuneLoadSnubber);
  const result = useMemo(() => {
    for (const c of state.chunks) if (c.result) return c.result;
    return null;
  }, [state.chunks]);
  const [applied, setApplied] = useState(false);
  useEffect(() => setApplied(false), [result]);
  return (
    <div className="grid gap-3 lg:grid-cols-[320px_minmax(0,1fr)]">
      <div className="max-w-md space-y-2">
        <ParamField spec={{ path: "studies.compensate.targetPhaseMarginDeg", label: "Phase margin at least", unit: "°", min: 0, max: 90 }} />
        <ParamField spec={{ path: "studies.compensate.maxOvershootPct", label: "Overshoot at most", unit: "%", min: 0, max: 100 }} />
        <div className="flex items-center gap-2 px-2">
          <label htmlFor="comp-series" className="flex-1 text-[13px]">Values from</label>
          <select id="comp-series" className="rounded border border-hairline bg-white px-1 py-0.5 text-[13px]" value={series}
            onChange={(e) => store.getState().edit((s) => setPath(s, "studies.compensate.series", e.target.value as ESeriesName))}>
            {E_SERIES_NAMES.map((n) => <option key={n} value={n}>{n}</option>)}
          </select>
        </div>
        <label className="flex items-center gap-2 px-2 text-[13px]">
          <input type="checkbox" className="accent-signal" checked={tune} onChange={(e) => store.getState().edit((s) => setPath(s, "studies.compensate.tuneBaseResistor", e.target.checked))} />
          Also tune the base/gate resistor
        </label>
        <label className="flex items-center gap-2 px-2 text-[13px]">
          <input type="checkbox" className="accent-signal" checked={tuneSnubber} data-testid="compensate-tune-snubber"
            onChange={(e) => store.getState().edit((s) => setPath(s, "studies.compensate.tuneLoadSnubber", e.target.checked))} />
          Also find a load snubber (the smallest capacitor that meets the targets)
        </label>
        <button type="button" className={PRIMARY} disabled={!runner} onClick={() => runner?.compensate()} data-testid="compensate-run">Find compensation</button>
        <Progress kind="compensate" state={state} onCancel={() => runner?.cancel("compensate")} />
        <StaleNote kind="compensate" runner={runner} />
      </div>
      <div className="min-w-0 space-y-2">
        {result ? (
          <div className="rounded border border-hairline bg-white p-3 text-[13px]" data-testid="compensate-result">
            <p>{result.message}</p>
            {result.loadSnubber && <SnubberResult result={result.loadSnubber} />}
            {result.chosen && (
              <>
                <dl className="num mt-2 grid grid-cols-2 gap-x-4 gap-y-1 text-[12px]">
                  <dt>Compensation capacitor</dt><dd>{formatEng(result.chosen.compCapacitor, "F")}</dd>
                  <dt>Base/gate resistor</dt><dd>{formatEng(result.chosen.baseResistor, "Ω")}</dd>
                  <dt>Lowest phase margin</dt><dd>{result.chosen.minPhaseMarginDeg.toFixed(1)}° ({result.chosen.phaseMarginToSpareDeg.toFixed(1)}° to spare)</dd>
                  <dt>Worst overshoot</dt><dd>{result.chosen.worstOvershootPct.toFixed(2)} % ({result.chosen.overshootToSparePct.toFixed(2)} % to spare)</dd>
                  <dt>Worst settling (±1 %)</dt><dd>{formatEng(result.chosen.worstSettlingTime1pct, "s")}</dd>
                </dl>
                <button
                  type="button"
                  className={`${PRIMARY} mt-3`}
                  data-testid="compensate-apply"
                  onClick={() => {
                    const c = result.chosen!;
                    store.getState().edit((s) => ({ ...s, parts: { ...s.parts, compCapacitor: c.compCapacitor, baseResistor: c.baseResistor } }));
                    setApplied(true);
                  }}
                >
                  Apply
                </button>
                {applied && <span className="ml-2 text-[12px] text-verdict-pass" role="status">Applied — undo with Ctrl+Z</span>}
              </>
            )}
          </div>
        ) : (
          <p className="text-[13px] text-ink-muted">Searches series values for the compensation capacitor (and, if asked, the base/gate resistor) that meet the targets at every load corner, and picks the fastest settling.</p>
        )}
      </div>
    </div>
  );
}

const TABS: { id: StudyKind; label: string }[] = [
  { id: "sweep", label: "Sweep" },
  { id: "map", label: "Map" },
  { id: "spread", label: "Spread" },
  { id: "compensate", label: "Compensate" },
];

export function StudiesDrawer({ open, onToggle, engine }: { open: boolean; onToggle: () => void; engine: Engine | null }) {
  const store = useWbStore();
  const [tab, setTab] = useState<StudyKind>("sweep");
  const runner = useMemo(() => (engine ? new StudyRunner(store, engine.pool) : null), [engine, store]);
  useEffect(() => () => runner?.cancelAll(), [runner]);
  const running = useWb((s) => TABS.filter((t) => s.studies[t.id].status === "running").map((t) => t.label).join(", "));
  return (
    <div className="fixed inset-x-0 bottom-0 z-30 border-t border-hairline bg-white shadow-[0_-4px_16px_rgba(28,36,48,0.08)]" data-testid="studies-drawer">
      <div className="flex items-center gap-3 px-4">
        <button type="button" onClick={onToggle} aria-expanded={open} aria-controls="studies-panel" className="py-1.5 text-[13px] font-semibold" data-testid="studies-toggle">
          Studies {open ? "▾" : "▴"}
        </button>
        {open && (
          <div role="tablist" aria-label="Studies" className="flex gap-1">
            {TABS.map((t) => (
              <button key={t.id} type="button" role="tab" aria-selected={tab === t.id} data-testid={`studies-tab-${t.id}`}
                className={`rounded px-2.5 py-1 text-[13px] ${tab === t.id ? "bg-signal-light font-semibold text-signal-dark" : "text-ink-muted hover:text-ink"}`}
                onClick={() => setTab(t.id)}>
                {t.label}
              </button>
            ))}
          </div>
        )}
        {running && <span className="text-[12px] text-ink-muted">running: {running}</span>}
      </div>
      {open && (
        <div id="studies-panel" role="tabpanel" className="max-h-[55vh] overflow-y-auto border-t border-hairline bg-paper px-4 py-3">
          {tab === "sweep" && <SweepTab runner={runner} />}
          {tab === "map" && <MapTab runner={runner} />}
          {tab === "spread" && <SpreadTab runner={runner} />}
          {tab === "compensate" && <CompensateTab runner={runner} />}
        </div>
      )}
    </div>
  );
}
