"use client";
/** Spread: tolerance Monte Carlo histograms, the worst draws and their part deviations. */
import { useMemo, useRef } from "react";
import { formatEng } from "@/lib/units/eng";
import { mergeSpread, summarizeSpread, type SpreadDraw } from "@/lib/design/studies";
import { StudyRunner } from "@/lib/workbench/studies";
import { Histogram } from "@/components/plots/Histogram";
import { OKABE_ITO } from "@/components/plots/palette";
import { ExportButtons } from "@/components/plots/ExportMenu";
import { useWb } from "../context";
import { ParamField } from "../Panels";
import { RunControls } from "./common";

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

export function SpreadTab({ runner }: { runner: StudyRunner | null }) {
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
        <RunControls kind="spread" label="Run spread" runner={runner} state={state} />
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
