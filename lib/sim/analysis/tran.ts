/**
 * Transient analysis: trapezoidal integration of every charge/flux (companion models, REFERENCES §2.2), with
 * local-truncation-error step control from divided differences of the charges (Nagel 1975, ERL-M520; Pillage, Rohrer
 * & Visweswariah 1995 — REFERENCES §2.3), breakpoints at every wave corner and switch event, and one backward-Euler
 * step after each breakpoint (a slope discontinuity would otherwise excite trapezoidal ringing). Without a maxStep
 * from the caller, the accuracy defaults apply (tStep bounds the step; truncation error per unit step, see below).
 */
import { type Circuit, MODE_DC, MODE_TRAN } from "../circuit";
import { SimError } from "../errors";
import type { TranResult } from "../results";
import { checkpoint } from "../checkpoint";
import { newton, solveDc, worstName } from "./newton";

/**
 * Truncation-error control with the accuracy defaults (no maxStep given): error per unit step, relative to the
 * charge's full scale so far. Each step may add at most ACCURACY_TRTOL·trtol·(floor + reltol·max(|i|, peak |i|))·h
 * of error to a charge q (i = dq/dt), so errors summed over a run stay below reltol × the charge's range instead of
 * growing with the number of steps, and a current crossing zero does not collapse the step. The classic tolerance,
 * max(floor + reltol·|i|, reltol·|q|/h) (Nagel 1975), allows reltol·|q| per step whatever the step: measured
 * 0.55 % of full scale on a ringing RLC and 0.4 % on an emitter follower that cuts off each period, against 0.08 %
 * and 0.01 % with this one at 0.25 (the same circuits as tests/unit/lib/sim/tran-accuracy-*.test.ts). `floor` is
 * the state's absolute floor in its derivative's units (Circuit.stateAbsTol: abstol for a charge, vntol for an
 * inductor's flux).
 */
const ACCURACY_TRTOL = 0.25;
/**
 * Floor of that tolerance, as a fraction of the classic charge term reltol·|q|/h: below it a charge's divided
 * differences are Newton's own convergence noise, and chasing them would cut the step down to nothing while a
 * circuit is quiet (no current yet to set the scale).
 */
const CHARGE_FLOOR = 1e-2;

/** Growable columns for the accepted points. */
class Columns {
  cap = 256;
  len = 0;
  data: Float64Array[];
  constructor(readonly width: number) {
    this.data = Array.from({ length: width }, () => new Float64Array(this.cap));
  }
  grow(): void {
    this.cap *= 2;
    this.data = this.data.map((d) => { const n = new Float64Array(this.cap); n.set(d); return n; });
  }
}

export interface TranParams { tStop: number; tStep: number | null; maxStep: number | null; start: "op" | "ic" }

