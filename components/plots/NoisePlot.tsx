"use client";
/**
 * The Noise tab: load-current noise density against frequency, log–log, the total and the top contributors, the
 * integration band shaded with its RMS figure (and the target when the scenario sets one). The worker's columns go
 * to uPlot as they are; the previous run's total is drawn behind as a ghost.
 */
import { useMemo, useRef } from "react";
import type uPlot from "uplot";
import { formatEng } from "@/lib/units/eng";
import type { NoiseView } from "@/lib/workbench/types";
import type { CsvColumn } from "@/lib/workbench/csv";
import { UPlotChart, type Marker, type Overlay, type UPlotHandle } from "./UPlotChart";
import { AXIS, GHOST_ALPHA, GHOST_DASH, OKABE_ITO } from "./palette";
import { ExportButtons } from "./ExportMenu";

const engTicks = (unit: string) => (_u: uPlot, vals: number[]) => vals.map((v) => (v == null ? "" : formatEng(v, unit, 3)));
const axis = (over: Partial<uPlot.Axis>): uPlot.Axis => ({
  stroke: AXIS.stroke, grid: AXIS.grid, ticks: AXIS.ticks, font: AXIS.font, labelFont: AXIS.labelFont, ...over,
});
/** Shade of the integration band (signal teal at low opacity). */
const BAND_FILL = "rgba(15, 118, 110, 0.08)";
const DENSITY_UNIT = "A/√Hz";

/** Fill the band [low, high] behind the traces (uPlot's drawClear hook runs before axes and series). */
function shadeBand(band: { low: number; high: number }) {
  return (u: uPlot) => {
    const x0 = u.valToPos(band.low, "x", true), x1 = u.valToPos(band.high, "x", true);
    const { left, top, width, height } = u.bbox;
    const a = Math.max(left, Math.min(x0, x1)), b = Math.min(left + width, Math.max(x0, x1));
    if (!(b > a)) return;
    u.ctx.save();
    u.ctx.fillStyle = BAND_FILL;
    u.ctx.fillRect(a, top, b - a, height);
    u.ctx.restore();
  };
}

export function NoisePlot({ noise, ghost, height = 150 }: { noise: NoiseView | null; ghost: NoiseView | null; height?: number }) {
  const ref = useRef<UPlotHandle>(null);
  const labels = noise ? noise.top.map((c) => c.element) : [];
  const labelKey = labels.join("\u0000");
  const bandLow = noise?.band.low ?? 0, bandHigh = noise?.band.high ?? 0;
  const options = useMemo<Omit<uPlot.Options, "width" | "height">>(() => ({
    legend: { live: true },
    cursor: { drag: { x: true, y: false }, sync: { key: "noise" } },
    scales: { x: { time: false, distr: 3 }, d: { distr: 3, auto: true } },
    series: [
      { label: "f", value: (_u, v) => (v == null ? "—" : formatEng(v, "Hz")) },
      { label: "total", scale: "d", stroke: OKABE_ITO[7], width: 2, value: (_u: uPlot, v: number | null) => (v == null ? "—" : formatEng(v, DENSITY_UNIT)) },
      ...labels.map((name, i) => ({
        label: name, scale: "d", stroke: OKABE_ITO[i % 7], width: 1.2,
        value: (_u: uPlot, v: number | null) => (v == null ? "—" : formatEng(v, DENSITY_UNIT)),
      })),
    ],
    axes: [
      axis({ values: engTicks("Hz"), space: 50 }),
      axis({ scale: "d", size: 64, values: engTicks(DENSITY_UNIT), label: "load-current noise", labelSize: 14 }),
    ],
    hooks: { drawClear: [shadeBand({ low: bandLow, high: bandHigh })] },
  }), [labelKey, bandLow, bandHigh]); // eslint-disable-line react-hooks/exhaustive-deps
  const data = useMemo<uPlot.AlignedData>(() => {
    if (!noise) return [[], []];
    return [noise.freq, noise.density, ...noise.top.map((c) => c.density)];
  }, [noise]);
  const under = useMemo<Overlay[]>(
    () => (ghost ? [{ x: ghost.freq, y: ghost.density, stroke: OKABE_ITO[7], scale: "d", dash: GHOST_DASH, alpha: GHOST_ALPHA }] : []),
    [ghost],
  );
  const markers = useMemo<Marker[]>(
    () => (noise ? [{ x: noise.band.low, label: "band", color: "#0F766E" }, { x: noise.band.high, label: "", color: "#0F766E" }] : []),
    [noise],
  );
  const columns = (): CsvColumn[] | null =>
    noise
      ? [
        { name: "frequency", unit: "Hz", data: noise.freq },
        { name: "total load-current noise", unit: DENSITY_UNIT, data: noise.density },
        ...noise.top.map((c) => ({ name: `${c.element} share`, unit: DENSITY_UNIT, data: c.density })),
      ]
      : null;
  const verdict = noise && noise.target !== null ? (noise.rms > noise.target ? "fail" : noise.rms > 0.8 * noise.target ? "warn" : "pass") : null;
  return (
    <figure className="rounded border border-hairline bg-white p-2" data-testid="plot-noise">
      <div className="flex items-center justify-between px-1 pb-1">
        <h3 className="text-[13px] font-semibold text-ink">Noise</h3>
        {noise && (
          <span className="mr-auto pl-3 text-[11px] text-ink-muted">
            {formatEng(noise.band.low, "Hz")}–{formatEng(noise.band.high, "Hz")}:{" "}
            <span className="font-mono text-ink" data-testid="noise-integrated" data-value={noise.rms}>{formatEng(noise.rms, "A")} rms</span>
            {noise.target !== null && (
              <span className={`ml-2 font-semibold ${verdict === "fail" ? "text-verdict-fail" : verdict === "warn" ? "text-verdict-warn" : "text-verdict-pass"}`} data-testid="noise-verdict">
                {verdict} (target {formatEng(noise.target, "A")})
              </span>
            )}
          </span>
        )}
        <ExportButtons name="Noise" columns={columns} png={() => ref.current?.toPng() ?? null} testId="export-noise" />
      </div>
      <UPlotChart ref={ref} options={options} data={data} height={height} under={under} markers={markers}
        ariaLabel="Load-current noise density against frequency: the total and the largest contributors" testId="uplot-noise" />
      {noise && (
        <ol className="mt-1 flex flex-wrap gap-x-3 px-1 text-[11px] text-ink-muted" aria-label="Largest noise contributors" data-testid="noise-contributors">
          {noise.ranked.slice(0, 5).map((c) => (
            <li key={c.element}><span className="text-ink">{c.element}</span> {(c.share * 100).toFixed(c.share < 0.1 ? 1 : 0)} %</li>
          ))}
        </ol>
      )}
    </figure>
  );
}
