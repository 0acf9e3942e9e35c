/** The library's entries: each row points to an immutable revision and shows its key figures and evidence. */
import Link from "next/link";
import { formatQuantity } from "@/lib/units/quantity";
import type { LibraryEntrySummary } from "@/lib/db/library";
import { StatusBadge } from "./StatusBadge";
import { VerdictBadge } from "@/components/traces/VerdictBadge";
import { templateTitle } from "@/components/scenarios/RevisionView";
import { loadWords, passWords } from "@/lib/design/words";
import { formatDate } from "@/lib/shared/dates";

function worst(e: LibraryEntrySummary): "pass" | "warn" | "fail" | null {
  const v = e.evidence.comparisons.map((c) => c.verdict);
  if (!v.length) return null;
  return v.includes("fail") ? "fail" : v.includes("warn") ? "warn" : "pass";
}

export function LibraryTable({ entries }: { entries: LibraryEntrySummary[] }) {
  if (entries.length === 0) {
    return <p className="rounded border border-hairline bg-white px-4 py-6 text-sm text-ink-muted" data-testid="library-empty">No entries match. Designers submit a revision from its Bench traces page.</p>;
  }
  return (
    <div className="overflow-x-auto rounded border border-hairline bg-white">
      <table className="w-full border-collapse text-sm" data-testid="library-table">
        <thead>
          <tr className="border-b border-hairline text-left text-xs text-ink-muted">
            <th className="px-3 py-2 font-medium">Entry</th>
            <th className="px-3 py-2 font-medium">Status</th>
            <th className="px-3 py-2 font-medium">Template · pass · load</th>
            <th className="px-3 py-2 text-right font-medium">Load current</th>
            <th className="px-3 py-2 text-right font-medium">Overshoot</th>
            <th className="px-3 py-2 text-right font-medium">Settling</th>
            <th className="px-3 py-2 font-medium">Evidence</th>
            <th className="px-3 py-2 font-medium">Validated by</th>
          </tr>
        </thead>
        <tbody>
          {entries.map((e) => (
            <tr key={e.id} className="border-b border-hairline/60 align-top" data-testid="library-row">
              <td className="px-3 py-2">
                <Link href={`/library/${e.id}`} className="font-medium text-signal hover:underline">{e.title}</Link>
                <span className="block text-xs text-ink-muted">revision {e.revisionNumber}{e.submittedByName ? ` · submitted by ${e.submittedByName}` : ""}</span>
              </td>
              <td className="px-3 py-2"><StatusBadge status={e.status} />{e.overrideReason && e.status === "validated" && <span className="ml-1 block text-xs font-medium text-verdict-fail" data-testid="library-override" title={`Override: ${e.overrideReason}`}>over failing evidence</span>}</td>
              <td className="px-3 py-2 text-xs">{templateTitle(e.template)} · {e.passElement ? passWords(e.passElement) : "—"} · {e.loadType ? loadWords(e.loadType) : "—"}</td>
              <td className="num whitespace-nowrap px-3 py-2 text-right">{e.currentMax === null ? "—" : `${formatQuantity(e.currentMin ?? 0, "A")} – ${formatQuantity(e.currentMax, "A")}`}</td>
              <td className="num px-3 py-2 text-right">{formatQuantity(e.keyFigures.overshootPct, "%")}</td>
              <td className="num whitespace-nowrap px-3 py-2 text-right">{formatQuantity(e.keyFigures.settlingTime, "s")}</td>
              <td className="px-3 py-2 text-xs">{e.evidence.traceIds.length} trace{e.evidence.traceIds.length === 1 ? "" : "s"} <VerdictBadge verdict={worst(e)} /></td>
              <td className="px-3 py-2 text-xs">{e.validatedByName ? `${e.validatedByName}, ${e.validatedAt ? formatDate(e.validatedAt) : "—"}` : "—"}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
