/**
 * Design checks: a table of pass / warn / fail rows, each with its numbers and the formula used, and cautions that
 * defer to local codes and licensed practice. Hand formulas from the scenario; when an operating point is given, its
 * measured values are checked too.
 */
import { NAMES, cableResistance, dividerRatio, idealTransconductance, thermalVoltage } from "./compile";
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
export interface OpLike {
  nodes: Record<string, number>;
  currents: Record<string, number>;
  devices: Record<string, object>;
}

const DEFERENCE = "This is a reminder, not an approval: follow your local codes and licensed practice.";

const fmt = (x: number, d = 3) => (Number.isFinite(x) ? Number(x.toPrecision(d)).toString() : String(x));

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

function usesBjt(s: Scenario): boolean {
  if (s.template === "sink-npn" || s.template === "sink-darlington") return true;
  if (s.template === "source-highside") return s.pass.kind === "pnp" || s.pass.kind === "npn";
  return false;
}

function usesMos(s: Scenario): boolean {
  return s.template === "sink-nmos" || (s.template === "source-highside" && (s.pass.kind === "pmos" || s.pass.kind === "nmos"));
}

/** Supply the load path works from, V: the load supply plus the cell voltage for a discharged cell. */
function pathSupply(s: Scenario, cellV: number): number {
  if (s.load.kind === "cell") {
    return s.template === "source-highside" || s.template === "howland" ? s.supplies.load - cellV : s.supplies.load + cellV;
  }
  return s.supplies.load;
}

/** Voltage across an LED string at current i, V. */
function ledDrop(s: Scenario, i: number): number {
  const L = s.load;
  return i > 0 ? L.ledCount * L.ledN * thermalVoltage(s.thermal.ambient) * Math.log(i / L.ledIs + 1) : 0;
}

/** Resistance in the load path apart from the load itself: sense (when in the path) + cable, Ω. */
function pathResistance(s: Scenario): number {
  return (s.template === "howland" ? 0 : s.parts.senseResistor) + cableResistance(s);
}

