/** Leaf values that differ between two scenarios (or any JSON values), by dotted path, in key order. */
export function scenarioDiff(a: unknown, b: unknown, prefix = ""): { path: string; mine: unknown; theirs: unknown }[] {
  const isObj = (x: unknown): x is Record<string, unknown> => x !== null && typeof x === "object" && !Array.isArray(x);
  if (isObj(a) && isObj(b)) {
    const keys = [...new Set([...Object.keys(a), ...Object.keys(b)])];
    return keys.flatMap((k) => scenarioDiff(a[k], b[k], prefix ? `${prefix}.${k}` : k));
  }
  return JSON.stringify(a) === JSON.stringify(b) ? [] : [{ path: prefix, mine: a, theirs: b }];
}