export function runTran(c: Circuit, a: TranParams, onProgress?: (f: number) => void): TranResult {
  const { tStop } = a;
  const tStep = a.tStep ?? tStop / 1000;
  // Accuracy defaults, unless the caller sets maxStep (and with it the step budget, as the design layer does):
  // - the output step, when given, bounds the internal step (the classic TMAX default, min(tStep, tStop/50)): the
  //   truncation-error control alone lets the step grow over what no charge sees (a sine through a diode into a
  //   resistor);
  // - the truncation-error tolerance is per unit step and relative to each charge's full scale (ACCURACY_TRTOL).
  // Periodic sources bound the step in both cases (their maxStepAt).
  const accuracyDefaults = a.maxStep === null;
  const maxStep = Math.min(a.maxStep ?? Math.min(a.tStep ?? Infinity, tStop / 50), tStop);
  const hmin = tStop * 1e-13;
  const { reltol, trtol } = c.tol;
  const chgtol = 1e-14;
  const els = c.elements;
  const nUser = c.userNodeNames.length;

  c.useWaves = true;
  c.time = 0;
  c.x.fill(0);
  if (a.start === "op") {
    solveDc(c, "the transient's initial operating point");
  } else {
    c.strictSingular = true; // a singular matrix at the first step is the circuit's fault
    for (const el of els) el.applyInitialCondition(c);
  }
  for (const el of els) el.initState(c, a.start === "ic");
  c.q2.set(c.q1); c.q3.set(c.q1);
  c.i0.set(c.i1); c.q0.set(c.q1);

  // breakpoints
  const bpList: number[] = [];
  for (const el of els) el.breakpoints(tStop, bpList);
  bpList.push(tStop);
  bpList.sort((p, q) => p - q);
  const bps: number[] = [];
  for (const t of bpList) if (t > hmin && (bps.length === 0 || t - bps[bps.length - 1] > hmin)) bps.push(t);
  let bpIdx = 0;

  const nCur = els.length;
  const cols = new Columns(1 + nUser + nCur);
  const record = (t: number) => {
    if (cols.len === cols.cap) cols.grow();
    const k = cols.len++;
    const d = cols.data;
    d[0][k] = t;
    for (let i = 0; i < nUser; i++) d[1 + i][k] = c.x[i];
    for (let e = 0; e < nCur; e++) d[1 + nUser + e][k] = els[e].current(c);
  };
  c.mode = MODE_DC;
  record(0);

  const xAcc = new Float64Array(c.x.length);
  let t = 0;
  let tm1 = 0, tm2 = 0; // earlier accepted times
  let history = 0; // accepted steps so far (for the truncation-error estimate)
  // The first two steps have no history for a truncation-error estimate: they start small (a tenth of the bounds,
  // a hundredth with the accuracy defaults, where the periodic sources' bounds count too) and double from there.
  let h = Math.min(tStep, maxStep, bps[0]) / 10;
  if (accuracyDefaults) {
    for (let e = 0; e < els.length; e++) h = Math.min(h, els[e].maxStepAt(0) / 10);
    h /= 10;
  }
  let order = 1;
  let accepted = 0, rejected = 0;
  const startIter = c.newtonIterations;
  const maxNewtonTran = Math.max(20, Math.min(c.tol.maxNewton, 50));
  const nState = c.nState;
  // largest |dq/dt| of each charge so far (accuracy defaults: the tolerance's scale)
  const iPeak = new Float64Array(nState);

  while (t < tStop - hmin) {
    if (accepted + rejected >= c.tol.maxSteps) {
      throw new SimError("budget", `Transient step budget (${c.tol.maxSteps} steps) exhausted at t = ${t.toPrecision(6)} s`);
    }
    const turn = accepted + rejected;
    if ((turn & 7) === 0) checkpoint(c); // every 8th step (a clock read costs ~0.1 µs, a step several µs)
    if ((turn & 31) === 0) onProgress?.(t / tStop);
    const nextBp = bps[bpIdx];
    let hmax = maxStep;
    for (let e = 0; e < els.length; e++) { const m = els[e].maxStepAt(t); if (m < hmax) hmax = m; }
    if (h > hmax) h = hmax;
    let hitBp = false;
    if (t + h >= nextBp - hmin) { h = nextBp - t; hitBp = true; }
    else if (t + 1.8 * h > nextBp) { h = (nextBp - t) / 2; } // avoid a sliver step before the breakpoint

    const tn = hitBp ? nextBp : t + h;
    c.time = tn;
    c.mode = MODE_TRAN;
    if (order === 1) { c.ag0 = 1 / h; c.trap = 0; } else { c.ag0 = 2 / h; c.trap = 1; }
    xAcc.set(c.x);
    if (!newton(c, maxNewtonTran)) {
      c.x.set(xAcc);
      rejected++;
      h /= 8;
      order = 1;
      if (h < hmin) {
        throw new SimError(
          "convergence",
          `Transient did not converge at t = ${t.toPrecision(6)} s at ${worstName(c)} (Newton failed with the step cut down to ${h.toExponential(2)} s)`,
        );
      }
      continue;
    }

    // truncation error → proposed next step
    let hNew = Infinity;
    if (history >= 2) {
      const t0 = tn, t1 = t, t2 = tm1, t3 = tm2;
      for (let s = 0; s < nState; s++) {
        const q0 = c.q0[s], q1 = c.q1[s], q2 = c.q2[s];
        const d10 = (q0 - q1) / (t0 - t1), d11 = (q1 - q2) / (t1 - t2);
        const d20 = (d10 - d11) / (t0 - t2);
        const iNow = Math.max(Math.abs(c.i0[s]), Math.abs(c.i1[s]));
        const floor = c.stateAbsTol[s]; // abstol for a charge, vntol for an inductor's flux
        const tol = accuracyDefaults
          ? Math.max(
              ACCURACY_TRTOL * (floor + reltol * Math.max(iNow, iPeak[s])),
              (CHARGE_FLOOR * reltol * Math.max(Math.abs(q0), Math.abs(q1), chgtol)) / h,
            )
          : Math.max(floor + reltol * iNow, (reltol * Math.max(Math.abs(q0), Math.abs(q1), chgtol)) / h);
        let hs: number;
        if (order === 1 || history < 3) {
          const q2nd = Math.abs(2 * d20);
          if (q2nd === 0) continue;
          hs = (2 * trtol * tol) / q2nd;
        } else {
          const d12 = (q2 - c.q3[s]) / (t2 - t3);
          const d21 = (d11 - d12) / (t1 - t3);
          const q3rd = Math.abs(6 * (d20 - d21) / (t0 - t3));
          if (q3rd === 0) continue;
          hs = Math.sqrt((12 * trtol * tol) / q3rd);
        }
        if (hs < hNew) hNew = hs;
      }
      if (hNew < 0.9 * h && h > 2 * hmin) {
        c.x.set(xAcc);
        rejected++;
        h = Math.max(hNew, h / 8);
        continue;
      }
    }

    // accept
    accepted++;
    history++;
    tm2 = tm1; tm1 = t; t = tn;
    c.q3.set(c.q2); c.q2.set(c.q1); c.q1.set(c.q0); c.i1.set(c.i0);
    if (accuracyDefaults) for (let s = 0; s < nState; s++) { const i = Math.abs(c.i0[s]); if (i > iPeak[s]) iPeak[s] = i; }
    record(t);
    const hPrev = h;
    if (hitBp) {
      bpIdx++;
      order = 1;
      const gap = bpIdx < bps.length ? bps[bpIdx] - t : maxStep;
      h = Math.min(hNew, 2 * hPrev, 0.1 * gap, tStep);
    } else {
      order = 2;
      h = Math.min(hNew, 2 * hPrev);
    }
    if (h < hmin) h = hmin * 2;
  }
  onProgress?.(1);
  const len = cols.len;
  const time = cols.data[0].slice(0, len);
  const nodes: Record<string, Float64Array> = {};
  for (let i = 0; i < nUser; i++) nodes[c.userNodeNames[i]] = cols.data[1 + i].slice(0, len);
  const currents: Record<string, Float64Array> = {};
  for (let e = 0; e < nCur; e++) currents[els[e].name] = cols.data[1 + nUser + e].slice(0, len);
  return { kind: "tran", time, nodes, currents, stats: { accepted, rejected, newtonIterations: c.newtonIterations - startIter } };
}
