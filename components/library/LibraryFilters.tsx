/** The library's filters: a plain GET form, so a filtered view is a link that can be shared and works without scripts. */
import { LIBRARY_STATUSES } from "@/lib/shared/statuses";
import { FIELD } from "@/components/shell/classes";
import { loadWords, passWords, templateWords } from "@/lib/design/words";

const STATUS_WORDS: Record<string, string> = { draft: "Draft", submitted: "Submitted", validated: "Validated", retired: "Retired" };

export interface FilterValues {
  q?: string; template?: string; status?: string; loadType?: string; passElement?: string; currentMin?: string; currentMax?: string;
}

export function LibraryFilters({ values, facets }: { values: FilterValues; facets: { templates: string[]; loadTypes: string[]; passElements: string[] } }) {
  const select = (name: keyof FilterValues, label: string, options: readonly string[], words: (v: string) => string) => (
    <label className="flex flex-col">
      <span className="text-xs text-ink-muted">{label}</span>
      <select name={name} defaultValue={values[name] ?? ""} className={FIELD} aria-label={label}>
        <option value="">any</option>
        {options.map((o) => <option key={o} value={o}>{words(o)}</option>)}
      </select>
    </label>
  );
  return (
    <form method="get" className="flex flex-wrap items-end gap-3 rounded border border-hairline bg-white p-3" role="search" aria-label="Filter the library">
      <label className="flex flex-col">
        <span className="text-xs text-ink-muted">Search</span>
        <input name="q" defaultValue={values.q ?? ""} className={`${FIELD} w-56`} placeholder="title, note, template" aria-label="Search" />
      </label>
      {select("status", "Status", LIBRARY_STATUSES, (v) => STATUS_WORDS[v] ?? v)}
      {select("template", "Template", facets.templates, templateWords)}
      {select("loadType", "Load", facets.loadTypes, loadWords)}
      {select("passElement", "Pass element", facets.passElements, passWords)}
      <label className="flex flex-col">
        <span className="text-xs text-ink-muted">Full scale from, A</span>
        <input name="currentMin" defaultValue={values.currentMin ?? ""} className={`${FIELD} num w-24`} inputMode="decimal" aria-label="Full-scale current from (A)" />
      </label>
      <label className="flex flex-col">
        <span className="text-xs text-ink-muted">to, A</span>
        <input name="currentMax" defaultValue={values.currentMax ?? ""} className={`${FIELD} num w-24`} inputMode="decimal" aria-label="Full-scale current to (A)" />
      </label>
      <button type="submit" className="rounded bg-signal px-3 py-1.5 text-sm font-medium text-white">Filter</button>
      <a href="/library" className="text-sm text-ink-muted underline">Clear</a>
    </form>
  );
}
