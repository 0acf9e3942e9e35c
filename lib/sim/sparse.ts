/**
 * LU with a pivot order and fill pattern computed once, then reused: the classic circuit-simulator split of
 * "ordering + symbolic factorisation" from "numeric factorisation" (K. S. Kundert, "Sparse matrix techniques", in
 * Circuit Analysis, Simulation and Design, A. E. Ruehli ed., North-Holland 1986; Vlach & Singhal 1994, ch. on sparse
 * matrices). The order comes from an elimination on an actual matrix with threshold pivoting and a fewest-non-zeros
 * tie-break (see chooseOrder); every later numeric factorisation walks only the structurally non-zero positions
 * (stamps + fill-in) and allocates nothing. When a reused pivot turns out small (a multiplier above GROWTH, the threshold-pivoting test),
 * the caller re-analyses with the current values.
 *
 * Storage is the circuit's row-major (n+1)×(n+1) array: rows are never moved; `rowOf[k]` says which stored row is
 * the k-th pivot row.
 */

/** |pivot| at or below this is treated as exactly singular (shared with the dense LU kept for the benchmark). */
export const SINGULAR_PIVOT = 1e-300;

/** Largest multiplier accepted before asking for a new pivot order (the order was chosen with multipliers ≤ 10;
 *  a reused one may drift to 1e3 before it is replaced — a chain of large multipliers compounds). */
const GROWTH = 1e3;
/** A pivot candidate must be at least this fraction of its column's largest entry. */
const PIVOT_THRESHOLD = 0.1;

/** columns between two polls of a long ordering or factorisation (a power of two minus one is the mask); a matrix
 *  smaller than that is never polled inside (its whole factorisation takes microseconds) */
const POLL_MASK = 63;

export const LU_OK = -1;
/** factor() result: the reused order is numerically poor at this matrix; call analyse() and factor again. */
export const LU_REORDER = -2;

export class StaticLU {
  readonly n: number;
  readonly stride: number;
  /** structural non-zeros (every position an element stamps), row-major */
  readonly structure: Uint8Array;
  analysed = false;
  reorders = 0;
  private rowOf: Int32Array;
  private base: Int32Array;
  private lStart = new Int32Array(0);
  private lRows = new Int32Array(0);
  private uStart = new Int32Array(0);
  private uCols = new Int32Array(0);
  /** storage positions of every structural non-zero and fill-in of the current order (valid after analyse) */
  positions = new Int32Array(0);
  private scratch: Float64Array;
  private scratchIm: Float64Array;
  private y: Float64Array;
  private yi: Float64Array;
  /** called every POLL_COLUMNS columns of an ordering or a factorisation (the circuit's checkpoint: budget and
   *  cancellation); it may throw, which leaves the LU unanalysed or its factors incomplete */
  poll: (() => void) | null = null;

  constructor(n: number, stride: number, structure: Uint8Array) {
    this.n = n;
    this.stride = stride;
    this.structure = structure;
    this.rowOf = new Int32Array(n);
    this.base = new Int32Array(n);
    this.scratch = new Float64Array(stride * stride);
    this.scratchIm = new Float64Array(stride * stride);
    this.y = new Float64Array(stride);
    this.yi = new Float64Array(stride);
  }