/** Control-terminal drive the pass device needs at current i: V(BE)/V(GS) plus the base-resistor drop, V. */
export function driveVoltage(s: Scenario, i: number): { vControl: number; iControl: number } {
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

function verdictAtMost(value: number, warnAbove: number, failAbove: number): Verdict {
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

export function runChecks(s: Scenario, op?: OpLike): { checks: CheckRow[]; cautions: Caution[]; budget: AccuracyBudget } {
  const rows: CheckRow[] = [];
  const p = s.parts;
  const L = s.load;
  const iFs = fullScaleCurrent(s);
  const howland = s.template === "howland";
  const highSide = s.template === "source-highside";
  const vcc = s.supplies.opampPositive;
  const vee = s.supplies.opampNegative;
  const swingH = s.opamp.swingHigh ?? 0;
  const swingL = s.opamp.swingLow ?? 0;
  const outMax = vcc - swingH;
  const outMin = vee + swingL;

  // 1. Headroom and compliance at full current and the heaviest load.
  const rMax = L.kind === "led" ? L.resistance : L.resistanceMax;
  const cellWorst = L.kind === "cell" ? (highSide || howland ? L.cellVoltageMax : L.cellVoltageMin) : 0;
  const vPath = pathSupply(s, cellWorst);
  const loadV = L.kind === "led" ? ledDrop(s, iFs) + iFs * rMax : iFs * rMax;
  if (!howland) {
    const vPass = vPath - loadV - iFs * pathResistance(s);
    let need: number;
    let needText: string;
    if (usesMos(s)) {
      need = Math.sqrt(iFs / s.pass.K);
      needText = "VDS ≥ VGS − Vth = √(I/K)";
    } else if (s.template === "sink-darlington") {
      need = s.pass.vSat + 0.7;
      needText = "VCE ≥ VCE(sat) + VBE of the output transistor";
    } else {
      need = s.pass.vSat;
      needText = "VCE ≥ VCE(sat)";
    }
    rows.push({
      id: "compliance",
      label: "Headroom at full current, heaviest load",
      verdict: vPass < need ? "fail" : vPass < need + 0.5 ? "warn" : "pass",
      value: vPass,
      limit: need,
      unit: "V",
      formula: `Vpass = Vsupply − Vload(I, Rload,max) − I·(Rsense + Rcable); ${needText}`,
      detail: `I = ${fmt(iFs)} A, Rload,max = ${fmt(rMax)} Ω, Vload = ${fmt(loadV)} V, path supply = ${fmt(vPath)} V; warn within 0.5 V of the limit (common practice).`,
    });
  } else {
    const vOutNeed = iFs * (p.senseResistor + rMax + cableResistance(s)) + (L.kind === "led" ? ledDrop(s, iFs) : 0);
    rows.push({
      id: "compliance",
      label: "Output swing for full current into the heaviest load",
      verdict: vOutNeed > outMax ? "fail" : vOutNeed > outMax - 0.5 ? "warn" : "pass",
      value: vOutNeed,
      limit: outMax,
      unit: "V",
      formula: "Vout = I·(Rs + Rload,max + Rcable) ≤ Vcc − swing",
      detail: `I = ${fmt(iFs)} A; the command range is bipolar, so the negative side needs the same below ground.`,
    });
  }

  // 2. Op-amp output must reach sense + control voltage + base-resistor drop.
  if (!howland) {
    const { vControl, iControl } = driveVoltage(s, iFs);
    const vSense = iFs * p.senseResistor;
    if (!highSide) {
      const need = vSense + vControl + iControl * p.baseResistor;
      rows.push({
        id: "drive",
        label: "Op-amp output reaches the drive it needs",
        verdict: need > outMax ? "fail" : need > outMax - 0.2 ? "warn" : "pass",
        value: need,
        limit: outMax,
        unit: "V",
        formula: "Vout = I·Rsense + V(BE or GS) + Ib·Rbase ≤ Vcc − swing",
        detail: `V(control) = ${fmt(vControl)} V, Ib = ${fmt(iControl)} A through ${fmt(p.baseResistor)} Ω; warn within 0.2 V.`,
      });
    } else {
      const vs = s.supplies.load;
      const need = vs - vSense - vControl - iControl * p.baseResistor;
      rows.push({
        id: "drive",
        label: "Op-amp output swings low enough for full current",
        verdict: need < outMin ? "fail" : need < outMin + 0.2 ? "warn" : "pass",
        value: need,
        limit: outMin,
        unit: "V",
        formula: "Vout = Vsupply − I·Rsense − V(EB or SG) − Ib·Rbase ≥ Vee + swing",
        detail: `V(control) = ${fmt(vControl)} V, Ib = ${fmt(iControl)} A.`,
      });
      const offNeed = vs - 0.4;
      rows.push({
        id: "turn-off",
        label: "Op-amp output rises far enough to turn the pass device off",
        verdict: outMax < offNeed ? "warn" : "pass",
        value: outMax,
        limit: offNeed,
        unit: "V",
        formula: "Vcc − swing ≥ Vsupply − 0.4 V (pass device below its turn-on voltage; common practice)",
        detail: "Otherwise a zero command still leaves some current flowing.",
      });
    }
    // Worst case: the smallest β of the production spread (Darlington: the product of both stages).
    const iDrive = usesBjt(s) ? iFs / effectiveBeta(s) : iControl;
    if (s.opamp.Iout !== null) {
      rows.push({
        id: "drive-current",
        label: "Op-amp output current at full scale, lowest β",
        verdict: verdictAtMost(iDrive, 0.7 * s.opamp.Iout, s.opamp.Iout),
        value: iDrive,
        limit: s.opamp.Iout,
        unit: "A",
        formula: "Ib = I/βmin (gate: 0 at DC) ≤ Iout limit; warn above 70 %",
        detail: usesBjt(s) ? `βmin = ${fmt(s.pass.betaMin)}; at the typical β ${fmt(s.pass.betaF)} it is ${fmt(iControl)} A` : "Gate current flows only while the gate charges.",
      });
    }
  }

  // 3. Input common-mode range.
  {
    let lo: number, hi: number;
    if (howland) {
      const vin = s.stimulus.commandFullScale;
      const vl = iFs * rMax;
      const vp = (vin * p.howlandR2 + vl * p.howlandR1) / (p.howlandR1 + p.howlandR2);
      lo = -vp; hi = vp;
    } else if (highSide) {
      lo = s.supplies.load - iFs * p.senseResistor; hi = s.supplies.load;
    } else {
      lo = 0; hi = iFs * p.senseResistor;
    }
    const cmMin = vee + s.opamp.cmLowFromVee;
    const cmMax = vcc - s.opamp.cmHighFromVcc;
    const ok = lo >= cmMin && hi <= cmMax;
    const margin = Math.min(lo - cmMin, cmMax - hi);
    rows.push({
      id: "common-mode",
      label: "Op-amp inputs within their common-mode range",
      verdict: ok ? (margin < 0.1 ? "warn" : "pass") : "fail",
      value: margin,
      limit: 0,
      unit: "V",
      formula: "Vee + CM,low ≤ V(inputs) ≤ Vcc − CM,high",
      detail: `inputs span ${fmt(lo)} … ${fmt(hi)} V; range ${fmt(cmMin)} … ${fmt(cmMax)} V; warn under 0.1 V margin.`,
    });
  }

  // 4. Worst-case dissipation and junction temperature.
  const diss = worstDissipation(s);
  const { tj, thetaTotal } = junctionTemperature(s, diss.power);
  const device = howland ? "op-amp output stage" : "pass device";
  if (!howland) {
    rows.push({
      id: "dissipation",
      label: "Worst-case pass-device dissipation",
      verdict: verdictAtMost(diss.power, 0.5 * s.pass.pMax, s.pass.pMax),
      value: diss.power,
      limit: s.pass.pMax,
      unit: "W",
      formula: "P = I·(Vsupply − I·(Rload + Rsense + Rcable)), maximum over I ∈ [0, Ifs] at the lightest load; V²/4R when I* = V/2R is in range",
      detail: `at I = ${fmt(diss.current)} A, Rload = ${fmt(diss.loadResistance)} Ω, drop ${fmt(diss.vDrop)} V; rating at 25 °C case; warn above half of it.`,
    });
  }
  rows.push({
    id: "junction-temperature",
    label: `Junction temperature of the ${device}`,
    verdict: howland ? "pass" : tj > s.pass.tjMax ? "fail" : tj > s.pass.tjMax - 25 ? "warn" : "pass",
    value: tj,
    limit: s.pass.tjMax,
    unit: "°C",
    formula: s.thermal.thetaSA === null ? "Tj = Ta + P·θja (no heatsink)" : "Tj = Ta + P·(θjc + θcs + θsa)",
    detail: `P = ${fmt(diss.power)} W, Σθ = ${fmt(thetaTotal)} °C/W, Ta = ${fmt(s.thermal.ambient)} °C; warn within 25 °C of the rating (common practice).`,
  });

  // 5. Simple safe operating area: current, voltage and derated power.
  if (!howland) {
    const vMaxSeen = Math.max(pathSupply(s, L.kind === "cell" ? L.cellVoltageMax : 0), s.supplies.load) + Math.max(0, s.stimulus.kind === "supply-step" ? s.stimulus.supplyStep : 0);
    const tc = s.thermal.ambient + diss.power * (s.thermal.thetaSA === null ? s.pass.thetaJA - s.pass.thetaJC : s.thermal.thetaCS + s.thermal.thetaSA);
    const pRated = s.pass.pMax * Math.max(0, (s.pass.tjMax - tc) / (s.pass.tjMax - 25));
    const ratios = [iFs / s.pass.iMax, vMaxSeen / s.pass.vMax, diss.power / Math.max(pRated, 1e-12)];
    const worst = Math.max(...ratios);
    rows.push({
      id: "soa",
      label: "Safe operating area (simple)",
      verdict: verdictAtMost(worst, 0.8, 1),
      value: worst,
      limit: 1,
      unit: "",
      formula: "max(I/Imax, V/Vmax, P/P(Tcase)) with P(Tcase) = Pmax·(Tj,max − Tcase)/(Tj,max − 25 °C)",
      detail: `I/Imax = ${fmt(ratios[0])}, V/Vmax = ${fmt(ratios[1])} (load shorted or open: the full supply), P/P(Tc) = ${fmt(ratios[2])} at Tc = ${fmt(tc)} °C. Second breakdown is not modelled; warn above 80 %.`,
    });
  }

  // 6. Sense resistor power and self-heating.
  {
    const pw = iFs * iFs * p.senseResistor;
    const rise = pw * s.thermal.senseThetaA;
    rows.push({
      id: "sense-power",
      label: "Sense-resistor power and self-heating",
      verdict: verdictAtMost(pw, 0.5 * s.thermal.senseRating, s.thermal.senseRating),
      value: pw,
      limit: s.thermal.senseRating,
      unit: "W",
      formula: "P = I²·Rsense; ΔT = P·θ; ΔR/R = tempco·ΔT",
      detail: `ΔT = ${fmt(rise)} °C, shift ${fmt(s.tolerances.resistorTempco * rise * 100)} %; warn above half the rating (common practice).`,
    });
  }

  // 7. DC accuracy budget.
  const budget = accuracyBudget(s);
  {
    const target = s.tolerances.accuracyTarget;
    rows.push({
      id: "accuracy",
      label: "DC accuracy at full scale (worst case / RSS)",
      verdict: budget.worstCase <= target ? "pass" : budget.rss <= target ? "warn" : "fail",
      value: budget.worstCase * 100,
      limit: target * 100,
      unit: "% FS",
      formula: "Σ|terms| (worst case) and √Σ terms² (RSS): offset/Vsense, Ib·R/Vsense, divider 2·tol·(1−k), sense tol, 1/(β+1), drift, Vout/(Aol·Vsense)",
      detail: budget.terms.map((t) => `${t.label}: ${fmt(t.fraction * 100)} %`).join("; ") + `; RSS ${fmt(budget.rss * 100)} %.`,
    });
  }

  // 8. Command-source current.
  {
    const vin = s.stimulus.commandFullScale;
    let icmd: number;
    let formula: string;
    if (howland) {
      icmd = (vin - iFs * rMax) / (p.howlandR1 + p.howlandR2);
      icmd = Math.max(Math.abs(icmd), Math.abs(vin / (p.howlandR1 + p.howlandR2)));
      formula = "Icmd ≈ (Vcmd − Vload)/(R1 + R2)";
    } else {
      icmd = vin / (s.stimulus.sourceResistance + p.dividerTop + p.dividerBottom);
      formula = "Icmd = Vcmd/(Rsource + Rtop + Rbottom)";
    }
    if (op && op.currents[NAMES.command] !== undefined) icmd = Math.abs(op.currents[NAMES.command]);
    rows.push({
      id: "command-current",
      label: "Current drawn from the command source",
      verdict: verdictAtMost(icmd, 0.8 * s.stimulus.sourceCurrentLimit, s.stimulus.sourceCurrentLimit),
      value: icmd,
      limit: s.stimulus.sourceCurrentLimit,
      unit: "A",
      formula: op ? `${formula} (measured at the operating point)` : formula,
      detail: `at the full-scale command ${fmt(vin)} V; warn above 80 % of the source's limit.`,
    });
  }

  // 9. Operating point, when given: regulated current against the ideal, and op-amp limiting.
  if (op) {
    const iOp = op.currents[NAMES.ammeter];
    const cmd = s.stimulus.commandHigh;
    const ideal = idealTransconductance(s) * cmd;
    if (iOp !== undefined && ideal !== 0) {
      const err = (iOp - ideal) / fullScaleCurrent(s);
      rows.push({
        id: "op-current",
        label: "Simulated load current against Vcommand·k/Rsense",
        verdict: Math.abs(err) <= budget.worstCase + 1e-4 ? "pass" : Math.abs(err) <= 5 * budget.worstCase ? "warn" : "fail",
        value: iOp,
        limit: ideal,
        unit: "A",
        formula: "|I(sim) − Vcmd·k/Rsense| ≤ worst-case budget × full scale",
        detail: `error ${fmt(err * 100)} % of full scale at ${fmt(cmd)} V command.`,
      });
    }
    const u = op.devices[NAMES.opamp] as { limiting?: unknown } | undefined;
    if (u && u.limiting) {
      rows.push({
        id: "op-limiting",
        label: "Op-amp output within its limits at the operating point",
        verdict: "fail",
        value: 1,
        limit: 0,
        unit: "",
        formula: "swing, current and slew limits of the macro model",
        detail: `The op-amp is limiting (${String(u.limiting)}): the loop is open and the current is not regulated.`,
      });
    }
  }

  // Cautions.
  const cautions: Caution[] = [];
  const vHighest = Math.max(
    s.supplies.load + Math.max(0, s.stimulus.supplyStep),
    s.supplies.opampPositive - s.supplies.opampNegative,
    L.kind === "cell" ? s.supplies.load + L.cellVoltageMax : 0,
  );
  if (vHighest > 60) {
    cautions.push({
      id: "voltage",
      title: "Supply above 60 V DC",
      text: `The circuit works at ${fmt(vHighest)} V, above the 60 V DC extra-low-voltage limit: touch protection, insulation and spacing rules apply. ${DEFERENCE}`,
    });
  }
  if (L.kind === "coil" && L.inductance > 0 && !L.clampDiode) {
    cautions.push({
      id: "inductive",
      title: "Inductive load without a clamp",
      text: `Interrupting ${fmt(iFs)} A in ${fmt(L.inductance)} H drives the pass device far beyond its rating (stored energy ${fmt(0.5 * L.inductance * iFs * iFs)} J). Fit a clamp across the coil. ${DEFERENCE}`,
    });
  }
  if (L.laserEmitter) {
    cautions.push({
      id: "laser",
      title: "Laser emitter",
      text: `A laser emitter can blind before anyone sees it; overshoot can destroy the emitter. Eye-safety classification and interlocks apply. ${DEFERENCE}`,
    });
  }
  // High-power LEDs: from about 350 mA (the common 1 W class; a threshold of common practice, not a standard's),
  // blue-rich white light is bright enough to harm eyes at close range (photobiological safety, IEC 62471 groups).
  if (L.kind === "led" && iFs >= 0.35) {
    cautions.push({
      id: "led-light",
      title: "High-power LED light",
      text: `${L.ledCount} LEDs driven at ${fmt(iFs)} A are bright enough to harm eyes at close range (photobiological safety, IEC 62471 risk groups). Shield or diffuse them on the bench and never look into them. ${DEFERENCE}`,
    });
  }
  if (L.kind === "cell" && L.lithium) {
    cautions.push({
      id: "lithium",
      title: "Lithium cell under test",
      text: `A lithium cell shorted, over-discharged or overheated can vent and burn. Fuse the leads, stop at the cut-off voltage and test in a fire-safe place. ${DEFERENCE}`,
    });
  }
  const bare = (s.pass.tjMax - s.thermal.ambient) / s.pass.thetaJA;
  if (!howland && diss.power > bare) {
    cautions.push({
      id: "bare-package",
      title: "Dissipation above what a bare package can shed",
      text: `${fmt(diss.power)} W worst case against ${fmt(bare)} W for the package without a heatsink ((Tj,max − Ta)/θja): the heatsink is essential, and surfaces get hot enough to burn. ${DEFERENCE}`,
    });
  }
  return { checks: rows, cautions, budget };
}
