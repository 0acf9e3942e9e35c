/**
 * What the design checks are made of: the row and caution types, and the hand formulas the checks and cautions
 * share (full-scale current, drive, path supply, dissipation, junction temperature, accuracy budget).
 */
import type { OperatingPointData } from "./op-words";
import { cableResistance, dividerRatio, idealTransconductance, thermalVoltage } from "./compile";
import type { Scenario } from "./schema";

export type Verdict = "pass" | "warn" | "fail";

export interface CheckRow {
  id: string;
  label: string;
  verdict: Verdict;
  value: number;
  limit: number;
  unit: string;
  formula: string;
  detail: string;
  /** "margin": the value is a margin (distance to the limit), not the quantity itself */
  valueKind?: "margin";
  /** whether the value must be at least ("min") or at most ("max") the limit, where one of the two is meant */
  limitKind?: "min" | "max";
}

export interface Caution {
  id: string;
  title: string;
  text: string;
}

export interface BudgetTerm {
  id: string;
  label: string;
  /** worst-case contribution, fraction of full scale (signed where the sign is known) */
  fraction: number;
}

export interface AccuracyBudget {
  terms: BudgetTerm[];
  worstCase: number;
  rss: number;
}

/** What the checks read from an operating point (the engine's OpResult satisfies it). */
export type OpLike = OperatingPointData;

/** The sentence every caution ends with. */
export const DEFERENCE = "This is a reminder, not an approval: follow your local codes and licensed practice.";

/** A number for a sentence: 3 significant digits. */
export const fmt = (x: number, d = 3) => (Number.isFinite(x) ? Number(x.toPrecision(d)).toString() : String(x));

/** Full-scale load current, A (magnitude). */
export function fullScaleCurrent(s: Scenario): number {
  return Math.abs(idealTransconductance(s) * s.stimulus.commandFullScale);
}

/** Effective β of the pass stage for the base-current error (Darlington: β1β2 + β1 + β2). */
export function effectiveBeta(s: Scenario, beta = s.pass.betaMin): number {
  if (s.template === "sink-darlington") return beta * beta + 2 * beta;
  return beta;
}

/** Fraction of the regulated (emitter) current that misses the load: 1/(β+1) for BJTs, 0 for MOSFETs and Howland. */
export function baseCurrentError(s: Scenario, beta = s.pass.betaMin): number {
  if (!usesBjt(s)) return 0;
  return 1 / (effectiveBeta(s, beta) + 1);
}

export function usesBjt(s: Scenario): boolean {
  if (s.template === "sink-npn" || s.template === "sink-darlington") return true;
  if (s.template === "source-highside") return s.pass.kind === "pnp" || s.pass.kind === "npn";
  return false;
}

export function usesMos(s: Scenario): boolean {
  return s.template === "sink-nmos" || (s.template === "source-highside" && (s.pass.kind === "pmos" || s.pass.kind === "nmos"));
}

/** Supply the load path works from, V: the load supply plus the cell voltage for a discharged cell. */
export function pathSupply(s: Scenario, cellV: number): number {
  if (s.load.kind === "cell") {
    return s.template === "source-highside" || s.template === "howland" ? s.supplies.load - cellV : s.supplies.load + cellV;
  }
  return s.supplies.load;
}

/** Voltage across an LED string at current i, V. */
export function ledDrop(s: Scenario, i: number): number {
  const L = s.load;
  return i > 0 ? L.ledCount * L.ledN * thermalVoltage(s.thermal.ambient) * Math.log(i / L.ledIs + 1) : 0;
}

/** Resistance in the load path apart from the load itself: sense (when in the path) + cable, Ω. */
export function pathResistance(s: Scenario): number {
  return (s.template === "howland" ? 0 : s.parts.senseResistor) + cableResistance(s);
}

/**
 * Control-terminal drive the pass device needs at current i: V(BE)/V(GS), V, and the current through the base/gate
 * resistor, A (base current, plus V(BE or GS)/R when a base–emitter or gate–source resistor is fitted).
 */
export function driveVoltage(s: Scenario, i: number): { vControl: number; iControl: number } {
  const d = deviceDrive(s, i);
  const rbe = s.template === "howland" ? null : s.networks.baseEmitterResistor;
  return rbe === null ? d : { vControl: d.vControl, iControl: d.iControl + d.vControl / rbe };
}

function deviceDrive(s: Scenario, i: number): { vControl: number; iControl: number } {
  const vt = thermalVoltage(s.thermal.ambient);
  const p = s.pass;
  if (usesMos(s)) return { vControl: p.Vth + Math.sqrt(Math.max(i, 0) / p.K), iControl: 0 };
  const beta = p.betaF;
  if (s.template === "sink-darlington") {
    const ib2 = i / beta;
    const ib1 = ib2 / beta;
    const vbe2 = vt * Math.log(i / p.Is + 1);
    const vbe1 = vt * Math.log(ib2 / (0.1 * p.Is) + 1);
    return { vControl: vbe1 + vbe2, iControl: ib1 };
  }
  return { vControl: vt * Math.log(i / p.Is + 1), iControl: i / beta };
}

export function verdictAtMost(value: number, warnAbove: number, failAbove: number): Verdict {
  return value > failAbove ? "fail" : value > warnAbove ? "warn" : "pass";
}