  /**
   * Choose the pivot order from the values in `a` (and `im` for a complex matrix) by partial pivoting, then compute
   * the fill pattern. Returns -1, or the column where `a` is singular.
   */
  analyse(a: Float64Array, im?: Float64Array): number {
    const { n, stride } = this;
    // only structural entries count (other positions may hold stale factors from an earlier order)
    const st = this.structure, sc = this.scratch, si = this.scratchIm;
    for (let i = 0; i < sc.length; i++) sc[i] = st[i] ? a[i] : 0;
    if (im) for (let i = 0; i < si.length; i++) si[i] = st[i] ? im[i] : 0;
    const bad = this.chooseOrder(im !== undefined);
    if (bad >= 0) return bad;
    const rowOf = this.rowOf;
    for (let k = 0; k < n; k++) this.base[k] = rowOf[k] * stride;
    // symbolic elimination on the permuted structure (dense boolean, n is small)
    const s = new Uint8Array(n * n);
    for (let k = 0; k < n; k++) for (let j = 0; j < n; j++) s[k * n + j] = this.structure[rowOf[k] * stride + j];
    for (let k = 0; k < n; k++) s[k * n + k] = 1;
    const lStart = new Int32Array(n + 1), uStart = new Int32Array(n + 1);
    const lRows: number[] = [], uCols: number[] = [];
    const poll = this.poll;
    for (let k = 0; k < n; k++) {
      if ((k & POLL_MASK) === POLL_MASK && poll !== null) poll();
      lStart[k] = lRows.length;
      uStart[k] = uCols.length;
      for (let j = k + 1; j < n; j++) if (s[k * n + j]) uCols.push(j);
      for (let i = k + 1; i < n; i++) {
        if (!s[i * n + k]) continue;
        lRows.push(i);
        for (let q = uStart[k]; q < uCols.length; q++) s[i * n + uCols[q]] = 1;
      }
    }
    lStart[n] = lRows.length;
    uStart[n] = uCols.length;
    const pos: number[] = [];
    for (let k = 0; k < n; k++) for (let j = 0; j < n; j++) if (s[k * n + j]) pos.push(rowOf[k] * stride + j);
    this.positions = Int32Array.from(pos);
    this.lStart = lStart; this.uStart = uStart;
    this.lRows = Int32Array.from(lRows); this.uCols = Int32Array.from(uCols);
    this.analysed = true;
    this.reorders++;
    return -1;
  }

