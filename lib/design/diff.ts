/**
 * Differences between two scenario bodies as rows of dotted paths ("parts.senseResistor"), part values first.
 * Pure: the revision history's comparison and the save-conflict view (components/scenarios/SaveConflict.tsx, shown
 * by the workbench's save control and by the JSON save form) both list these rows.
 */
export type Scalar = string | number | boolean | null;

export interface DiffRow {
  path: string;
  before: Scalar | undefined;
  after: Scalar | undefined;
  kind: "changed" | "added" | "removed";
}

/** Flattens nested objects and arrays to dotted paths with scalar leaves. */
export function flatten(value: unknown, prefix = "", out: Map<string, Scalar> = new Map()): Map<string, Scalar> {
  if (value === null || typeof value !== "object") {
    out.set(prefix || "(root)", value === undefined ? null : (value as Scalar));
    return out;
  }
  const entries = Array.isArray(value) ? value.map((v, i) => [String(i), v] as const) : Object.entries(value as Record<string, unknown>);
  if (entries.length === 0) out.set(prefix || "(root)", Array.isArray(value) ? "[]" : "{}");
  for (const [k, v] of entries) flatten(v, prefix ? `${prefix}.${k}` : k, out);
  return out;
}

function rank(path: string): number {
  const head = path.split(".")[0];
  return head === "parts" || head === "networks" ? 0 : head === "load" || head === "supplies" ? 1 : 2;
}

/**
 * A network switched on or off is an object against null: rather than a removed "networks.loadSnubber" row beside
 * added "networks.loadSnubber.resistance" rows, list each of its values, "none" (null) on the side it was off.
 */
function foldNullObjects(rows: DiffRow[]): DiffRow[] {
  const nulls = new Map<string, DiffRow>();
  for (const r of rows) if ((r.kind === "removed" && r.before === null) || (r.kind === "added" && r.after === null)) nulls.set(r.path, r);
  if (nulls.size === 0) return rows;
  const out: DiffRow[] = [];
  const folded = new Set<string>();
  for (const r of rows) {
    const parent = r.path.slice(0, Math.max(0, r.path.lastIndexOf(".")));
    const n = nulls.get(parent);
    if (n && r.kind !== n.kind && r.kind !== "changed") {
      folded.add(parent);
      out.push(r.kind === "added" ? { ...r, before: null, kind: "added" } : { ...r, after: null, kind: "removed" });
    } else {
      out.push(r);
    }
  }
  return out.filter((r) => !folded.has(r.path));
}

export function diffBodies(before: unknown, after: unknown): DiffRow[] {
  const a = flatten(before);
  const b = flatten(after);
  const rows: DiffRow[] = [];
  for (const [path, va] of a) {
    if (!b.has(path)) rows.push({ path, before: va, after: undefined, kind: "removed" });
    else if (!Object.is(va, b.get(path))) rows.push({ path, before: va, after: b.get(path), kind: "changed" });
  }
  for (const [path, vb] of b) if (!a.has(path)) rows.push({ path, before: undefined, after: vb, kind: "added" });
  return foldNullObjects(rows).sort((x, y) => rank(x.path) - rank(y.path) || x.path.localeCompare(y.path));
}
