"use client";
/**
 * Step response and Bode plots. The worker's columns go to uPlot as they are; the previous run is drawn behind as
 * a dashed ghost at ~35 % opacity so that a change shows as a change.
 */
import { useMemo, useRef, useState } from "react";
import { stepMarks } from "@/lib/workbench/stepMarks";
import type uPlot from "uplot";
import { formatEng } from "@/lib/units/eng";
import type { BodeView, LoopView, StepView } from "@/lib/workbench/types";
import type { CsvColumn } from "@/lib/workbench/csv";
import { UPlotChart, type CursorReadout, type Marker, type Overlay, type UPlotHandle } from "./UPlotChart";
import { AXIS, GHOST_ALPHA, GHOST_DASH, OKABE_ITO } from "./palette";
import { ExportButtons } from "./ExportMenu";

const engTicks = (unit: string) => (_u: uPlot, vals: number[]) => vals.map((v) => (v == null ? "" : formatEng(v, unit, 3)));

const axis = (over: Partial<uPlot.Axis>): uPlot.Axis => ({
  stroke: AXIS.stroke, grid: AXIS.grid, ticks: AXIS.ticks, font: AXIS.font, labelFont: AXIS.labelFont, ...over,
});

const STEP_SERIES = [
  { key: "iLoad", label: "Load current", unit: "A", scale: "A", color: OKABE_ITO[0] },
  { key: "vCommand", label: "Command", unit: "V", scale: "V", color: OKABE_ITO[1] },
  { key: "vOpampOut", label: "Op-amp output", unit: "V", scale: "V", color: OKABE_ITO[2] },
  { key: "vPass", label: "Collector/drain", unit: "V", scale: "V", color: OKABE_ITO[3] },
] as const;

type StepKey = (typeof STEP_SERIES)[number]["key"];

/** The command drawn as the current it asks for (command × the ideal transconductance), on the current axis. */
const COMMAND_AS_CURRENT = { label: "Command as current", color: OKABE_ITO[4] };

/** Ink at low weight for the step's marks (design language). */
const MARK_INK = "#5B6472";

/** The small-signal step's trace colour (Okabe–Ito sky blue, beside the load current's blue). */
const SMALL_SIGNAL_COLOR = OKABE_ITO[5];

function PlotHeader({ title, children }: { title: string; children?: React.ReactNode }) {
  return (
    <div className="flex flex-wrap items-center justify-between gap-x-2 gap-y-1 px-1 pb-1">
      <h3 className="text-[13px] font-semibold text-ink">{title}</h3>
      {children}
    </div>
  );
}

/** A bench capture drawn over the simulated load current (already aligned on its time axis), in A. */
export interface MeasuredOverlay { time: Float64Array; values: Float64Array; label: string }

/** The bench capture's colour (Okabe–Ito vermilion, as in the bench comparison). */
const MEASURED_COLOR = OKABE_ITO[1];

export interface StepPlotProps {
  step: StepView | null;
  ghost: StepView | null;
  height?: number;
  title?: string;
  /** the template has a pass transistor (its collector/drain is drawn); the Howland pump has none */
  hasPass?: boolean;
  /** ideal transconductance, A/V: the command is drawn as the current it asks for (null: not drawn) */
  transconductance?: number | null;
  /** the latest bench capture, aligned, drawn over the load current */
  measured?: MeasuredOverlay | null;
}

