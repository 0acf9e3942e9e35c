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
  return head === "parts" ? 0 : head === "load" || head === "supplies" ? 1 : 2;
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
  return rows.sort((x, y) => rank(x.path) - rank(y.path) || x.path.localeCompare(y.path));
}