  /**
   * Pivot order by threshold pivoting with diagonal preference and a Markowitz-style tie-break (H. M. Markowitz, "The elimination form of
   * the inverse and its application to linear programming", Management Science 3, 1957; threshold pivoting as in
   * Duff, Erisman & Reid, "Direct Methods for Sparse Matrices", 1986): columns are eliminated in their natural order;
   * among the rows whose entry is at least PIVOT_THRESHOLD × the column's largest, the one with the fewest
   * remaining non-zeros is chosen, which keeps fill-in down. Works on the scratch copy; fills rowOf.
   * Returns -1, or the column where no usable pivot exists.
   */
  private chooseOrder(complex: boolean): number {
    const { n, stride } = this;
    const re = this.scratch, im = this.scratchIm;
    const used = new Uint8Array(n);
    const nz = new Uint8Array(n * n);
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) nz[i * n + j] = this.structure[i * stride + j];
    const poll = this.poll;
    for (let k = 0; k < n; k++) {
      if ((k & POLL_MASK) === POLL_MASK && poll !== null) poll();
      let colMax = 0;
      for (let r = 0; r < n; r++) {
        if (used[r]) continue;
        const q = r * stride + k;
        const m = complex ? Math.abs(re[q]) + Math.abs(im[q]) : Math.abs(re[q]);
        if (m > colMax) colMax = m;
      }
      if (!(colMax > SINGULAR_PIVOT)) return k;
      let best = -1, bestCount = Infinity, bestMag = 0;
      // the diagonal first when it is acceptable: node rows of an MNA matrix are diagonally heavy, and keeping the
      // pivot on the diagonal keeps it there when later values (C/h, device slopes) shift the magnitudes
      const dq = k * stride + k;
      const dm = used[k] ? 0 : complex ? Math.abs(re[dq]) + Math.abs(im[dq]) : Math.abs(re[dq]);
      if (dm >= PIVOT_THRESHOLD * colMax && dm > SINGULAR_PIVOT) { best = k; bestCount = -1; }
      for (let r = 0; r < n && bestCount >= 0; r++) {
        if (used[r]) continue;
        const q = r * stride + k;
        const m = complex ? Math.abs(re[q]) + Math.abs(im[q]) : Math.abs(re[q]);
        if (m < PIVOT_THRESHOLD * colMax) continue;
        let count = 0;
        for (let j = k + 1; j < n; j++) count += nz[r * n + j];
        if (count < bestCount || (count === bestCount && m > bestMag)) { best = r; bestCount = count; bestMag = m; }
      }
      this.rowOf[k] = best;
      used[best] = 1;
      const bp = best * stride;
      // the multiplier is formed exactly as factor()/factorComplex() form it, so the numeric factorisation that
      // follows meets the same pivots bit for bit (near-cancelling entries must not decide differently)
      const dr = re[bp + k], di = complex ? im[bp + k] : 0;
      let ir: number, ii: number;
      if (complex) { const den = dr * dr + di * di; ir = dr / den; ii = -di / den; } else { ir = 1 / dr; ii = 0; }
      for (let i = 0; i < n; i++) {
        if (used[i]) continue;
        const ip = i * stride;
        const mr = re[ip + k], mi = complex ? im[ip + k] : 0;
        if (mr === 0 && mi === 0 && !nz[i * n + k]) continue;
        const lr = complex ? mr * ir - mi * ii : mr * ir, li = complex ? mr * ii + mi * ir : 0;
        for (let j = k + 1; j < n; j++) {
          if (!nz[best * n + j]) continue;
          nz[i * n + j] = 1;
          const ur = re[bp + j], ui = complex ? im[bp + j] : 0;
          re[ip + j] -= lr * ur - li * ui;
          if (complex) im[ip + j] -= lr * ui + li * ur;
        }
      }
    }
    return -1;
  }

  /** Number of stored non-zeros of L + U (for the benchmark). */
  get factorNonZeros(): number { return this.n + this.lRows.length + this.uCols.length; }

  /** Numeric factorisation in place with the stored order. Returns LU_OK, LU_REORDER, or a singular column. */
  factor(a: Float64Array): number {
    const { n, base, lStart, lRows, uStart, uCols } = this;
    const poll = n > POLL_MASK ? this.poll : null;
    for (let k = 0; k < n; k++) {
      if (poll !== null && (k & POLL_MASK) === POLL_MASK) poll();
      const bk = base[k];
      const d = a[bk + k];
      if (!(Math.abs(d) > SINGULAR_PIVOT)) return LU_REORDER;
      const inv = 1 / d;
      const u0 = uStart[k], u1 = uStart[k + 1];
      for (let p = lStart[k], pe = lStart[k + 1]; p < pe; p++) {
        const bi = base[lRows[p]];
        const m = a[bi + k];
        if (m === 0) continue;
        const l = m * inv;
        if (l > GROWTH || l < -GROWTH) return LU_REORDER;
        a[bi + k] = l;
        for (let q = u0; q < u1; q++) { const j = uCols[q]; a[bi + j] -= l * a[bk + j]; }
      }
    }
    return LU_OK;
  }

  /** Solve after factor(): x (length ≥ n) receives the solution of A·x = b. b is not modified. */
  solve(a: Float64Array, b: Float64Array, x: Float64Array): void {
    const { n, base, rowOf, lStart, lRows, uStart, uCols } = this;
    const y = this.y;
    for (let k = 0; k < n; k++) y[k] = b[rowOf[k]];
    for (let k = 0; k < n; k++) {
      const yk = y[k];
      if (yk === 0) continue;
      for (let p = lStart[k], pe = lStart[k + 1]; p < pe; p++) { const i = lRows[p]; y[i] -= a[base[i] + k] * yk; }
    }
    for (let k = n - 1; k >= 0; k--) {
      const bk = base[k];
      let s = y[k];
      for (let q = uStart[k], qe = uStart[k + 1]; q < qe; q++) { const j = uCols[q]; s -= a[bk + j] * x[j]; }
      x[k] = s / a[bk + k];
    }
  }

  /** Complex numeric factorisation (split storage) with the stored order. */
  factorComplex(re: Float64Array, im: Float64Array): number {
    const { n, base, lStart, lRows, uStart, uCols } = this;
    const poll = n > POLL_MASK ? this.poll : null;
    for (let k = 0; k < n; k++) {
      if (poll !== null && (k & POLL_MASK) === POLL_MASK) poll();
      const bk = base[k];
      const dr = re[bk + k], di = im[bk + k];
      const den = dr * dr + di * di;
      if (!(den > SINGULAR_PIVOT)) return LU_REORDER;
      const ir = dr / den, ii = -di / den;
      const u0 = uStart[k], u1 = uStart[k + 1];
      for (let p = lStart[k], pe = lStart[k + 1]; p < pe; p++) {
        const bi = base[lRows[p]];
        const mr = re[bi + k], mi = im[bi + k];
        if (mr === 0 && mi === 0) continue;
        const lr = mr * ir - mi * ii, li = mr * ii + mi * ir;
        if (Math.abs(lr) + Math.abs(li) > GROWTH) return LU_REORDER;
        re[bi + k] = lr; im[bi + k] = li;
        for (let q = u0; q < u1; q++) {
          const j = uCols[q];
          const ur = re[bk + j], ui = im[bk + j];
          re[bi + j] -= lr * ur - li * ui;
          im[bi + j] -= lr * ui + li * ur;
        }
      }
    }
    return LU_OK;
  }

  solveComplex(re: Float64Array, im: Float64Array, br: Float64Array, bi: Float64Array, xr: Float64Array, xi: Float64Array): void {
    const { n, base, rowOf, lStart, lRows, uStart, uCols } = this;
    const y = this.y, yi = this.yi;
    for (let k = 0; k < n; k++) { y[k] = br[rowOf[k]]; yi[k] = bi[rowOf[k]]; }
    for (let k = 0; k < n; k++) {
      const yr = y[k], yim = yi[k];
      if (yr === 0 && yim === 0) continue;
      for (let p = lStart[k], pe = lStart[k + 1]; p < pe; p++) {
        const i = lRows[p];
        const pos = base[i] + k;
        const lr = re[pos], li = im[pos];
        y[i] -= lr * yr - li * yim;
        yi[i] -= lr * yim + li * yr;
      }
    }
    for (let k = n - 1; k >= 0; k--) {
      const bk = base[k];
      let sr = y[k], si = yi[k];
      for (let q = uStart[k], qe = uStart[k + 1]; q < qe; q++) {
        const j = uCols[q];
        const ur = re[bk + j], ui = im[bk + j];
        sr -= ur * xr[j] - ui * xi[j];
        si -= ur * xi[j] + ui * xr[j];
      }
      const dr = re[bk + k], di = im[bk + k];
      const den = dr * dr + di * di;
      xr[k] = (sr * dr + si * di) / den;
      xi[k] = (si * dr - sr * di) / den;
    }
  }

  /**
   * Transposed solve after factorComplex(): x receives the solution of Aᵀ·x = b (the plain transpose, not the
   * conjugate), on the same factors. With P·A = L·U (P the row order), Aᵀ = Uᵀ·Lᵀ·P: forward substitution with Uᵀ,
   * back substitution with Lᵀ (unit diagonal), then the row order undone. The adjoint of a network function
   * (Director & Rohrer 1969; Vlach & Singhal 1994, ch. on sensitivity and noise): one solve gives the transfer from
   * every right-hand-side position to one output. b is not modified.
   */
  solveComplexTransposed(re: Float64Array, im: Float64Array, br: Float64Array, bi: Float64Array, xr: Float64Array, xi: Float64Array): void {
    const { n, base, rowOf, lStart, lRows, uStart, uCols } = this;
    const y = this.y, yi = this.yi;
    for (let k = 0; k < n; k++) { y[k] = br[k]; yi[k] = bi[k]; }
    // Uᵀ·w = b: column k of Uᵀ is row k of U; w overwrites y
    for (let k = 0; k < n; k++) {
      const bk = base[k];
      const dr = re[bk + k], di = im[bk + k];
      const den = dr * dr + di * di;
      const sr = y[k], si = yi[k];
      const wr = (sr * dr + si * di) / den, wi = (si * dr - sr * di) / den;
      y[k] = wr; yi[k] = wi;
      if (wr === 0 && wi === 0) continue;
      for (let q = uStart[k], qe = uStart[k + 1]; q < qe; q++) {
        const j = uCols[q];
        const ur = re[bk + j], ui = im[bk + j];
        y[j] -= ur * wr - ui * wi;
        yi[j] -= ur * wi + ui * wr;
      }
    }
    // Lᵀ·v = w: row k of Lᵀ is column k of L (rows lRows of the pivot order); v overwrites y
    for (let k = n - 1; k >= 0; k--) {
      let sr = y[k], si = yi[k];
      for (let p = lStart[k], pe = lStart[k + 1]; p < pe; p++) {
        const i = lRows[p];
        const pos = base[i] + k;
        const lr = re[pos], li = im[pos];
        sr -= lr * y[i] - li * yi[i];
        si -= lr * yi[i] + li * y[i];
      }
      y[k] = sr; yi[k] = si;
    }
    for (let k = 0; k < n; k++) { xr[rowOf[k]] = y[k]; xi[rowOf[k]] = yi[k]; }
  }
}
