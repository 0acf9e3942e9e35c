/**
 * Newton–Raphson on the MNA equations with device-level junction limiting and a per-device current convergence test
 * (Nagel 1975, ERL-M520; REFERENCES §1.5), and the DC fallbacks in order: damped Newton (every node's change per
 * iteration bounded), gmin stepping and source stepping (Najm, "Circuit Simulation", 2010, DC chapter; Grasser 1999
 * §6.2.1 — REFERENCES §2.4). Nothing in the Newton loop allocates.
 */
import { type Circuit, MODE_DC } from "../circuit";
import { SimError } from "../errors";
import { LU_REORDER } from "../sparse";
import { checkpoint } from "../checkpoint";

/** V: largest node-voltage change per iteration in the damped-Newton stage of the DC solve */
const DAMPED_STEP = 2;
/** iterations of plain Newton before the damped stage */
const PLAIN_ITER = 25;

/** One matrix load at c.x into c.mat / c.rhs: the constant stamps are copied in, then the dynamic ones added. */
export function loadAll(c: Circuit): void {
  const m = c.mat;
  // One block copy of the constant stamps (a memcpy: several times faster than copying only the LU's positions one
  // by one). Positions the LU does not use get static values too, which nothing reads; fill-in positions are zero in
  // staticMat, as a factorisation needs them. The spare ground row/column is reset so it cannot grow.
  m.set(c.staticMat);
  if (c.lu.analysed) {
    const T = c.trash;
    for (let q = 0; q < T.length; q++) m[T[q]] = 0;
  }
  c.rhs.fill(0);
  c.noncon = 0;
  const els = c.dynamicElements;
  for (let i = 0; i < els.length; i++) els[i].load(c);
  const gs = c.gshunt;
  if (gs !== 0) {
    const d = c.diag;
    for (let i = 0; i < d.length; i++) c.mat[d[i]] += gs;
  }
}

/** Factor and solve c.mat·out = c.rhs (c.mat is overwritten by its factors); throws "singular" naming the unknown. */
export function solveInto(c: Circuit, out: Float64Array): void {
  const lu = c.lu;
  const m = c.mat, bk = c.matBackup;
  // factor() writes only structural/fill positions, so those are all a retry needs restored (the backup is one
  // block copy, cheaper than copying those positions one by one)
  const P = lu.positions;
  bk.set(m);
  let r = lu.analysed ? lu.factor(m) : LU_REORDER;
  if (r === LU_REORDER) {
    for (let q = 0; q < P.length; q++) m[P[q]] = bk[P[q]];
    const bad = lu.analyse(c.mat);
    if (bad >= 0) throw singular(c, bad);
    // fill-in positions of the new order may hold stale factors from an older one: they start at zero
    const P2 = lu.positions, st = c.structure;
    for (let q = 0; q < P2.length; q++) if (!st[P2[q]]) m[P2[q]] = 0;
    r = lu.factor(c.mat);
    if (r !== -1) throw singular(c, r === LU_REORDER ? 0 : r);
  }
  lu.solve(c.mat, c.rhs, out);
  out[c.n] = 0;
}

function singular(c: Circuit, k: number): SimError {
  return new SimError(
    "singular",
    `Singular circuit matrix at ${c.unknownNames[k] ?? `unknown ${k}`}: the circuit has no unique solution there ` +
      `(check for a floating node, a loop of voltage sources, or a current source in series with nothing else)`,
  );
}

/**
 * Newton iterations from c.x. Returns true when converged (solution left in c.x).
 * Convergence: every unknown's update within reltol·|x| + (vntol for voltages | abstol for currents) and no device
 * limited its voltages in the last load.
 */
export function newton(c: Circuit, maxIter: number, maxNodeStep = 0): boolean {
  const n = c.n;
  const nn = c.numNodes;
  const { reltol, vntol, abstol } = c.tol;
  for (let iter = 0; iter < maxIter; iter++) {
    c.newtonIterations++;
    loadAll(c);
    const xn = c.xNew;
    try {
      solveInto(c, xn);
    } catch (e) {
      // A matrix singular at the very first iteration of an analysis is the circuit's own fault (reported as
      // such); one that turns singular later (a device driven into a corner where its slopes vanish) is a failed
      // Newton run, for the caller's next strategy or a smaller time step.
      if (!(e instanceof SimError) || e.code !== "singular" || (iter === 0 && c.strictSingular)) throw e;
      c.worstUnknown = -1;
      c.singularAt = e.message;
      return false;
    }
    c.strictSingular = false;
    const xo = c.x;
    if (maxNodeStep > 0 && iter > 0) {
      // damped Newton: shrink the whole update so no node voltage moves more than maxNodeStep (the first
      // iteration is left whole, so nodes fixed by sources land at once)
      let big = 0;
      for (let i = 0; i < nn; i++) { const d = Math.abs(xn[i] - xo[i]); if (d > big) big = d; }
      if (big > maxNodeStep) {
        const a = maxNodeStep / big;
        for (let i = 0; i < n; i++) xn[i] = xo[i] + a * (xn[i] - xo[i]);
        c.noncon++;
      }
    }
    let ok = true;
    let worst = -1;
    let worstRatio = 0;
    for (let i = 0; i < n; i++) {
      const a = xn[i], b = xo[i];
      if (a !== a) { ok = false; worst = i; worstRatio = Infinity; break; } // NaN
      const tol = reltol * Math.max(Math.abs(a), Math.abs(b)) + (i < nn ? vntol : abstol);
      const r = Math.abs(a - b) / tol;
      if (r > 1) { ok = false; if (r > worstRatio) { worstRatio = r; worst = i; } }
    }
    c.xNew = xo;
    c.x = xn;
    if (worstRatio === Infinity) { c.worstUnknown = worst; c.x.fill(0); return false; }
    if (ok && c.noncon === 0 && iter > 0) return true;
    c.worstUnknown = worst;
    // every 32nd iteration of the whole analysis (continuation makes many short Newton runs; a transient's step loop
    // polls on its own)
    if ((c.newtonIterations & 31) === 0) checkpoint(c);
  }
  return false;
}

