/**
 * Independent references for the transient tests: classic fourth-order Runge–Kutta (Kutta 1901; e.g. Press et al.,
 * "Numerical Recipes", 3rd ed., §17.1) with a fixed step, written here and sharing no code with the engine. The
 * state is what a circuit stores (capacitor voltages, inductor currents); node voltages that no charge holds are
 * algebraic and are solved from the state by the ODE's right-hand side itself.
 */

/** dy/dt = f(t, y), written into dy. */
export type Rhs = (t: number, y: Float64Array, dy: Float64Array) => void;

/** A state trajectory on a uniform grid t = k·h, k = 0..steps. */
export interface Trajectory {
  h: number;
  /** y[k·dim + i] is component i at t = k·h */
  y: Float64Array;
  dim: number;
}

/** Integrate from y0 at t = 0 to tStop with `steps` equal RK4 steps. */
export function rk4(f: Rhs, y0: readonly number[], tStop: number, steps: number): Trajectory {
  const dim = y0.length;
  const h = tStop / steps;
  const y = new Float64Array((steps + 1) * dim);
  const cur = Float64Array.from(y0);
  const k1 = new Float64Array(dim), k2 = new Float64Array(dim), k3 = new Float64Array(dim), k4 = new Float64Array(dim);
  const tmp = new Float64Array(dim);
  y.set(cur, 0);
  for (let k = 0; k < steps; k++) {
    const t = k * h;
    f(t, cur, k1);
    for (let i = 0; i < dim; i++) tmp[i] = cur[i] + 0.5 * h * k1[i];
    f(t + 0.5 * h, tmp, k2);
    for (let i = 0; i < dim; i++) tmp[i] = cur[i] + 0.5 * h * k2[i];
    f(t + 0.5 * h, tmp, k3);
    for (let i = 0; i < dim; i++) tmp[i] = cur[i] + h * k3[i];
    f(t + h, tmp, k4);
    for (let i = 0; i < dim; i++) cur[i] += (h / 6) * (k1[i] + 2 * k2[i] + 2 * k3[i] + k4[i]);
    y.set(cur, (k + 1) * dim);
  }
  return { h, y, dim };
}

/**
 * State component i at time t, by cubic Hermite interpolation between the two grid points around t, with the slopes
 * taken from the right-hand side (fourth-order accurate between points, so the grid's own error dominates).
 */
export function stateAt(tr: Trajectory, f: Rhs, t: number, i: number): number {
  const { h, y, dim } = tr;
  const last = y.length / dim - 1;
  let k = Math.floor(t / h);
  if (k >= last) k = last - 1;
  if (k < 0) k = 0;
  const s = (t - k * h) / h;
  const ya = y.subarray(k * dim, (k + 1) * dim), yb = y.subarray((k + 1) * dim, (k + 2) * dim);
  const da = new Float64Array(dim), db = new Float64Array(dim);
  f(k * h, ya, da);
  f((k + 1) * h, yb, db);
  const h00 = 2 * s ** 3 - 3 * s ** 2 + 1, h10 = s ** 3 - 2 * s ** 2 + s, h01 = -2 * s ** 3 + 3 * s ** 2, h11 = s ** 3 - s ** 2;
  return h00 * ya[i] + h10 * h * da[i] + h01 * yb[i] + h11 * h * db[i];
}

/**
 * Root of a strictly monotonic g on [lo, hi] (g(lo) and g(hi) of opposite signs): Newton with a bisection
 * safeguard, to |Δv| ≤ 1e-13·max(1, |v|). Used for the algebraic node voltages of the references.
 */
export function solveMonotonic(g: (v: number) => number, dg: (v: number) => number, lo: number, hi: number, guess: number): number {
  let a = lo, b = hi;
  let ga = g(a);
  let v = guess > lo && guess < hi ? guess : 0.5 * (lo + hi);
  for (let it = 0; it < 200; it++) {
    const gv = g(v);
    if (gv === 0) return v;
    if ((gv > 0) === (ga > 0)) { a = v; ga = gv; } else b = v;
    let next = v - gv / dg(v);
    if (!(next > a && next < b) && !(next > b && next < a)) next = 0.5 * (a + b);
    if (Math.abs(next - v) <= 1e-13 * Math.max(1, Math.abs(v))) return next;
    v = next;
  }
  throw new Error("solveMonotonic: no convergence");
}
