/**
 * Read and write a scenario field by its dotted path ("parts.compCapacitor", "load.cable.length") without
 * mutating: `setPath` copies each object along the path, so the store's history keeps the old scenario intact.
 */

export function getPath(obj: unknown, path: string): unknown {
  let cur: unknown = obj;
  for (const key of path.split(".")) {
    if (cur === null || typeof cur !== "object") return undefined;
    cur = (cur as Record<string, unknown>)[key];
  }
  return cur;
}

export function setPath<T>(obj: T, path: string, value: unknown): T {
  const keys = path.split(".");
  const write = (node: unknown, i: number): unknown => {
    if (node === null || typeof node !== "object") throw new TypeError(`setPath: "${keys.slice(0, i).join(".")}" is not an object`);
    const rec = node as Record<string, unknown>;
    const key = keys[i]!;
    if (!(key in rec)) throw new RangeError(`setPath: no field "${keys.slice(0, i + 1).join(".")}"`);
    const next = i === keys.length - 1 ? value : write(rec[key], i + 1);
    if (Object.is(rec[key], next)) return node;
    return Array.isArray(node) ? Object.assign([...node], { [key]: next }) : { ...rec, [key]: next };
  };
  return write(obj, 0) as T;
}