/** The DC accuracy budget at full scale, as fractions of full scale. */
export function accuracyBudget(s: Scenario): AccuracyBudget {
  const p = s.parts;
  const t = s.tolerances;
  const iFs = fullScaleCurrent(s);
  const vSense = iFs * p.senseResistor;
  const span = t.temperatureSpan;
  const terms: BudgetTerm[] = [];
  const o = s.opamp;
  if (s.template === "howland") {
    // I = Vin·R2/(R1·Rs): referred to the op-amp, the offset appears across Rs scaled by the noise gain.
    const vin = s.stimulus.commandFullScale;
    const refVoltage = vin * (p.howlandR2 / p.howlandR1);
    const ng = 1 + p.howlandR4 / p.howlandR3;
    terms.push({ id: "offset", label: "Offset voltage", fraction: (o.vosMax * ng) / refVoltage });
    terms.push({ id: "bias", label: "Bias current through R1∥R2 and R3∥R4", fraction: (o.ibMax * ng * (p.howlandR1 * p.howlandR2) / (p.howlandR1 + p.howlandR2)) / refVoltage });
    // Bridge mismatch and gain resistors: four resistors, each ±tol.
    terms.push({ id: "resistors", label: "R1–R4 tolerances", fraction: 2 * t.resistor });
    terms.push({ id: "sense", label: "Sense-resistor tolerance", fraction: t.sense });
    terms.push({ id: "drift", label: "Drift over the temperature span", fraction: (o.vosDrift * span * ng) / refVoltage + 2 * t.resistorTempco * span });
  } else {
    const k = dividerRatio(s);
    const rPar = (p.dividerTop * p.dividerBottom) / (p.dividerTop + p.dividerBottom);
    terms.push({ id: "offset", label: "Offset voltage", fraction: o.vosMax / vSense });
    terms.push({ id: "bias", label: "Bias current through the feedback resistor and divider", fraction: (o.ibMax * (p.feedbackResistor + rPar)) / vSense });
    terms.push({ id: "divider", label: "Divider tolerances", fraction: 2 * t.resistor * (1 - k) });
    terms.push({ id: "sense", label: "Sense-resistor tolerance", fraction: t.sense });
    const base = baseCurrentError(s);
    if (base > 0) terms.push({ id: "base-current", label: "Base current (load gets Ie·β/(β+1))", fraction: -base });
    const selfHeat = iFs * iFs * p.senseResistor * s.thermal.senseThetaA;
    terms.push({
      id: "drift",
      label: "Drift: offset drift, resistor tempco, sense self-heating",
      fraction: (o.vosDrift * span) / vSense + 2 * t.resistorTempco * span * (1 - k) + t.resistorTempco * (span + selfHeat),
    });
    const { vControl, iControl } = driveVoltage(s, iFs);
    const vOut = vSense + vControl + iControl * p.baseResistor;
    terms.push({ id: "open-loop-gain", label: "Finite open-loop gain", fraction: vOut / (o.Aol * vSense) });
    if (s.stimulus.sourceResistance > 0) {
      const rin = p.dividerTop + p.dividerBottom;
      terms.push({ id: "source-loading", label: "Command source loaded by the divider", fraction: -s.stimulus.sourceResistance / (s.stimulus.sourceResistance + rin) });
    }
  }
  let worst = 0, ss = 0;
  for (const term of terms) { worst += Math.abs(term.fraction); ss += term.fraction * term.fraction; }
  return { terms, worstCase: worst, rss: Math.sqrt(ss) };
}

/** Worst-case pass-device dissipation over the command range and the load range, W, and where it occurs. */
export function worstDissipation(s: Scenario): { power: number; current: number; loadResistance: number; vDrop: number } {
  const iFs = fullScaleCurrent(s);
  const L = s.load;
  const cellV = L.kind === "cell" ? (s.template === "source-highside" || s.template === "howland" ? L.cellVoltageMin : L.cellVoltageMax) : 0;
  const vPath = pathSupply(s, cellV);
  const rMin = L.kind === "led" ? L.resistance : L.resistanceMin;
  const rTot = rMin + pathResistance(s);
  // P(I) = I·(V − Vled(I) − I·Rtot): scan the command range (the LED drop makes it non-quadratic).
  let best = { power: 0, current: 0, loadResistance: rMin, vDrop: 0 };
  const n = 400;
  for (let k = 1; k <= n; k++) {
    const i = (iFs * k) / n;
    const v = vPath - (L.kind === "led" ? ledDrop(s, i) : 0) - i * rTot;
    const pw = i * Math.max(v, 0);
    if (pw > best.power) best = { power: pw, current: i, loadResistance: rMin, vDrop: v };
  }
  if (s.template === "howland") {
    // Op-amp output stage: the rail-to-output drop times the output current.
    const vRail = s.supplies.opampPositive;
    let bp = 0, bi = 0;
    for (let k = 1; k <= n; k++) {
      const i = (iFs * k) / n;
      const pw = i * (vRail - i * (rMin + s.parts.senseResistor));
      if (pw > bp) { bp = pw; bi = i; }
    }
    best = { power: bp, current: bi, loadResistance: rMin, vDrop: bp / Math.max(bi, 1e-30) };
  }
  return best;
}

/** Closed form for a resistive path: P = I(V − I·R), largest at I* = V/(2R) (P = V²/4R) when I* is within range. */
export function dissipationMaximum(vSupply: number, rTotal: number, iMax: number): { power: number; current: number } {
  const iStar = vSupply / (2 * rTotal);
  if (iStar <= iMax) return { power: (vSupply * vSupply) / (4 * rTotal), current: iStar };
  return { power: iMax * (vSupply - iMax * rTotal), current: iMax };
}

/** Junction temperature Tj = Ta + P·(θjc + θcs + θsa), or Ta + P·θja with no heatsink. */
export function junctionTemperature(s: Scenario, power: number): { tj: number; thetaTotal: number } {
  const th = s.thermal;
  const thetaTotal = th.thetaSA === null ? s.pass.thetaJA : s.pass.thetaJC + th.thetaCS + th.thetaSA;
  return { tj: th.ambient + power * thetaTotal, thetaTotal };
}