/** Name of the unknown that moved most in the last failed Newton run. */
export function worstName(c: Circuit): string {
  if (c.worstUnknown >= 0) return c.unknownNames[c.worstUnknown] ?? "?";
  return c.singularAt ? `a singular matrix (${c.singularAt.replace(/ \(check.*$/, "")})` : "(none)";
}

/**
 * DC operating point from the guess in c.x: plain Newton, then gmin stepping, then source stepping.
 * Throws SimError "convergence" naming the node that would not settle and every method tried.
 */
export function solveDc(c: Circuit, what: string): void {
  c.mode = MODE_DC;
  c.strictSingular = true;
  c.singularAt = "";
  const maxIter = c.tol.maxNewton;
  const guess = c.x.slice();
  c.dcMethod = "newton";
  // plain Newton gets a shorter leash: a circuit it can solve converges well within it, and one where it cycles
  // between saturated states should reach the damped stage quickly
  const plainIter = Math.min(maxIter, PLAIN_ITER);
  if (newton(c, plainIter)) return;
  const tried: string[] = [`Newton–Raphson (${plainIter} iterations; largest change at ${worstName(c)})`];

  // damped Newton: a high-gain loop with saturating parts (op-amp, pass device) can make plain Newton jump between
  // the rails forever; limiting every node's change per iteration (the direction-preserving "damped Newton" of the
  // limiting schemes, Najm 2010 ch. on DC analysis) walks it to the solution instead.
  c.x.set(guess);
  c.dcMethod = "damped";
  if (newton(c, 2 * maxIter, DAMPED_STEP)) return;
  tried.push(`damped Newton (${2 * maxIter} iterations, ≤ ${DAMPED_STEP} V per step; largest change at ${worstName(c)})`);

  // gmin stepping: a shunt from every node to ground, from 1e-2 S down to nothing; the reduction factor adapts
  // (÷10 while steps converge, its square root after a failure, from the last converged solution).
  c.x.set(guess);
  const good = new Float64Array(c.x.length);
  let gs = 1e-2;
  let factor = 10;
  let gmOk = false;
  c.gshunt = gs;
  let first = newton(c, maxIter);
  if (!first) { c.gshunt = gs = 1; c.x.set(guess); first = newton(c, maxIter); }
  if (first) {
    good.set(c.x);
    for (let guard = 0; guard < 200; guard++) {
      const next = gs / factor;
      c.gshunt = next <= 1e-13 ? 0 : next;
      if (newton(c, maxIter)) {
        if (c.gshunt === 0) { gmOk = true; break; }
        gs = next;
        good.set(c.x);
        factor = Math.min(factor * factor, 10);
      } else {
        c.x.set(good);
        factor = Math.sqrt(factor);
        if (factor < 1.05) break;
      }
    }
  }
  c.gshunt = 0;
  c.dcMethod = "gmin";
  if (gmOk) return;
  tried.push(`gmin stepping (stuck at ${gs.toExponential(1)} S; largest change at ${worstName(c)})`);

  // source stepping: scale every independent source from 0 to 1, adapting the increment.
  c.x.fill(0);
  const last = new Float64Array(c.x.length);
  let alpha = 0;
  let step = 0.1;
  c.srcScale = 0;
  let ok = newton(c, maxIter);
  if (!ok) {
    // with all sources off a tiny shunt helps the first solve
    c.gshunt = 1e-9;
    ok = newton(c, maxIter);
    c.gshunt = 0;
  }
  if (ok) {
    last.set(c.x);
    while (alpha < 1) {
      const next = Math.min(1, alpha + step);
      c.srcScale = next;
      if (newton(c, maxIter)) {
        alpha = next;
        last.set(c.x);
        step = Math.min(step * 2, 0.5);
      } else {
        c.x.set(last);
        step /= 4;
        if (step < 1e-6) break;
      }
    }
  }
  c.srcScale = 1;
  c.dcMethod = "source";
  if (alpha >= 1) return;
  tried.push(`source stepping (stuck at ${(alpha * 100).toFixed(4)} % of the sources; largest change at ${worstName(c)})`);
  throw new SimError("convergence", `No convergence for ${what} at ${worstName(c)}. Tried: ${tried.join("; ")}`);
}
