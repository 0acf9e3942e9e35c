/**
 * Small-signal step: the response of the circuit linearised at its operating point (the same G and C matrices the AC
 * analysis uses, so its Laplace transform is exactly the AC result divided by s) to a unit step of one source's AC
 * excitation, C·dx/dt + G·x = b·u(t), x(0) = 0 (deviation from the operating point).
 *
 * Fixed step h, trapezoidal rule (Vlach & Singhal 1994, ch. on time-domain analysis), with one backward-Euler step
 * at t = 0 and at the end of the input's edge, where the input's slope jumps (the trapezoidal rule would otherwise
 * carry an undamped alternating error in the algebraic unknowns). Two factorisations (one per rule), then one solve
 * per step: a few thousand steps cost about as much as a few hundred AC frequencies.
 */
import type { Circuit } from "../circuit";
import { checkpoint } from "../checkpoint";
import { SimError } from "../errors";
import { LU_OK, LU_REORDER, StaticLU } from "../sparse";
import { linearise } from "./ac";

export interface LinearStepResult {
  kind: "linstep";
  time: Float64Array;
  /** deviation of each user node from its operating-point voltage per unit of input, V per unit */
  nodes: Record<string, Float64Array>;
  /** deviation of each voltage source's branch current per unit of input, A per unit */
  currents: Record<string, Float64Array>;
}

/** Factor `a` with the stored order, re-analysing when the order does not hold. */
function factorReal(lu: StaticLU, a: Float64Array, what: string): void {
  let r = lu.analysed ? lu.factor(a) : LU_REORDER;
  if (r === LU_REORDER) {
    const backup = a.slice();
    const bad = lu.analyse(backup);
    if (bad >= 0) throw new SimError("singular", `Singular matrix in the small-signal step (${what})`);
    a.set(backup);
    r = lu.factor(a);
  }
  if (r !== LU_OK) throw new SimError("singular", `Singular matrix in the small-signal step (${what})`);
}

/**
 * Unit step of `source` (a vsource or isource) rising linearly over `edge` seconds from t = 0, over `steps` equal
 * steps to `tStop`. Runs the operating point first.
 */
export function runLinearStep(c: Circuit, source: string, tStop: number, steps: number, edge: number): LinearStepResult {
  if (!(tStop > 0) || !Number.isInteger(steps) || steps < 2 || !(edge >= 0)) {
    throw new SimError("invalid", "Invalid small-signal step: tStop > 0, steps ≥ 2 and edge ≥ 0 are required");
  }
  const src = c.elements.find((e) => e.acExcitation !== null && e.name === source);
  if (!src) throw new SimError("invalid", `Small-signal step names "${source}", which is not a vsource or isource`);
  const { g, cap } = linearise(c);
  const size = g.length;
  // b: the unit excitation of the chosen source alone (every source's AC phasor swapped for the load, then restored)
  const sources = c.elements.filter((e) => e.acExcitation !== null);
  const saved = sources.map((e) => [e.acExcitation![0], e.acExcitation![1]] as const);
  const b = new Float64Array(c.stride), bi = new Float64Array(c.stride);
  try {
    for (const e of sources) { e.acExcitation![0] = e === src ? 1 : 0; e.acExcitation![1] = 0; }
    for (const el of c.elements) el.loadAc(c, b, bi);
  } finally {
    sources.forEach((e, i) => { e.acExcitation![0] = saved[i][0]; e.acExcitation![1] = saved[i][1]; });
  }
  const h = tStop / steps;
  const edgeSteps = edge > 0 ? Math.max(1, Math.round(edge / h)) : 0;
  const n = c.n, stride = c.stride;
  // Backward Euler: (G + C/h)·x1 = C/h·x0 + b·u1.  Trapezoidal: (G + 2C/h)·x1 = (2C/h − G)·x0 + b·(u0 + u1).
  const aBE = new Float64Array(size), aTR = new Float64Array(size);
  for (let i = 0; i < size; i++) { aBE[i] = g[i] + cap[i] / h; aTR[i] = g[i] + (2 * cap[i]) / h; }
  const luBE = new StaticLU(n, stride, c.structure);
  const luTR = new StaticLU(n, stride, c.structure);
  factorReal(luBE, aBE, "backward-Euler matrix");
  factorReal(luTR, aTR, "trapezoidal matrix");
  const nUser = c.userNodeNames.length;
  // voltage sources carry their current as an unknown: the meters and supplies of the netlist
  const vsrc = c.elements.filter((e) => e.acExcitation !== null && e.kind === "vsource");
  const time = new Float64Array(steps + 1);
  const nodeCols = c.userNodeNames.map(() => new Float64Array(steps + 1));
  const curCols = vsrc.map(() => new Float64Array(steps + 1));
  const x0 = new Float64Array(stride), x1 = new Float64Array(stride), rhs = new Float64Array(stride);
  const xi = new Float64Array(stride), out = new Float64Array(2);
  const u = (k: number) => (edgeSteps === 0 ? (k > 0 ? 1 : 0) : Math.min(1, k / edgeSteps));
  // The right-hand side's matrices, M = C/h (Euler) and 2C/h − G (trapezoidal), as a list of their non-zeros.
  const rowsM: number[] = [], colsM: number[] = [], mBEl: number[] = [], mTRl: number[] = [];
  for (let r = 0; r < n; r++) {
    for (let col = 0; col < n; col++) {
      const p = r * stride + col;
      if (!c.structure[p] || (cap[p] === 0 && g[p] === 0)) continue;
      rowsM.push(r); colsM.push(col); mBEl.push(cap[p] / h); mTRl.push((2 * cap[p]) / h - g[p]);
    }
  }
  const nnz = rowsM.length;
  const mRow = Int32Array.from(rowsM), mCol = Int32Array.from(colsM), mBE = Float64Array.from(mBEl), mTR = Float64Array.from(mTRl);
  for (let k = 1; k <= steps; k++) {
    const euler = k === 1 || k === edgeSteps + 1;
    const u0 = u(k - 1), u1 = u(k);
    const m = euler ? mBE : mTR;
    const ub = euler ? u1 : u0 + u1;
    for (let r = 0; r < n; r++) rhs[r] = b[r] * ub;
    for (let q = 0; q < nnz; q++) rhs[mRow[q]] += m[q] * x0[mCol[q]];
    if (euler) luBE.solve(aBE, rhs, x1); else luTR.solve(aTR, rhs, x1);
    x1[n] = 0;
    time[k] = k * h;
    for (let i = 0; i < nUser; i++) nodeCols[i][k] = x1[i];
    for (let e = 0; e < vsrc.length; e++) {
      vsrc[e].acCurrent(c, x1, xi, 0, out);
      curCols[e][k] = out[0];
    }
    x0.set(x1);
    if ((k & 255) === 0) checkpoint(c);
  }
  const nodes: Record<string, Float64Array> = {};
  c.userNodeNames.forEach((nm, i) => { nodes[nm] = nodeCols[i]; });
  const currents: Record<string, Float64Array> = {};
  vsrc.forEach((e, i) => { currents[e.name] = curCols[i]; });
  return { kind: "linstep", time, nodes, currents };
}
