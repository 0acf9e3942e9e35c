/**
 * Transient analysis: trapezoidal integration of every charge/flux (companion models, REFERENCES §2.2), with
 * local-truncation-error step control from divided differences of the charges (Nagel 1975, ERL-M520; Pillage, Rohrer
 * & Visweswariah 1995 — REFERENCES §2.3), breakpoints at every wave corner and switch event, and one backward-Euler
 * step after each breakpoint (a slope discontinuity would otherwise excite trapezoidal ringing).
 */
import { type Circuit, MODE_DC, MODE_TRAN } from "../circuit";
import { Capacitor } from "../elements/linear";
import { SimError } from "../errors";
import type { TranResult } from "../results";
import { checkBudget, newton, solveDc, worstName } from "./newton";

/**
 * Slope breaks. The trapezoidal error estimate h³·q'''/12 assumes a smooth charge; when a junction turns on or off
 * inside a step, the current's slope breaks there, the rule's error is a large fraction of the predictor difference
 * the estimate is built from, and the estimate falls short several-fold (measured: 4× on an emitter follower whose
 * transistor cuts off each period). A step whose third-derivative estimate jumps above KINK_RATIO × the charge's
 * recent level (the largest of the last estimates, each step's weight × KINK_DECAY) is treated as a break and held to
 * KINK_TOLERANCE × the usual tolerance. Ringing does not trip it: its level stays up between the zeros of q'''.
 */
const KINK_RATIO = 4;
const KINK_DECAY = 0.8;
const KINK_TOLERANCE = 0.1;

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
  // - the output step bounds the internal step (the classic TMAX default, min(tStep, tStop/50)): the truncation-error
  //   control alone lets the step grow over the peaks of a drive that no charge sees (a sine through a diode into a
  //   resistor), and its tolerance is relative, so coarse steps add up to visible errors;
  // - slope breaks (a junction turning on or off within a step) get a tighter truncation-error tolerance (KINK_*).
  // Periodic sources bound the step in both cases (their maxStepAt).
  const accuracyDefaults = a.maxStep === null;
  const maxStep = Math.min(a.maxStep ?? Math.min(tStep, tStop / 50), tStop);
  const hmin = tStop * 1e-13;
  const { reltol, abstol, trtol } = c.tol;
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
    for (const el of els) if (el instanceof Capacitor) {
      const [i, v] = el.icNode(c);
      if (i >= 0) c.x[i] = v;
    }
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
  // slope-break detection (accuracy defaults only): per charge, the recent level of the third-derivative estimate
  const kinkRatio = accuracyDefaults ? KINK_RATIO : Infinity;
  const d3Level = new Float64Array(nState).fill(Infinity);
  const d3New = new Float64Array(nState);

  while (t < tStop - hmin) {
    if (accepted + rejected >= c.tol.maxSteps) {
      throw new SimError("budget", `Transient step budget (${c.tol.maxSteps} steps) exhausted at t = ${t.toPrecision(6)} s`);
    }
    if (((accepted + rejected) & 31) === 0) {
      checkBudget(c);
      if (c.shouldStop?.()) throw new SimError("cancelled", "Simulation cancelled");
      onProgress?.(t / tStop);
    }
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
        const tol = Math.max(
          abstol + reltol * Math.max(Math.abs(c.i0[s]), Math.abs(c.i1[s])),
          (reltol * Math.max(Math.abs(q0), Math.abs(q1), chgtol)) / h,
        );
        let hs: number;
        if (order === 1 || history < 3) {
          const q2nd = Math.abs(2 * d20);
          if (q2nd === 0) continue;
          hs = (2 * trtol * tol) / q2nd;
        } else {
          const d12 = (q2 - c.q3[s]) / (t2 - t3);
          const d21 = (d11 - d12) / (t1 - t3);
          const q3rd = Math.abs(6 * (d20 - d21) / (t0 - t3));
          d3New[s] = q3rd;
          if (q3rd === 0) continue;
          const k = q3rd > kinkRatio * d3Level[s] ? KINK_TOLERANCE : 1;
          hs = Math.sqrt((12 * trtol * tol * k) / q3rd);
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
    if (order === 2 && history >= 4) {
      for (let s = 0; s < nState; s++) { const l = d3Level[s]; d3Level[s] = l === Infinity ? d3New[s] : Math.max(d3New[s], KINK_DECAY * l); }
    } else d3Level.fill(Infinity); // after a breakpoint the level starts again from the first trapezoidal step
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