export function StepPlot({ step, ghost, measured = null, height = 230, title = "Step response", hasPass = true, transconductance = null }: StepPlotProps) {
  const ref = useRef<UPlotHandle>(null);
  const [commandAsCurrent, setCommandAsCurrent] = useState(true);
  const withCommandCurrent = commandAsCurrent && transconductance !== null && Number.isFinite(transconductance);
  const series = useMemo(() => STEP_SERIES.filter((s) => hasPass || s.key !== "vPass"), [hasPass]);
  const options = useMemo<Omit<uPlot.Options, "width" | "height">>(() => ({
    legend: { live: true },
    cursor: { sync: { key: "step" } },
    scales: { x: { time: false }, A: { auto: true }, V: { auto: true } },
    series: [
      { label: "t", value: (_u, v) => (v == null ? "—" : formatEng(v, "s")) },
      ...series.map((s) => ({
        label: s.label,
        scale: s.scale,
        stroke: s.color,
        width: s.key === "iLoad" ? 2 : 1.4,
        value: (_u: uPlot, v: number | null) => (v == null ? "—" : formatEng(v, s.unit)),
      })),
      ...(withCommandCurrent
        ? [{ label: COMMAND_AS_CURRENT.label, scale: "A", stroke: COMMAND_AS_CURRENT.color, width: 1.2, dash: [6, 3], value: (_u: uPlot, v: number | null) => (v == null ? "—" : formatEng(v, "A")) }]
        : []),
    ],
    axes: [
      axis({ values: engTicks("s") }),
      axis({ scale: "A", values: engTicks("A"), size: 58 }),
      axis({ scale: "V", side: 1, values: engTicks("V"), size: 62, grid: { show: false } }),
    ],
  }), [series, withCommandCurrent]);
  const data = useMemo<uPlot.AlignedData>(() => {
    if (!step) return [[], ...series.map(() => []), ...(withCommandCurrent ? [[]] : [])];
    const cols: ArrayLike<number>[] = [step.time, ...series.map((s) => step[s.key as StepKey])];
    if (withCommandCurrent) {
      const c = new Float64Array(step.vCommand.length);
      for (let i = 0; i < c.length; i++) c[i] = step.vCommand[i]! * transconductance!;
      cols.push(c);
    }
    return cols as uPlot.AlignedData;
  }, [step, series, withCommandCurrent, transconductance]);
  const under = useMemo<Overlay[]>(() => {
    const list: Overlay[] = ghost
      ? series.map((s) => ({ x: ghost.time, y: ghost[s.key as StepKey], stroke: s.color, scale: s.scale, dash: GHOST_DASH, alpha: GHOST_ALPHA }))
      : [];
    // the linearised circuit's step, dotted in the load current's colour
    if (step?.small) list.push({ x: step.small.time, y: step.small.iLoad, stroke: SMALL_SIGNAL_COLOR, scale: "A", dash: [2, 3], alpha: 0.8, width: 1.4 });
    if (measured) list.push({ x: measured.time, y: measured.values, stroke: MEASURED_COLOR, scale: "A", alpha: 0.85, width: 1.2 });
    return list;
  }, [ghost, step, series, measured]);
  const marks = useMemo(() => (step ? stepMarks(step.time, step.iLoad, step.metrics) : null), [step]);
  const markers = useMemo<Marker[]>(() => {
    if (!marks) return [];
    const m: Marker[] = [];
    if (marks.band) {
      m.push({ y: marks.band.high, scale: "A", label: "+1 %", color: MARK_INK });
      m.push({ y: marks.band.low, scale: "A", label: "−1 %", color: MARK_INK });
    }
    const y = (t: number) => step!.iLoad[Math.max(0, Math.min(step!.time.length - 1, lowerIndex(step!.time, t)))]!;
    if (marks.t10 !== null) m.push({ x: marks.t10, y: y(marks.t10), scale: "A", label: "10 %", color: MARK_INK });
    if (marks.t90 !== null) m.push({ x: marks.t90, y: y(marks.t90), scale: "A", label: "90 %", color: MARK_INK });
    if (marks.peak) m.push({ x: marks.peak.t, y: marks.peak.value, scale: "A", label: `peak ${formatEng(marks.peak.value, "A")}`, color: MARK_INK });
    return m;
  }, [marks, step]);
  const readout = useMemo<CursorReadout>(() => ({
    x: { name: "t", unit: "s" },
    series: [{ index: 1, name: "I", unit: "A" }],
  }), []);
  const columns = (): CsvColumn[] | null =>
    step ? [{ name: "time", unit: "s", data: step.time }, ...series.map((s) => ({ name: s.label, unit: s.unit, data: step[s.key as StepKey] }))] : null;
  return (
    <figure className="rounded border border-hairline bg-white p-2" data-testid="plot-step" data-marks={marks ? [marks.t10 !== null ? "10" : "", marks.t90 !== null ? "90" : "", marks.peak ? "peak" : "", marks.band ? "band" : ""].filter(Boolean).join(" ") : ""}
      data-series={[...series.map((s) => s.label), ...(withCommandCurrent ? [COMMAND_AS_CURRENT.label] : [])].join("|")}>
      <PlotHeader title={title}>
        {step?.small && (
          <span className="mr-auto pl-3 text-[11px] text-ink-muted" data-testid="small-signal-legend">
            <span aria-hidden className="mr-1 inline-block w-5 border-t-2 border-dotted align-middle" style={{ borderColor: SMALL_SIGNAL_COLOR }} />
            small-signal step (linearised circuit): {step.small.grows ? "grows — the loop is unstable" : `overshoot ${step.small.metrics.overshootPct.toFixed(1)} %`}
          </span>
        )}
        {measured && (
          <span className="pl-3 text-[11px] text-ink-muted" data-testid="measured-legend">
            <span aria-hidden className="mr-1 inline-block w-5 border-t-2 align-middle" style={{ borderColor: MEASURED_COLOR }} />
            bench: {measured.label}
          </span>
        )}
        {transconductance !== null && (
          <label className="mr-2 flex items-center gap-1 text-[11px] text-ink-muted">
            <input type="checkbox" className="accent-signal" checked={commandAsCurrent} onChange={(e) => setCommandAsCurrent(e.target.checked)} data-testid="toggle-command-current" />
            Command as current
          </label>
        )}
        <ExportButtons name={title} columns={columns} png={() => ref.current?.toPng() ?? null} testId="export-step" />
      </PlotHeader>
      <UPlotChart ref={ref} options={options} data={data} height={height} under={under} markers={markers} readout={readout}
        ariaLabel={`${title}: load current, command, op-amp output${hasPass ? " and collector voltage" : ""} against time`} testId="uplot-step" />
    </figure>
  );
}

