"use client";
/** Compensate: the E-series compensation capacitor (and load snubber) search, with Apply. */
import { useEffect, useMemo, useState } from "react";
import { formatEng } from "@/lib/units/eng";
import { type SnubberTuneResult } from "@/lib/design/studies";
import { E_SERIES_NAMES, type ESeriesName } from "@/lib/design/eseries";
import { setPath } from "@/lib/workbench/paths";
import { StudyRunner } from "@/lib/workbench/studies";
import { useWb, useWbStore } from "../context";
import { ParamField } from "../Panels";
import { TOOL_BUTTON_PRIMARY as PRIMARY } from "@/components/shell/classes";
import { RunControls } from "./common";

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
              <td>{t.worstOvershootPct === null ? "—" : Number.isFinite(t.worstOvershootPct) ? `${t.worstOvershootPct.toFixed(1)} %` : "grows"}</td>
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

export function CompensateTab({ runner }: { runner: StudyRunner | null }) {
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
        <RunControls kind="compensate" label="Find compensation" runner={runner} state={state} />
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
