/**
 * IEC 60063 preferred-number series E6 … E192. E3–E24 have two significant digits and depart from the rounded
 * geometric formula in places, so E24 is a table; E48–E192 are round(10^(i/N), 2) except where the standard
 * chose otherwise (E192: 9.20 instead of 9.19).
 */
export type ESeriesName = "E6" | "E12" | "E24" | "E48" | "E96" | "E192";

export const E_SERIES_NAMES: readonly ESeriesName[] = ["E6", "E12", "E24", "E48", "E96", "E192"];

const E24 = [
  1.0, 1.1, 1.2, 1.3, 1.5, 1.6, 1.8, 2.0, 2.2, 2.4, 2.7, 3.0, 3.3, 3.6, 3.9, 4.3, 4.7, 5.1, 5.6, 6.2, 6.8, 7.5, 8.2, 9.1,
];

/** Usual tolerance of each series, fraction. */
export const E_SERIES_TOLERANCE: Record<ESeriesName, number> = {
  E6: 0.2, E12: 0.1, E24: 0.05, E48: 0.02, E96: 0.01, E192: 0.005,
};

const cache = new Map<ESeriesName, readonly number[]>();

function threeDigit(n: number): number[] {
  const out: number[] = [];
  for (let i = 0; i < n; i++) out.push(Math.round(100 * 10 ** (i / n)) / 100);
  if (n === 192) {
    // IEC 60063 lists 9.20 where the formula gives 9.19.
    const k = out.indexOf(9.19);
    if (k >= 0) out[k] = 9.2;
  }
  return out;
}

/** The mantissas (1 ≤ m < 10) of a series, ascending. */
export function eSeries(name: ESeriesName): readonly number[] {
  let v = cache.get(name);
  if (v) return v;
  switch (name) {
    case "E24": v = E24; break;
    case "E12": v = E24.filter((_, i) => i % 2 === 0); break;
    case "E6": v = E24.filter((_, i) => i % 4 === 0); break;
    case "E48": v = threeDigit(96).filter((_, i) => i % 2 === 0); break;
    case "E96": v = threeDigit(96); break;
    case "E192": v = threeDigit(192); break;
    default: throw new RangeError(`Unknown E-series "${String(name)}" (use E6, E12, E24, E48, E96 or E192)`);
  }
  cache.set(name, v);
  return v;
}

function check(value: number): void {
  if (!(Number.isFinite(value) && value > 0)) throw new RangeError(`E-series values need a positive number, got ${value}`);
}

/** Candidate values around `value`: the series over the decade below, of and above it. */
function around(value: number, name: ESeriesName): number[] {
  const decade = Math.floor(Math.log10(value));
  const m = eSeries(name);
  const out: number[] = [];
  for (let d = decade - 1; d <= decade + 1; d++) {
    const scale = 10 ** d;
    // Multiply by a power of ten then fix the float noise to 3 significant digits.
    for (const x of m) out.push(Number((x * scale).toPrecision(3)));
  }
  return out;
}

/** The series value nearest to `value` on a logarithmic scale (ratio distance). */
export function nearestE(value: number, name: ESeriesName): number {
  check(value);
  let best = NaN;
  let bestD = Infinity;
  for (const c of around(value, name)) {
    const d = Math.abs(Math.log(c / value));
    if (d < bestD - 1e-12) { bestD = d; best = c; }
  }
  return best;
}

/** The smallest series value strictly above `value`. */
export function nextUp(value: number, name: ESeriesName): number {
  check(value);
  for (const c of around(value, name)) if (c > value * (1 + 1e-9)) return c;
  throw new RangeError("No value above");
}

/** The largest series value strictly below `value`. */
export function nextDown(value: number, name: ESeriesName): number {
  check(value);
  const c = around(value, name);
  for (let i = c.length - 1; i >= 0; i--) if (c[i] < value * (1 - 1e-9)) return c[i];
  throw new RangeError("No value below");
}

/** The band a part of nominal `value` falls in with the series' usual tolerance (or the one given). */
export function toleranceBand(value: number, name: ESeriesName, tolerance = E_SERIES_TOLERANCE[name]): { low: number; high: number; tolerance: number } {
  check(value);
  return { low: value * (1 - tolerance), high: value * (1 + tolerance), tolerance };
}

/** All series values between lo and hi inclusive, ascending. */
export function eValuesBetween(lo: number, hi: number, name: ESeriesName): number[] {
  check(lo);
  check(hi);
  const out: number[] = [];
  const m = eSeries(name);
  for (let d = Math.floor(Math.log10(lo)); d <= Math.floor(Math.log10(hi)); d++) {
    for (const x of m) {
      const v = Number((x * 10 ** d).toPrecision(3));
      if (v >= lo * (1 - 1e-9) && v <= hi * (1 + 1e-9)) out.push(v);
    }
  }
  return out;
}
