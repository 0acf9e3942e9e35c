/**
 * The design checks, one function per check: each reads the scenario's shared figures (CheckContext, computed once
 * by runChecks) and returns its rows. runChecks (./checks.ts) calls them in the order of the table.
 */
import { NAMES, cableResistance, idealTransconductance } from "./compile";
import { clampVoltage } from "./networks";
import type { Scenario } from "./schema";
import {
  driveVoltage, effectiveBeta, fmt, fullScaleCurrent, junctionTemperature, ledDrop, pathResistance, pathSupply, usesBjt,
  usesMos, verdictAtMost, type AccuracyBudget, type CheckRow, type OpLike, type worstDissipation,
} from "./check-formulas";

/** What several checks (and the cautions) share, computed once per run. */
export interface CheckContext {
  s: Scenario;
  /** The operating point, when the run has one. */
  op?: OpLike;
  p: Scenario["parts"];
  L: Scenario["load"];
  /** Full-scale load current, A. */
  iFs: number;
  howland: boolean;
  highSide: boolean;
  /** Op-amp rails, V. */
  vcc: number;
  vee: number;
  /** Highest and lowest op-amp output, V (rails less the swing limits). */
  outMax: number;
  outMin: number;
  /** Heaviest load resistance (the LED string's series resistance for LEDs), Ω. */
  rMax: number;
  /** Worst-case pass-device dissipation. */
  diss: ReturnType<typeof worstDissipation>;
  budget: AccuracyBudget;
}

/** Headroom and compliance at full current and the heaviest load. */
export function complianceCheck(c: CheckContext): CheckRow[] {
  const { s, p, L, iFs, howland, highSide, outMax, rMax } = c;
  const rows: CheckRow[] = [];
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
      limitKind: "min",
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
      limitKind: "max",
      formula: "Vout = I·(Rs + Rload,max + Rcable) ≤ Vcc − swing",
      detail: `I = ${fmt(iFs)} A; the command range is bipolar, so the negative side needs the same below ground.`,
    });
  }

  return rows;
}

/** Op-amp output must reach sense + control voltage + base-resistor drop. */
export function driveChecks(c: CheckContext): CheckRow[] {
  const { s, p, iFs, howland, highSide, outMax, outMin } = c;
  const rows: CheckRow[] = [];
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
        limitKind: "max",
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
        limitKind: "min",
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
        limitKind: "min",
        formula: "Vcc − swing ≥ Vsupply − 0.4 V (pass device below its turn-on voltage; common practice)",
        detail: "Otherwise a zero command still leaves some current flowing.",
      });
    }
    // Worst case: the smallest β of the production spread (Darlington: the product of both stages).
    // A base–emitter resistor draws V(BE)/R on top of the base current (already in iControl).
    const iBleed = s.networks.baseEmitterResistor !== null ? vControl / s.networks.baseEmitterResistor : 0;
    const iDrive = usesBjt(s) ? iFs / effectiveBeta(s) + iBleed : iControl;
    if (s.opamp.Iout !== null) {
      rows.push({
        id: "drive-current",
        label: "Op-amp output current at full scale, lowest β",
        verdict: verdictAtMost(iDrive, 0.7 * s.opamp.Iout, s.opamp.Iout),
        value: iDrive,
        limit: s.opamp.Iout,
        limitKind: "max",
        unit: "A",
        formula: "Ib = I/βmin + V(BE)/R(BE) (gate: V(GS)/R(GS) at DC) ≤ Iout limit; warn above 70 %",
        detail: usesBjt(s) ? `βmin = ${fmt(s.pass.betaMin)}; at the typical β ${fmt(s.pass.betaF)} it is ${fmt(iControl)} A` : "Gate current flows only while the gate charges.",
      });
    }
  }

  return rows;
}

/** Input common-mode range. */
export function commonModeCheck(c: CheckContext): CheckRow[] {
  const { s, p, iFs, howland, highSide, vcc, vee, rMax } = c;
  const rows: CheckRow[] = [];
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
      valueKind: "margin",
      limitKind: "min",
      formula: "Vee + CM,low ≤ V(inputs) ≤ Vcc − CM,high",
      detail: `inputs span ${fmt(lo)} … ${fmt(hi)} V; range ${fmt(cmMin)} … ${fmt(cmMax)} V; warn under 0.1 V margin.`,
    });
  }

  return rows;
}

