import { flatten, type Scalar } from "@/lib/design/diff";
import { formatEng } from "@/lib/units/eng";
import { TEMPLATES } from "@/lib/design/templates";

/** The template's title for its id, or the id itself when it is not one of ours. */
export function templateTitle(id: unknown): string {
  return TEMPLATES.find((t) => t.id === id)?.title ?? String(id ?? "");
}

const SECTION_NAMES: Record<string, string> = {
  opamp: "Op-amp", pass: "Pass device", load: "Load", supplies: "Supplies", stimulus: "Stimulus",
  thermal: "Thermal", studies: "Studies", tolerances: "Tolerances", general: "General",
};

/** Unit of a part value from its name (resistors Ω, capacitors F, inductors H), else none. */
export function unitFor(path: string): string {
  const leaf = path.split(".").pop() ?? "";
  if (/resist/i.test(leaf) || /^divider/i.test(leaf) || /^howlandR\d/.test(leaf)) return "Ω";
  if (/capacit/i.test(leaf)) return "F";
  if (/inductance/i.test(leaf)) return "H";
  if (/voltage$/i.test(leaf)) return "V";
  return "";
}

export function showValue(path: string, v: Scalar | undefined): string {
  if (v === undefined) return "—";
  // a network that is off is stored as null
  if (v === null) return "none";
  if (typeof v === "number") {
    const unit = unitFor(path);
    return unit ? formatEng(v, unit) : String(v);
  }
  return String(v);
}

/** A revision's content, read-only: part values first, then everything else grouped by section. */
export function RevisionView({ body }: { body: unknown }) {
  const flat = [...flatten(body)];
  // The template's parts in its own order and with its own labels; values the template does not use are kept
  // (they are part of the stored revision) but folded away under "Not used by this template".
  const templateId = body && typeof body === "object" ? (body as { template?: unknown }).template : undefined;
  const specs = TEMPLATES.find((t) => t.id === templateId)?.parts ?? [];
  const byPath = new Map(flat.filter(([p]) => p.startsWith("parts.")).map(([p, v]) => [p, v] as const));
  const parts: [string, Scalar, string][] = specs.length
    ? specs.filter((sp) => byPath.has(`parts.${sp.key}`)).map((sp) => [`parts.${sp.key}`, byPath.get(`parts.${sp.key}`)!, sp.label])
    : [...byPath].map(([p, v]) => [p, v, p.slice(6)]);
  const shown = new Set(parts.map(([p]) => p));
  const unused = [...byPath].filter(([p]) => !shown.has(p));
  const rest = flat.filter(([p]) => !p.startsWith("parts."));
  const sections = new Map<string, [string, Scalar][]>();
  for (const [p, v] of rest) {
    const head = p.includes(".") ? p.split(".")[0]! : "general";
    sections.set(head, [...(sections.get(head) ?? []), [p, v]]);
  }
  if (unused.length) sections.set("unused", unused);
  return (
    <div className="space-y-4">
      <section aria-labelledby="pv-title" className="rounded border border-hairline bg-white">
        <h2 id="pv-title" className="border-b border-hairline px-4 py-2 text-sm font-semibold">Part values</h2>
        {parts.length === 0 ? (
          <p className="px-4 py-3 text-sm text-ink-muted">This revision has no part values yet.</p>
        ) : (
          <table className="w-full text-sm">
            <tbody className="divide-y divide-hairline">
              {parts.map(([p, v, label]) => (
                <tr key={p}>
                  <th scope="row" className="px-4 py-1.5 text-left font-normal text-ink-muted" title={p}>{label}</th>
                  <td className="num px-4 py-1.5 text-right">{showValue(p, v)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </section>
      {[...sections].map(([name, rows]) => (
        <details key={name} className="rounded border border-hairline bg-white">
          <summary className="cursor-pointer px-4 py-2 text-sm font-semibold">{name === "unused" ? "Not used by this template" : SECTION_NAMES[name] ?? name}</summary>
          <table className="w-full text-sm">
            <tbody className="divide-y divide-hairline">
              {rows.map(([p, v]) => (
                <tr key={p}>
                  <th scope="row" className="px-4 py-1 text-left font-normal text-ink-muted">{p}</th>
                  <td className="num px-4 py-1 text-right">{showValue(p, v)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </details>
      ))}
    </div>
  );
}
