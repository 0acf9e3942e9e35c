import type { DiffRow } from "@/lib/design/diff";
import { showValue } from "./RevisionView";
import { SWEEPABLE_PARAMETERS } from "@/lib/design/parameters";
import { TEMPLATES } from "@/lib/design/templates";

/** A readable name for a scenario path ("parts.compCapacitor" → "Compensation capacitor"); the path stays as a tooltip. */
const OTHER_NAMES: Record<string, string> = {
  "load.clamp.kind": "Coil clamp",
  "networks.loadSnubber": "Load snubber",
  "networks.passSnubber": "Pass-device snubber",
};

function pathName(path: string): string {
  const p = SWEEPABLE_PARAMETERS.find((x) => x.path === path);
  if (p) return p.label;
  if (OTHER_NAMES[path]) return OTHER_NAMES[path];
  const m = /^parts\.(\w+)$/.exec(path);
  if (m) {
    for (const t of TEMPLATES) {
      const spec = t.parts.find((x) => x.key === m[1]);
      if (spec) return spec.label;
    }
  }
  return path;
}

/** Differences as a table, each row with a word for its kind (never colour alone). */
export function DiffTable({ rows, beforeLabel, afterLabel }: { rows: DiffRow[]; beforeLabel: string; afterLabel: string }) {
  if (rows.length === 0) return <p className="px-4 py-3 text-sm text-ink-muted">No differences.</p>;
  return (
    <table className="w-full text-sm" data-testid="diff">
      <thead className="border-b border-hairline text-xs uppercase tracking-wide text-ink-muted">
        <tr>
          <th scope="col" className="px-4 py-2 text-left font-medium">Value</th>
          <th scope="col" className="px-4 py-2 text-right font-medium">{beforeLabel}</th>
          <th scope="col" className="px-4 py-2 text-right font-medium">{afterLabel}</th>
          <th scope="col" className="px-4 py-2 text-left font-medium">Change</th>
        </tr>
      </thead>
      <tbody className="divide-y divide-hairline">
        {rows.map((r) => (
          <tr key={r.path}>
            <th scope="row" className="px-4 py-1.5 text-left font-normal" title={r.path}>{pathName(r.path)}</th>
            <td className="num px-4 py-1.5 text-right text-ink-muted">{showValue(r.path, r.before)}</td>
            <td className="num px-4 py-1.5 text-right">{showValue(r.path, r.after)}</td>
            <td className={`px-4 py-1.5 ${r.kind === "changed" ? "text-verdict-warn" : r.kind === "added" ? "text-verdict-pass" : "text-verdict-fail"}`}>{r.kind}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}