/** Worst-case dissipation and junction temperature. */
export function thermalChecks(c: CheckContext): CheckRow[] {
  const { s, howland, diss } = c;
  const rows: CheckRow[] = [];
  const { tj, thetaTotal } = junctionTemperature(s, diss.power);
  const device = howland ? "op-amp output stage" : "pass device";
  if (!howland) {
    rows.push({
      id: "dissipation",
      label: "Worst-case pass-device dissipation",
      verdict: verdictAtMost(diss.power, 0.5 * s.pass.pMax, s.pass.pMax),
      value: diss.power,
      limit: s.pass.pMax,
      limitKind: "max",
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
    limitKind: "max",
    unit: "°C",
    formula: s.thermal.thetaSA === null ? "Tj = Ta + P·θja (no heatsink)" : "Tj = Ta + P·(θjc + θcs + θsa)",
    detail: `P = ${fmt(diss.power)} W, Σθ = ${fmt(thetaTotal)} °C/W, Ta = ${fmt(s.thermal.ambient)} °C; warn within 25 °C of the rating (common practice).`,
  });

  return rows;
}

/** Simple safe operating area: current, voltage and derated power. */
export function soaCheck(c: CheckContext): CheckRow[] {
  const { s, L, iFs, howland, diss } = c;
  const rows: CheckRow[] = [];
  if (!howland) {
    // A clamped coil adds the clamp's voltage at turn-off (an unclamped one is a caution of its own).
    const vMaxSeen = Math.max(pathSupply(s, L.kind === "cell" ? L.cellVoltageMax : 0), s.supplies.load) + Math.max(0, s.stimulus.kind === "supply-step" ? s.stimulus.supplyStep : 0)
      + clampVoltage(s, iFs);
    const tc = s.thermal.ambient + diss.power * (s.thermal.thetaSA === null ? s.pass.thetaJA - s.pass.thetaJC : s.thermal.thetaCS + s.thermal.thetaSA);
    // Above the SOA corner the second-breakdown line takes over: allowed power × Vcorner/V (I ∝ V⁻²).
    const corner = s.pass.soaCornerVoltage;
    const sbFactor = corner !== null && diss.vDrop > corner ? corner / diss.vDrop : 1;
    const pRated = s.pass.pMax * Math.max(0, (s.pass.tjMax - tc) / (s.pass.tjMax - 25)) * sbFactor;
    const ratios = [iFs / s.pass.iMax, vMaxSeen / s.pass.vMax, diss.power / Math.max(pRated, 1e-12)];
    const worst = Math.max(...ratios);
    rows.push({
      id: "soa",
      label: "Safe operating area (simple)",
      verdict: verdictAtMost(worst, 0.8, 1),
      value: worst,
      limit: 1,
      limitKind: "max",
      unit: "",
      formula: "max(I/Imax, V/Vmax, P/P(Tcase)) with P(Tcase) = Pmax·(Tj,max − Tcase)/(Tj,max − 25 °C), × Vcorner/V above the SOA corner",
      detail: `I/Imax = ${fmt(ratios[0])}, V/Vmax = ${fmt(ratios[1])} (load shorted or open: the full supply), P/P(Tc) = ${fmt(ratios[2])} at Tc = ${fmt(tc)} °C${sbFactor < 1 ? ` and ${fmt(diss.vDrop)} V, beyond the ${fmt(corner!)} V SOA corner (× ${fmt(sbFactor)})` : ""}${L.kind === "coil" && L.clamp.kind !== "none" ? `; V includes the clamp's ${fmt(clampVoltage(s, iFs))} V at turn-off` : ""}. Second breakdown is not modelled; warn above 80 %.`,
    });
  }

  return rows;
}

/** Sense resistor power and self-heating. */
export function sensePowerCheck(c: CheckContext): CheckRow[] {
  const { s, p, iFs } = c;
  const rows: CheckRow[] = [];
  {
    const pw = iFs * iFs * p.senseResistor;
    const rise = pw * s.thermal.senseThetaA;
    rows.push({
      id: "sense-power",
      label: "Sense-resistor power and self-heating",
      verdict: verdictAtMost(pw, 0.5 * s.thermal.senseRating, s.thermal.senseRating),
      value: pw,
      limit: s.thermal.senseRating,
      limitKind: "max",
      unit: "W",
      formula: "P = I²·Rsense; ΔT = P·θ; ΔR/R = tempco·ΔT",
      detail: `ΔT = ${fmt(rise)} °C, shift ${fmt(s.tolerances.resistorTempco * rise * 100)} %; warn above half the rating (common practice).`,
    });
  }

  return rows;
}

/** DC accuracy budget. */
export function accuracyCheck(c: CheckContext): CheckRow[] {
  const { s, budget } = c;
  const rows: CheckRow[] = [];
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

  return rows;
}

/** Command-source current. */
export function commandCurrentCheck(c: CheckContext): CheckRow[] {
  const { s, op, p, iFs, howland, rMax } = c;
  const rows: CheckRow[] = [];
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
      limitKind: "max",
      unit: "A",
      formula: op ? `${formula} (measured at the operating point)` : formula,
      detail: `at the full-scale command ${fmt(vin)} V; warn above 80 % of the source's limit.`,
    });
  }

  return rows;
}

/** Operating point, when given: regulated current against the ideal, and op-amp limiting. */
export function operatingPointChecks(c: CheckContext): CheckRow[] {
  const { s, op, budget } = c;
  const rows: CheckRow[] = [];
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

  return rows;
}
