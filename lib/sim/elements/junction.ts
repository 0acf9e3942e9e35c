/** pn-junction helpers shared by the diode and the BJT. */

/**
 * Critical voltage of a junction: where the exponential's radius of curvature is smallest.
 * Nagel 1975 (ERL-M520), junction-limiting chapter: Vcrit = nVt·ln(nVt/(√2·Is)). REFERENCES §1.5.
 */
export function criticalVoltage(nvt: number, is: number): number {
  return nvt * Math.log(nvt / (Math.SQRT2 * is));
}

/**
 * Junction-voltage limiting for Newton–Raphson ("pnjlim"), Nagel 1975 (ERL-M520); REFERENCES §1.5.
 * Returns the limited voltage; the caller compares it with vnew to know whether limiting happened.
 */
export function pnjlim(vnew: number, vold: number, nvt: number, vcrit: number): number {
  if (vnew > vcrit && Math.abs(vnew - vold) > 2 * nvt) {
    if (vold > 0) {
      const arg = 1 + (vnew - vold) / nvt;
      return arg > 0 ? vold + nvt * Math.log(arg) : vcrit;
    }
    return nvt * Math.log(vnew / nvt);
  }
  return vnew;
}

/**
 * Largest junction voltage a Newton iteration may linearise at: where the junction would carry 1 MA. Junction
 * limiting lets the voltage creep up by ~Vt·ln(ΔV/Vt) per iteration; while a circuit is far from its solution that
 * creep can reach currents whose conductances (1e17 S and more) cancel catastrophically in the LU. A safeguard of our
 * own; no real solution is anywhere near it.
 */
export function junctionCeiling(nvt: number, is: number): number {
  return nvt * Math.log(1e6 / is);
}

/** Exponent cap: beyond it exp continues linearly, so a wild iterate cannot overflow to Infinity. */
const EXP_MAX = 80;
const E_MAX = Math.exp(EXP_MAX);

/** exp(x), continued linearly above EXP_MAX (value and slope stay consistent). */
export function expLim(x: number): number {
  return x > EXP_MAX ? E_MAX * (1 + x - EXP_MAX) : Math.exp(x);
}
/** d/dx of expLim */
export function expLimSlope(x: number): number {
  return x > EXP_MAX ? E_MAX : Math.exp(x);
}

/** Forward-bias coefficient where the depletion formula is continued linearly (Fc, REFERENCES §1.4). */
export const FC = 0.5;

// (1−Fc)^{1−m} and (1−Fc)^{1+m} for the last grading coefficient seen (junctions usually share m)
let cacheM = NaN;
let cacheA = 0;
let cacheF2 = 0;

/**
 * Depletion charge and capacitance of a junction, Cj0/(1−V/Vj)^m below Fc·Vj and its linear continuation above
 * (Gray & Meyer; Nagel 1975; REFERENCES §1.4). Writes [q, C] into out.
 */
export function depletion(v: number, cj0: number, vj: number, m: number, out: Float64Array): void {
  if (cj0 === 0) { out[0] = 0; out[1] = 0; return; }
  const fcv = FC * vj;
  if (v < fcv) {
    const arg = 1 - v / vj;
    const s = Math.pow(arg, -m);
    out[0] = ((cj0 * vj) / (1 - m)) * (1 - arg * s);
    out[1] = cj0 * s;
  } else {
    if (m !== cacheM) { cacheM = m; cacheA = Math.pow(1 - FC, 1 - m); cacheF2 = Math.pow(1 - FC, 1 + m); }
    const f1 = (vj / (1 - m)) * (1 - cacheA);
    const f2 = cacheF2;
    const f3 = 1 - FC * (1 + m);
    out[0] = cj0 * (f1 + (1 / f2) * (f3 * (v - fcv) + (m / (2 * vj)) * (v * v - fcv * fcv)));
    out[1] = (cj0 / f2) * (f3 + (m * v) / vj);
  }
}
