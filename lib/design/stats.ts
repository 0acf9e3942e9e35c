/** Seeded random numbers and summary statistics for the Spread (Monte Carlo) study. */

/**
 * Mulberry32 (Tommy Ettinger, public domain): a 32-bit generator with a full 2^32 period, plenty for tolerance
 * draws; the same seed gives the same sequence in every worker.
 */
export function createRng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Standard normal draw by the Box–Muller transform (Box & Muller, Ann. Math. Stat. 29, 1958). */
export function normal(rng: () => number): number {
  let u = rng();
  while (u <= 0) u = rng();
  const v = rng();
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
}

/**
 * A relative deviation for a part of tolerance `tol`: uniform in [−tol, tol], or normal with σ = tol/3 (the
 * tolerance taken as the 3σ limit, common practice), truncated at ±tol.
 */
export function deviation(rng: () => number, tol: number, distribution: "uniform" | "normal"): number {
  if (tol === 0) return 0;
  if (distribution === "uniform") return (2 * rng() - 1) * tol;
  let d = normal(rng) * (tol / 3);
  while (Math.abs(d) > tol) d = normal(rng) * (tol / 3);
  return d;
}

/** The RNG for run `index` of a study seeded with `seed`: independent of how runs are split across workers. */
export function rngForRun(seed: number, index: number): () => number {
  // Hash (seed, index) to a 32-bit state so neighbouring runs are not correlated.
  let h = (Math.imul(seed ^ 0x9e3779b9, 0x85ebca6b) ^ Math.imul(index + 1, 0xc2b2ae35)) >>> 0;
  h = Math.imul(h ^ (h >>> 16), 0x7feb352d) >>> 0;
  h = Math.imul(h ^ (h >>> 15), 0x846ca68b) >>> 0;
  return createRng(h ^ (h >>> 16));
}

export interface Summary {
  count: number;
  mean: number;
  std: number;
  min: number;
  max: number;
  p01: number;
  p99: number;
}

/** Mean, sample standard deviation, extremes and 1st/99th percentiles, ignoring NaN entries. */
export function summarize(values: ArrayLike<number>): Summary {
  const v: number[] = [];
  for (let i = 0; i < values.length; i++) if (Number.isFinite(values[i])) v.push(values[i]);
  const n = v.length;
  if (n === 0) return { count: 0, mean: NaN, std: NaN, min: NaN, max: NaN, p01: NaN, p99: NaN };
  let mean = 0;
  for (const x of v) mean += x;
  mean /= n;
  let ss = 0;
  for (const x of v) ss += (x - mean) ** 2;
  v.sort((a, b) => a - b);
  return {
    count: n,
    mean,
    std: n > 1 ? Math.sqrt(ss / (n - 1)) : 0,
    min: v[0],
    max: v[n - 1],
    p01: quantileSorted(v, 0.01),
    p99: quantileSorted(v, 0.99),
  };
}

function quantileSorted(v: number[], q: number): number {
  const pos = (v.length - 1) * q;
  const lo = Math.floor(pos);
  const hi = Math.ceil(pos);
  return v[lo] + (v[hi] - v[lo]) * (pos - lo);
}

/** Histogram with `bins` equal bins over [min, max] of the finite values. */
export function histogram(values: ArrayLike<number>, bins = 30): { edges: Float64Array; counts: Float64Array } {
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < values.length; i++) {
    const x = values[i];
    if (!Number.isFinite(x)) continue;
    if (x < lo) lo = x;
    if (x > hi) hi = x;
  }
  const edges = new Float64Array(bins + 1);
  const counts = new Float64Array(bins);
  if (!Number.isFinite(lo)) return { edges, counts };
  if (hi === lo) { hi = lo + Math.abs(lo) * 1e-9 + 1e-15; }
  const w = (hi - lo) / bins;
  for (let k = 0; k <= bins; k++) edges[k] = lo + k * w;
  for (let i = 0; i < values.length; i++) {
    const x = values[i];
    if (!Number.isFinite(x)) continue;
    counts[Math.min(bins - 1, Math.floor((x - lo) / w))]++;
  }
  return { edges, counts };
}
