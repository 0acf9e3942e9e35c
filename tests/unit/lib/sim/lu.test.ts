import { describe, expect, it } from "vitest";
import { Matrix, solve } from "ml-matrix";
import { luFactor, luFactorComplex, luSolve, luSolveComplex } from "@/lib/sim/lu";

/** Seeded PRNG (mulberry32, common practice) so every run checks the same systems. */
function rng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Pack a JS matrix into the engine's row-major storage with stride n+1 (spare ground row/column). */
function pack(rows: number[][]): { a: Float64Array; stride: number } {
  const n = rows.length;
  const stride = n + 1;
  const a = new Float64Array(stride * stride);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) a[i * stride + j] = rows[i][j];
  return { a, stride };
}

function engineSolve(rows: number[][], b: number[]): Float64Array {
  const n = rows.length;
  const { a, stride } = pack(rows);
  const piv = new Int32Array(stride);
  expect(luFactor(a, n, stride, piv)).toBe(-1);
  const x = new Float64Array(stride);
  x.set(b);
  luSolve(a, n, stride, piv, x);
  return x.subarray(0, n);
}

describe("dense LU with partial pivoting vs ml-matrix (reference library)", () => {
  it("solves 50 seeded random systems (n = 1..30) to 1e-9 relative of ml-matrix's solution", () => {
    const r = rng(12345);
    for (let trial = 0; trial < 50; trial++) {
      const n = 1 + Math.floor(r() * 30);
      const rows = Array.from({ length: n }, () => Array.from({ length: n }, () => r() * 2 - 1));
      const b = Array.from({ length: n }, () => r() * 2 - 1);
      const ref = solve(new Matrix(rows), Matrix.columnVector(b)).to1DArray();
      const x = engineSolve(rows, b);
      const scale = Math.max(...ref.map(Math.abs));
      for (let i = 0; i < n; i++) expect(Math.abs(x[i] - ref[i])).toBeLessThan(1e-9 * scale);
    }
  });

  it("needs pivoting: a zero leading entry is handled (residual ≤ 1e-14)", () => {
    const rows = [[0, 1, 2], [1, 0, 3], [4, -3, 8]];
    const b = [1, 2, 3];
    const x = engineSolve(rows, b);
    for (let i = 0; i < 3; i++) {
      const ax = rows[i].reduce((s, v, j) => s + v * x[j], 0);
      expect(Math.abs(ax - b[i])).toBeLessThan(1e-14);
    }
  });

  it("ill-conditioned Hilbert matrices (n = 6, 8; cond ≈ 1.5e7, 1.5e10) agree with ml-matrix to the conditioning", () => {
    for (const n of [6, 8]) {
      const rows = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => 1 / (i + j + 1)));
      const xTrue = Array.from({ length: n }, (_, i) => (i % 2 ? -1 : 1));
      const b = rows.map((row) => row.reduce((s, v, j) => s + v * xTrue[j], 0));
      const ref = solve(new Matrix(rows), Matrix.columnVector(b)).to1DArray();
      const x = engineSolve(rows, b);
      // Forward error bound ≈ cond·eps: 1.5e10 × 2.2e-16 ≈ 3e-6 for n = 8 (Golub & Van Loan §3.5).
      const tol = n === 6 ? 1e-8 : 1e-4;
      for (let i = 0; i < n; i++) {
        expect(Math.abs(x[i] - xTrue[i])).toBeLessThan(tol);
        expect(Math.abs(x[i] - ref[i])).toBeLessThan(tol);
      }
      // the residual is small regardless of conditioning (backward stability of partial pivoting)
      for (let i = 0; i < n; i++) {
        const ax = rows[i].reduce((s, v, j) => s + v * x[j], 0);
        expect(Math.abs(ax - b[i])).toBeLessThan(1e-13);
      }
    }
  });

  it("reports the column of an exactly singular matrix", () => {
    const { a, stride } = pack([[1, 2, 3], [2, 4, 6], [1, 0, 1]]);
    const piv = new Int32Array(stride);
    expect(luFactor(a, 3, stride, piv)).toBe(2);
  });

  it("complex LU solves seeded random complex systems; residual ≤ 1e-12 (checked against ml-matrix on the real 2n form)", () => {
    const r = rng(777);
    for (let trial = 0; trial < 20; trial++) {
      const n = 1 + Math.floor(r() * 12);
      const stride = n + 1;
      const ar = new Float64Array(stride * stride), ai = new Float64Array(stride * stride);
      const big: number[][] = Array.from({ length: 2 * n }, () => new Array(2 * n).fill(0));
      for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) {
        const re = r() * 2 - 1, im = r() * 2 - 1;
        ar[i * stride + j] = re; ai[i * stride + j] = im;
        // [Re −Im; Im Re] real embedding of a complex matrix
        big[i][j] = re; big[i][j + n] = -im; big[i + n][j] = im; big[i + n][j + n] = re;
      }
      const br = Array.from({ length: n }, () => r() - 0.5), bi = Array.from({ length: n }, () => r() - 0.5);
      const ref = solve(new Matrix(big), Matrix.columnVector([...br, ...bi])).to1DArray();
      const xr = new Float64Array(stride), xi = new Float64Array(stride);
      xr.set(br); xi.set(bi);
      const piv = new Int32Array(stride);
      expect(luFactorComplex(ar, ai, n, stride, piv)).toBe(-1);
      luSolveComplex(ar, ai, n, stride, piv, xr, xi);
      for (let i = 0; i < n; i++) {
        expect(Math.abs(xr[i] - ref[i])).toBeLessThan(1e-9 * (1 + Math.abs(ref[i])));
        expect(Math.abs(xi[i] - ref[i + n])).toBeLessThan(1e-9 * (1 + Math.abs(ref[i + n])));
      }
    }
  });
});
