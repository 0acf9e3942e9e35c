"use client";
/** Sweep: one step and one Bode curve per value, and each metric against the parameter. */
import { useMemo } from "react";
import { formatEng } from "@/lib/units/eng";
import { StudyRunner } from "@/lib/workbench/studies";
import { type Overlay } from "@/components/plots/UPlotChart";
import { OKABE_ITO } from "@/components/plots/palette";
import { useWb } from "../context";
import { mergeSweep } from "@/lib/design/studies";
import { TOOL_BUTTON_PRIMARY as PRIMARY } from "@/components/shell/classes";
import { paramInfo, StaleNote, Progress, AxisEditor, OverlayChart } from "./common";

export function SweepTab({ runner }: { runner: StudyRunner | null }) {
  const state = useWb((s) => s.studies.sweep);
  const axisPath = useWb((s) => s.scenario.studies.sweep.path);
  const info = paramInfo(axisPath);
  const merged = useMemo(() => (state.chunks.length ? mergeSweep(state.chunks) : null), [state.chunks]);
  const colour = (i: number) => OKABE_ITO[i % OKABE_ITO.length]!;
  const stepOverlays = useMemo<Overlay[]>(() => merged?.points.filter((p) => p.step).map((p) => ({ x: p.step!.time, y: p.step!.iLoad, stroke: colour(p.index), scale: "y", width: 1.5 })) ?? [], [merged]);
  const bodeOverlays = useMemo<Overlay[]>(() => merged?.points.filter((p) => p.loop).map((p) => ({ x: p.loop!.freq, y: p.loop!.magDb, stroke: colour(p.index), scale: "y", width: 1.5 })) ?? [], [merged]);
  const metricOverlays = useMemo<Overlay[]>(() => merged ? [{ x: merged.values, y: merged.phaseMarginDeg, stroke: OKABE_ITO[0], scale: "y", width: 2 }] : [], [merged]);
  const osOverlays = useMemo<Overlay[]>(() => merged ? [
    { x: merged.values, y: merged.overshootPct, stroke: OKABE_ITO[1], scale: "y", width: 2 },
    { x: merged.values, y: merged.smallOvershootPct, stroke: OKABE_ITO[1], scale: "y", width: 2, dash: [5, 4] },
  ] : [], [merged]);
  const noiseOverlays = useMemo<Overlay[]>(() => merged ? [{ x: merged.values, y: merged.noiseRms, stroke: OKABE_ITO[2], scale: "y", width: 2 }] : [], [merged]);
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
              <OverlayChart title={`Overshoot against ${info.label.toLowerCase()}: full step (solid), small-signal step (dashed)`} overlays={osOverlays} xLog={xLog} xUnit={info.unit} yUnit="%" scale="y" testId="sweep-os" />
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
