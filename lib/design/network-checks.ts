/**
 * Checks of the optional networks and the coil clamp: the pass device's peak voltage at coil turn-off, the decay time
 * and the Zener's energy per turn-off, and what each fitted network dissipates, each with its formula.
 */
import { driveVoltage, fmt, pathResistance, pathSupply, verdictAtMost, type CheckRow } from "./check-formulas";
import type { CheckContext } from "./check-rows";
import { clampDiodeDrop, clampVoltage, coilTurnOff, usesGateDrive } from "./networks";

/**
 * The rating a small snubber or bleed resistor is taken to have when the scenario gives none, W: 0.25 W, the common
 * through-hole and 1206 size (common practice); warn above half of it.
 */
export const SMALL_RESISTOR_RATING = 0.25;

/** Coil turn-off through the clamp: the pass device's peak voltage, the decay time, the Zener's energy. */
export function clampChecks(c: CheckContext): CheckRow[] {
  const { s, L, iFs, howland } = c;
  if (L.kind !== "coil" || L.inductance <= 0 || L.clamp.kind === "none") return [];
  const rows: CheckRow[] = [];
  const vClamp = clampVoltage(s, iFs);
  const vSupply = pathSupply(s, 0);
  if (!howland) {
    const vPeak = vSupply + vClamp;
    rows.push({
      id: "clamp-peak-voltage",
      label: "Pass-device peak voltage at coil turn-off",
      verdict: verdictAtMost(vPeak, 0.8 * s.pass.vMax, s.pass.vMax),
      value: vPeak,
      limit: s.pass.vMax,
      unit: "V",
      formula: L.clamp.kind === "diode"
        ? "Vpeak = Vsupply + Vclamp, Vclamp = n·Vt·ln(I/Is + 1) + I·Rs (the diode at the turn-off current)"
        : "Vpeak = Vsupply + Vclamp, Vclamp = Vz + 2·(n·Vt·ln(I/Is + 1) + I·Rs) (diode forward, Zener beyond its knee)",
      detail: `Vsupply = ${fmt(vSupply)} V, Vclamp = ${fmt(vClamp)} V at I = ${fmt(iFs)} A; warn above 80 % of the rating (common practice).`,
    });
  }
  // the clamp's loop holds the coil's winding and the clamp only
  const rCoil = L.resistance;
  const off = coilTurnOff(L.inductance, rCoil, iFs, vClamp);
  const stored = 0.5 * L.inductance * iFs * iFs;
  rows.push({
    id: "clamp-decay",
    label: "Coil current decay time at turn-off",
    verdict: "pass",
    value: off.time,
    limit: (L.inductance / Math.max(rCoil, 1e-9)) * Math.log(1 + (iFs * rCoil) / Math.max(clampDiodeDrop(iFs, s.thermal.ambient), 1e-9)),
    unit: "s",
    formula: "t = (L/R)·ln(1 + I·R/Vclamp) for a constant clamp voltage (first-order R–L discharge); limit: a diode alone",
    detail: `L = ${fmt(L.inductance)} H, R = ${fmt(rCoil)} Ω, I = ${fmt(iFs)} A, Vclamp = ${fmt(vClamp)} V.`,
  });
  if (L.clamp.kind === "diode-zener") {
    const vz = L.clamp.zenerVoltage + clampDiodeDrop(iFs, s.thermal.ambient);
    const eZener = off.clampEnergy * (vz / vClamp);
    rows.push({
      id: "clamp-zener-energy",
      label: "Zener energy per turn-off",
      verdict: "pass",
      value: eZener,
      limit: stored,
      unit: "J",
      formula: "E = Vz·(L/R)·(I − (Vclamp/R)·ln(1 + I·R/Vclamp)) (∫Vz·i dt over the decay; ≤ L·I²/2, the stored energy)",
      detail: `The Zener takes ${fmt(vz)} V of the ${fmt(vClamp)} V clamp; the winding resistance takes the rest of the ${fmt(stored)} J stored. Its average power is E × the turn-off rate.`,
    });
  }
  return rows;
}

/** Energy left in a snubber resistor per edge of ΔV, J: ½·C·ΔV², whatever R is (charging a capacitor through R). */
function snubberRow(id: string, label: string, capacitance: number, deltaV: number, repetitionHz: number, where: string): CheckRow {
  const energy = 0.5 * capacitance * deltaV * deltaV;
  const power = capacitance * deltaV * deltaV * repetitionHz;
  return {
    id,
    label,
    verdict: verdictAtMost(power, 0.5 * SMALL_RESISTOR_RATING, SMALL_RESISTOR_RATING),
    value: power,
    limit: SMALL_RESISTOR_RATING,
    unit: "W",
    formula: "P = C·ΔV²·f (½·C·ΔV² per edge, two edges per cycle, whatever R is)",
    detail: `ΔV = ${fmt(deltaV)} V ${where}, C = ${fmt(capacitance)} F: ${fmt(energy)} J per edge; f = ${fmt(repetitionHz)} Hz (one step up and down per simulated window); against a ${SMALL_RESISTOR_RATING} W resistor, warn above half (common practice).`,
  };
}

/** Dissipation of each fitted network. */
export function networkDissipationChecks(c: CheckContext): CheckRow[] {
  const { s, L, iFs, howland } = c;
  const n = s.networks;
  const rows: CheckRow[] = [];
  const f = 1 / s.stimulus.stopTime;
  const vClamp = clampVoltage(s, iFs);
  if (n.loadSnubber) {
    const dv = iFs * L.resistanceMax + vClamp;
    rows.push(snubberRow("load-snubber-power", "Load snubber resistor dissipation", n.loadSnubber.capacitance, dv, f,
      `across the load (I·Rload,max${vClamp > 0 ? " + the clamp at turn-off" : ""})`));
  }
  if (howland) return rows;
  if (n.passSnubber) {
    // Off: the full path supply (plus the clamp for a coil); on at full current: the headroom left.
    const vOn = Math.max(0, pathSupply(s, 0) - iFs * (L.resistanceMin + pathResistance(s)));
    const dv = Math.max(0, pathSupply(s, 0) + vClamp - vOn);
    rows.push(snubberRow("pass-snubber-power", "Pass-device snubber resistor dissipation", n.passSnubber.capacitance, dv, f,
      usesGateDrive(s) ? "across drain–source from full current to off" : "across collector–emitter from full current to off"));
  }
  if (n.baseEmitterResistor !== null) {
    const { vControl } = driveVoltage(s, iFs);
    const p = (vControl * vControl) / n.baseEmitterResistor;
    const gate = usesGateDrive(s);
    rows.push({
      id: "base-emitter-resistor-power",
      label: gate ? "Gate–source resistor dissipation" : "Base–emitter resistor dissipation",
      verdict: verdictAtMost(p, 0.5 * SMALL_RESISTOR_RATING, SMALL_RESISTOR_RATING),
      value: p,
      limit: SMALL_RESISTOR_RATING,
      unit: "W",
      formula: gate ? "P = V(GS)²/R(GS) at full current" : "P = V(BE)²/R(BE) at full current",
      detail: `V = ${fmt(vControl)} V across ${fmt(n.baseEmitterResistor)} Ω; the op-amp also supplies ${fmt(vControl / n.baseEmitterResistor)} A for it (in the drive checks).`,
    });
  }
  return rows;
}
