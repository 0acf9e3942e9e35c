"use client";
/** Map: a metric over two parameters as a heat map. */
import { useMemo, useRef } from "react";
import { type MapMetric } from "@/lib/design/studies";
import { setPath } from "@/lib/workbench/paths";
import { StudyRunner } from "@/lib/workbench/studies";
import { Heatmap } from "@/components/plots/Heatmap";
import { ExportButtons } from "@/components/plots/ExportMenu";
import { useWb, useWbStore } from "../context";
import { mergeMap } from "@/lib/design/studies";
import { paramInfo, AxisEditor, RunControls } from "./common";

const METRICS: { id: MapMetric; label: string; unit: string }[] = [
  { id: "overshootPct", label: "Overshoot (full step)", unit: "%" },
  { id: "judgedOvershootPct", label: "Overshoot (worse of full and small-signal)", unit: "%" },
  { id: "phaseMarginDeg", label: "Phase margin (current loop)", unit: "°" },
  { id: "settlingTime1pct", label: "Settling time (±1 %, full step)", unit: "s" },
  { id: "noiseRms", label: "Load-current noise (RMS over the noise band)", unit: "A" },
];

export function MapTab({ runner }: { runner: StudyRunner | null }) {
  const store = useWbStore();
  const state = useWb((s) => s.studies.map);
  const metric = useWb((s) => s.scenario.studies.map.metric);
  const ref = useRef<{ toPng(): string | null }>(null);
  const merged = useMemo(() => (state.chunks.length ? mergeMap(state.chunks) : null), [state.chunks]);
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
        <RunControls kind="map" label="Run map" runner={runner} state={state} />
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
