/** Design checks with pass/warn/fail, the numbers and the formula used; then the cautions. */
import type { CheckRow, Caution } from "@/lib/design/checks";
import { formatQuantity } from "@/lib/units/quantity";
import { VerdictBadge } from "@/components/traces/VerdictBadge";

export function ChecksTable({ checks, cautions }: { checks: CheckRow[]; cautions: Caution[] }) {
  return (
    <div className="space-y-3" data-testid="review-checks">
      <div className="overflow-x-auto">
      <table className="w-full border-collapse text-sm">
        <thead>
          <tr className="border-b border-hairline text-left text-xs text-ink-muted">
            <th className="py-1 pr-2 font-medium">Check</th>
            <th className="py-1 pr-2 font-medium">Verdict</th>
            <th className="py-1 pr-2 text-right font-medium">Value</th>
            <th className="py-1 pr-2 text-right font-medium">Needs</th>
            <th className="py-1 font-medium">Formula</th>
          </tr>
        </thead>
        <tbody>
          {checks.map((c) => (
            <tr key={c.id} className="border-b border-hairline/60 align-top">
              <td className="py-1 pr-2">{c.label}{c.detail && <span className="block text-xs text-ink-muted">{c.detail}</span>}</td>
              <td className="py-1 pr-2"><VerdictBadge verdict={c.verdict} /></td>
              <td className="num whitespace-nowrap py-1 pr-2 text-right">{c.valueKind === "margin" ? "margin " : ""}{formatQuantity(c.value, c.unit)}</td>
              <td className="num whitespace-nowrap py-1 pr-2 text-right">{c.limitKind === "min" ? "needs ≥ " : c.limitKind === "max" ? "needs ≤ " : ""}{formatQuantity(c.limit, c.unit)}</td>
              <td className="num py-1 text-xs [overflow-wrap:anywhere]">{c.formula}</td>
            </tr>
          ))}
        </tbody>
      </table>
      </div>
      <div data-testid="review-cautions">
        <h3 className="text-sm font-semibold">Cautions</h3>
        {cautions.length === 0 ? (
          <p className="text-sm text-ink-muted">None raised for this design.</p>
        ) : (
          <ul className="list-disc pl-5 text-sm">
            {cautions.map((c) => <li key={c.id}><strong>{c.title}.</strong> {c.text}</li>)}
          </ul>
        )}
      </div>
    </div>
  );
}
