/**
 * Dense LU factorisation with partial pivoting (Doolittle, row interchanges), in place, allocation-free.
 * Source: G. H. Golub, C. F. Van Loan, "Matrix Computations", 4th ed., §3.4 (Gaussian elimination with partial
 * pivoting). Row-major storage with a stride, so the circuit matrix can keep a spare "ground" row/column at index n
 * that the factorisation never touches. Zero multipliers are skipped, which is where MNA's sparsity pays off.
 */

import { SINGULAR_PIVOT } from "./sparse";

export { SINGULAR_PIVOT };

/**
 * Factor the leading n×n block of `a` (row stride `stride`) in place into L (unit, below the diagonal) and U.
 * `piv[k]` receives the row swapped with row k. Returns -1 on success, or the column k where no usable pivot exists.
 */
export function luFactor(a: Float64Array, n: number, stride: number, piv: Int32Array): number {
  for (let k = 0; k < n; k++) {
    const kk = k * stride + k;
    let p = k;
    let max = Math.abs(a[kk]);
    for (let i = k + 1; i < n; i++) {
      const v = Math.abs(a[i * stride + k]);
      if (v > max) { max = v; p = i; }
    }
    piv[k] = p;
    if (!(max > SINGULAR_PIVOT)) return k;
    if (p !== k) {
      const rp = p * stride;
      const rk = k * stride;
      for (let j = 0; j < n; j++) {
        const t = a[rp + j];
        a[rp + j] = a[rk + j];
        a[rk + j] = t;
      }
    }
    const inv = 1 / a[kk];
    const rk = k * stride;
    for (let i = k + 1; i < n; i++) {
      const ri = i * stride;
      const m = a[ri + k];
      if (m === 0) continue;
      const l = m * inv;
      a[ri + k] = l;
      for (let j = k + 1; j < n; j++) a[ri + j] -= l * a[rk + j];
    }
  }
  return -1;
}

/** Solve with the factors from luFactor, overwriting b (length ≥ n) with x. */
export function luSolve(a: Float64Array, n: number, stride: number, piv: Int32Array, b: Float64Array): void {
  for (let k = 0; k < n; k++) {
    const p = piv[k];
    if (p !== k) { const t = b[k]; b[k] = b[p]; b[p] = t; }
  }
  for (let i = 1; i < n; i++) {
    const ri = i * stride;
    let s = b[i];
    for (let j = 0; j < i; j++) s -= a[ri + j] * b[j];
    b[i] = s;
  }
  for (let i = n - 1; i >= 0; i--) {
    const ri = i * stride;
    let s = b[i];
    for (let j = i + 1; j < n; j++) s -= a[ri + j] * b[j];
    b[i] = s / a[ri + i];
  }
}

/**
 * Complex LU with partial pivoting (same algorithm, split real/imaginary storage), in place, allocation-free.
 * Pivot magnitude is |re| + |im| (a cheap norm equivalent to the modulus within √2).
 */
export function luFactorComplex(re: Float64Array, im: Float64Array, n: number, stride: number, piv: Int32Array): number {
  for (let k = 0; k < n; k++) {
    const kk = k * stride + k;
    let p = k;
    let max = Math.abs(re[kk]) + Math.abs(im[kk]);
    for (let i = k + 1; i < n; i++) {
      const q = i * stride + k;
      const v = Math.abs(re[q]) + Math.abs(im[q]);
      if (v > max) { max = v; p = i; }
    }
    piv[k] = p;
    if (!(max > SINGULAR_PIVOT)) return k;
    const rk = k * stride;
    if (p !== k) {
      const rp = p * stride;
      for (let j = 0; j < n; j++) {
        let t = re[rp + j]; re[rp + j] = re[rk + j]; re[rk + j] = t;
        t = im[rp + j]; im[rp + j] = im[rk + j]; im[rk + j] = t;
      }
    }
    const dr = re[kk];
    const di = im[kk];
    const den = dr * dr + di * di;
    const ir = dr / den;
    const ii = -di / den;
    for (let i = k + 1; i < n; i++) {
      const ri = i * stride;
      const mr = re[ri + k];
      const mi = im[ri + k];
      if (mr === 0 && mi === 0) continue;
      const lr = mr * ir - mi * ii;
      const li = mr * ii + mi * ir;
      re[ri + k] = lr;
      im[ri + k] = li;
      for (let j = k + 1; j < n; j++) {
        const ur = re[rk + j];
        const ui = im[rk + j];
        if (ur === 0 && ui === 0) continue;
        re[ri + j] -= lr * ur - li * ui;
        im[ri + j] -= lr * ui + li * ur;
      }
    }
  }
  return -1;
}

export function luSolveComplex(
  re: Float64Array, im: Float64Array, n: number, stride: number, piv: Int32Array, br: Float64Array, bi: Float64Array,
): void {
  for (let k = 0; k < n; k++) {
    const p = piv[k];
    if (p !== k) {
      let t = br[k]; br[k] = br[p]; br[p] = t;
      t = bi[k]; bi[k] = bi[p]; bi[p] = t;
    }
  }
  for (let i = 1; i < n; i++) {
    const ri = i * stride;
    let sr = br[i];
    let si = bi[i];
    for (let j = 0; j < i; j++) {
      const lr = re[ri + j];
      const li = im[ri + j];
      sr -= lr * br[j] - li * bi[j];
      si -= lr * bi[j] + li * br[j];
    }
    br[i] = sr;
    bi[i] = si;
  }
  for (let i = n - 1; i >= 0; i--) {
    const ri = i * stride;
    let sr = br[i];
    let si = bi[i];
    for (let j = i + 1; j < n; j++) {
      const ur = re[ri + j];
      const ui = im[ri + j];
      sr -= ur * br[j] - ui * bi[j];
      si -= ur * bi[j] + ui * br[j];
    }
    const dr = re[ri + i];
    const di = im[ri + i];
    const den = dr * dr + di * di;
    br[i] = (sr * dr + si * di) / den;
    bi[i] = (si * dr - sr * di) / den;
  }
}
