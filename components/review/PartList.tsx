/**
 * Part values with their tolerance and the IEC 60063 series that tolerance belongs to: whether each value is on
 * that series, or the nearest value on it.
 */
import type { Scenario } from "@/lib/design/schema";
import { TEMPLATES } from "@/lib/design/templates";
import { clampText, networkParts } from "@/lib/design/networks";
import { nearestE, type ESeriesName } from "@/lib/design/eseries";
import { formatEng } from "@/lib/units/eng";
import { formatQuantity } from "@/lib/units/quantity";

/** The series whose tolerance covers a part's tolerance (IEC 60063: E192 0.5 %, E96 1 %, E48 2 %, E24 5 %, E12 10 %, E6 20 %). */
export function seriesForTolerance(tol: number): ESeriesName {
  if (tol <= 0.005) return "E192";
  if (tol <= 0.01) return "E96";
  if (tol <= 0.02) return "E48";
  if (tol <= 0.05) return "E24";
  if (tol <= 0.1) return "E12";
  return "E6";
}

export function PartList({ scenario }: { scenario: Scenario }) {
  const info = TEMPLATES.find((t) => t.id === scenario.template);
  const t = scenario.tolerances;
  const rows = (info?.parts ?? []).map((p) => {
    const value = scenario.parts[p.key] as number | null;
    const tol = p.key === "senseResistor" ? t.sense : p.kind === "capacitor" ? t.capacitor : t.resistor;
    const series = seriesForTolerance(tol);
    let eText = "—";
    if (typeof value === "number" && value > 0) {
      const near = nearestE(value, series);
      const off = Math.abs(near - value) / value;
      eText = off < 1e-6 ? `on ${series}` : `nearest ${series}: ${formatEng(near, p.unit)} (${((near / value - 1) * 100).toFixed(1)} %)`;
    }
    return { key: p.key as string, label: p.label, value, unit: p.unit, tol, eText };
  });
  // the fitted networks, after the template's own parts (named as their netlist elements are)
  for (const n of networkParts(scenario)) {
    const tol = n.unit === "F" ? t.capacitor : t.resistor;
    const series = seriesForTolerance(tol);
    const near = nearestE(n.value, series);
    const off = Math.abs(near - n.value) / n.value;
    rows.push({
      key: n.element, label: n.label, value: n.value, unit: n.unit, tol,
      eText: off < 1e-6 ? `on ${series}` : `nearest ${series}: ${formatEng(near, n.unit)} (${((near / n.value - 1) * 100).toFixed(1)} %)`,
    });
  }
  return (
    <div className="space-y-3" data-testid="review-parts">
      <table className="w-full border-collapse text-sm">
        <thead>
          <tr className="border-b border-hairline text-left text-xs text-ink-muted">
            <th className="py-1 pr-2 font-medium">Part</th>
            <th className="py-1 pr-2 text-right font-medium">Value</th>
            <th className="py-1 pr-2 text-right font-medium">Tolerance</th>
            <th className="py-1 font-medium">E-series (IEC 60063)</th>
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr key={r.key} className="border-b border-hairline/60">
              <td className="py-1 pr-2">{r.label}</td>
              <td className="num py-1 pr-2 text-right">{r.value === null ? "none" : formatQuantity(r.value, r.unit)}</td>
              <td className="num py-1 pr-2 text-right">± {(r.tol * 100).toFixed(r.tol < 0.01 ? 2 : 1)} %</td>
              <td className="py-1 text-xs">{r.eText}</td>
            </tr>
          ))}
        </tbody>
      </table>
      <dl className="grid grid-cols-[max-content_1fr] gap-x-4 gap-y-1 text-sm">
        <dt className="text-ink-muted">Op-amp</dt><dd>{scenario.opamp.preset} — GBW {formatEng(scenario.opamp.GBW, "Hz")}, Aol {formatEng(scenario.opamp.Aol, "")}, offset ≤ {formatEng(scenario.opamp.vosMax, "V")}</dd>
        <dt className="text-ink-muted">Pass device</dt><dd>{scenario.pass.preset} ({scenario.pass.kind}) — {formatEng(scenario.pass.vMax, "V")}, {formatEng(scenario.pass.iMax, "A")}, {formatEng(scenario.pass.pMax, "W")}</dd>
        <dt className="text-ink-muted">Load</dt><dd>{scenario.load.kind}, {formatEng(scenario.load.resistance, "Ω")}{scenario.load.inductance > 0 ? `, ${formatEng(scenario.load.inductance, "H")}` : ""}{scenario.load.cable.length > 0 ? `, ${scenario.load.cable.length} m of cable` : ""}{scenario.load.kind === "coil" ? `; clamp: ${clampText(scenario)}` : ""}</dd>
        <dt className="text-ink-muted">Supplies</dt><dd>load {formatEng(scenario.supplies.load, "V")}; op-amp {formatEng(scenario.supplies.opampPositive, "V")} / {formatEng(scenario.supplies.opampNegative, "V")}</dd>
        <dt className="text-ink-muted">Stimulus</dt><dd>{scenario.stimulus.kind}: {formatEng(scenario.stimulus.commandLow, "V")} → {formatEng(scenario.stimulus.commandHigh, "V")} at {formatEng(scenario.stimulus.stepTime, "s")} (full scale {formatEng(scenario.stimulus.commandFullScale, "V")})</dd>
      </dl>
    </div>
  );
}