/** Index of the last sample at or before t in an ascending column. */
function lowerIndex(xs: ArrayLike<number>, t: number): number {
  let lo = 0, hi = xs.length - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (xs[mid]! <= t) lo = mid;
    else hi = mid;
  }
  return lo;
}

export interface BodeProps {
  title: string;
  bode: BodeView | null;
  ghost: BodeView | null;
  magUnit: string;
  /** cursor sync key, and a testid stem */
  id: string;
  loop?: LoopView | null;
  /** a second response on the same frequencies (the loop gain plot's local op-amp loop), drawn thinner */
  second?: { label: string; bode: BodeView | null } | null;
  height?: number;
  extraMarkers?: Marker[];
}

export function BodePlot({ title, bode, ghost, magUnit, id, loop, second, height = 150, extraMarkers }: BodeProps) {
  const magRef = useRef<UPlotHandle>(null);
  const phRef = useRef<UPlotHandle>(null);
  const secondLabel = second?.label ?? null;
  // the second response shares the first one's frequency column (same sweep), else it is left out
  const secondBode = second?.bode && bode && second.bode.freq.length === bode.freq.length ? second.bode : null;
  const mainLabel = loop && secondLabel ? "current loop" : title;
  const mk = (scale: "mag" | "ph"): Omit<uPlot.Options, "width" | "height"> => ({
    legend: { live: true },
    cursor: { sync: { key: id } },
    scales: { x: { time: false, distr: 3 }, [scale]: { auto: true } },
    series: [
      { label: "f", value: (_u, v) => (v == null ? "—" : formatEng(v, "Hz")) },
      {
        label: scale === "mag" ? `|${mainLabel}|` : `∠${mainLabel}`,
        scale,
        stroke: scale === "mag" ? OKABE_ITO[0] : OKABE_ITO[1],
        width: 1.8,
        value: (_u, v) => (v == null ? "—" : scale === "mag" ? `${v.toFixed(1)} ${magUnit}` : `${v.toFixed(1)}°`),
      },
      ...(secondLabel
        ? [{
          label: scale === "mag" ? `|${secondLabel}|` : `∠${secondLabel}`,
          scale,
          stroke: scale === "mag" ? OKABE_ITO[5] : OKABE_ITO[4],
          width: 1.2,
          dash: [2, 3],
          value: (_u: uPlot, v: number | null) => (v == null ? "—" : scale === "mag" ? `${v.toFixed(1)} ${magUnit}` : `${v.toFixed(1)}°`),
        }]
        : []),
    ],
    axes: [
      axis({ values: engTicks("Hz"), space: 50 }),
      axis({ scale, size: 52, space: 22, ...(scale === "ph" ? { incrs: [15, 30, 45, 90, 180, 360] } : {}), values: (_u, vals) => vals.map((v) => (v == null ? "" : scale === "mag" ? `${v}` : `${v}°`)), label: scale === "mag" ? magUnit : "phase", labelSize: 14 }),
    ],
  });
  const magOpts = useMemo(() => mk("mag"), [id, title, magUnit, secondLabel, mainLabel]); // eslint-disable-line react-hooks/exhaustive-deps
  const phOpts = useMemo(() => mk("ph"), [id, title, magUnit, secondLabel, mainLabel]); // eslint-disable-line react-hooks/exhaustive-deps
  const magData = useMemo<uPlot.AlignedData>(() => {
    if (!bode) return secondLabel ? [[], [], []] : [[], []];
    if (!secondLabel) return [bode.freq, bode.magDb];
    return [bode.freq, bode.magDb, secondBode ? secondBode.magDb : new Float64Array(bode.freq.length).fill(NaN)];
  }, [bode, secondBode, secondLabel]);
  const phData = useMemo<uPlot.AlignedData>(() => {
    if (!bode) return secondLabel ? [[], [], []] : [[], []];
    if (!secondLabel) return [bode.freq, bode.phaseDeg];
    return [bode.freq, bode.phaseDeg, secondBode ? secondBode.phaseDeg : new Float64Array(bode.freq.length).fill(NaN)];
  }, [bode, secondBode, secondLabel]);
  const magGhost = useMemo<Overlay[]>(() => (ghost ? [{ x: ghost.freq, y: ghost.magDb, stroke: OKABE_ITO[0], scale: "mag", dash: GHOST_DASH, alpha: GHOST_ALPHA }] : []), [ghost]);
  const phGhost = useMemo<Overlay[]>(() => (ghost ? [{ x: ghost.freq, y: ghost.phaseDeg, stroke: OKABE_ITO[1], scale: "ph", dash: GHOST_DASH, alpha: GHOST_ALPHA }] : []), [ghost]);
  const magMarkers = useMemo<Marker[]>(() => {
    const m: Marker[] = [...(extraMarkers ?? [])];
    if (loop) {
      m.push({ y: 0, scale: "mag", label: "0 dB", color: "#5B6472" });
      // every 0 dB crossing of the current loop; the one the margin is taken at carries the label
      for (const f of loop.crossovers) {
        const main = f === loop.crossoverHz;
        const label = main
          ? `crossover ${formatEng(f, "Hz")}${loop.crossovers.length > 1 ? ` (least margin of ${loop.crossovers.length})` : ""}`
          : formatEng(f, "Hz");
        m.push({ x: f, label, color: main ? "#0F766E" : "#5B6472" });
      }
    }
    return m;
  }, [loop, extraMarkers]);
  const phMarkers = useMemo<Marker[]>(() => {
    if (!loop) return [];
    const m: Marker[] = [{ y: -180, scale: "ph", label: "−180°", color: "#B91C1C" }];
    if (loop.crossoverHz !== null) {
      m.push({ x: loop.crossoverHz, label: loop.phaseMarginDeg !== null ? `phase margin ${loop.phaseMarginDeg.toFixed(1)}°` : "", color: "#0F766E" });
    }
    return m;
  }, [loop]);
  const columns = (): CsvColumn[] | null =>
    bode
      ? [
        { name: "frequency", unit: "Hz", data: bode.freq },
        { name: `${mainLabel} magnitude`, unit: magUnit, data: bode.magDb },
        { name: `${mainLabel} phase`, unit: "deg", data: bode.phaseDeg },
        ...(secondBode && secondLabel
          ? [{ name: `${secondLabel} magnitude`, unit: magUnit, data: secondBode.magDb }, { name: `${secondLabel} phase`, unit: "deg", data: secondBode.phaseDeg }]
          : []),
      ]
      : null;
  return (
    <figure className="rounded border border-hairline bg-white p-2" data-testid={`plot-${id}`}>
      <PlotHeader title={title}>
        <ExportButtons name={title} columns={columns} png={() => magRef.current?.toPng() ?? null} testId={`export-${id}`} />
      </PlotHeader>
      <UPlotChart ref={magRef} options={magOpts} data={magData} under={magGhost} markers={magMarkers} height={height} ariaLabel={`${title} magnitude against frequency`} testId={`uplot-${id}-mag`}
        readout={{ x: { name: "f", unit: "Hz" }, series: [{ index: 1, name: "dB", unit: magUnit, plain: true }] }} />
      <UPlotChart ref={phRef} options={phOpts} data={phData} under={phGhost} markers={phMarkers} height={Math.round(height * 0.8)} ariaLabel={`${title} phase against frequency`} testId={`uplot-${id}-phase`}
        readout={{ x: { name: "f", unit: "Hz" }, series: [{ index: 1, name: "phase", unit: "°", plain: true }] }} />
    </figure>
  );
}
