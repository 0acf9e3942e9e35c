/** Measured against simulated, figure by figure, with the tolerance and the verdict of each row. */
import { formatQuantity } from "@/lib/units/quantity";
import { VerdictBadge, type VerdictWord } from "./VerdictBadge";

export interface ComparisonRowView {
  key: string;
  label: string;
  unit: string;
  measured: number | null;
  simulated: number | null;
  difference: number | null;
  differenceUnit: string;
  tolerance: number;
  verdict: VerdictWord;
  note?: string;
}

export function ComparisonTable({ rows, verdict, testId = "comparison-table" }: { rows: ComparisonRowView[]; verdict: VerdictWord; testId?: string }) {
  return (
    <div data-testid={testId}>
      <table className="w-full border-collapse text-sm">
        <thead>
          <tr className="border-b border-hairline text-left text-xs text-ink-muted">
            <th className="py-1 pr-2 font-medium">Figure</th>
            <th className="py-1 pr-2 text-right font-medium">Measured</th>
            <th className="py-1 pr-2 text-right font-medium">Simulated</th>
            <th className="py-1 pr-2 text-right font-medium">Difference</th>
            <th className="py-1 pr-2 text-right font-medium">Tolerance</th>
            <th className="py-1 font-medium">Verdict</th>
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr key={r.key} className="border-b border-hairline/60" data-testid={`comparison-${r.key}`}>
              <td className="py-1 pr-2">{r.label}{r.note && <span className="ml-1 text-xs text-ink-muted">({r.note})</span>}</td>
              <td className="num py-1 pr-2 text-right">{r.key === "settlingTime" && r.measured === null ? "not within the record" : formatQuantity(r.measured, r.unit)}</td>
              <td className="num py-1 pr-2 text-right">{r.key === "rms" ? "—" : r.key === "settlingTime" && r.simulated === null ? "not within the record" : formatQuantity(r.simulated, r.unit)}</td>
              <td className="num py-1 pr-2 text-right">
                {r.difference === null ? "—" : `${r.difference >= 0 && r.key !== "rms" ? "+" : ""}${r.difference.toFixed(1)} ${r.differenceUnit === "pts" ? "pts" : "%"}`}
              </td>
              <td className="num py-1 pr-2 text-right">{r.key === "rms" ? "≤ " : "± "}{r.tolerance} {r.differenceUnit === "pts" ? "pts" : "%"}</td>
              <td className="py-1"><VerdictBadge verdict={r.verdict} /></td>
            </tr>
          ))}
        </tbody>
      </table>
      <p className="mt-2 text-sm">
        Overall: <VerdictBadge verdict={verdict} testId="comparison-verdict" />{" "}
        <span className="text-xs text-ink-muted">pass within the tolerance, warn within twice it, fail beyond.</span>
      </p>
    </div>
  );
}
