/**
 * Checks of the op-amp's datasheet figures a team part (or preset) gives: the supply range, and the output current
 * its swing figures hold at. Each row only when the figure is given.
 */
import { driveVoltage, effectiveBeta, fmt, usesBjt, type CheckRow } from "./check-formulas";
import type { CheckContext } from "./check-rows";

export function opampDatasheetChecks(c: CheckContext): CheckRow[] {
  const { s, iFs, howland, vcc, vee } = c;
  const o = s.opamp;
  const rows: CheckRow[] = [];
  if (o.supplyMin !== null || o.supplyMax !== null) {
    const span = vcc - vee;
    const lo = o.supplyMin ?? 0;
    const hi = o.supplyMax ?? Infinity;
    const outside = span < lo || span > hi;
    rows.push({
      id: "opamp-supply",
      label: "Op-amp supply within its rated range",
      verdict: outside ? "fail" : "pass",
      value: span,
      limit: span > hi ? hi : lo,
      unit: "V",
      formula: "Vsupply,min ≤ V+ − V− ≤ Vsupply,max (datasheet)",
      detail: `V+ − V− = ${fmt(span)} V; rated ${o.supplyMin === null ? "—" : fmt(lo)} … ${o.supplyMax === null ? "—" : fmt(hi)} V.`,
    });
  }
  if (o.swingCurrent !== null && !howland) {
    const { vControl, iControl } = driveVoltage(s, iFs);
    const bleed = s.networks.baseEmitterResistor !== null ? vControl / s.networks.baseEmitterResistor : 0;
    const iOut = usesBjt(s) ? iFs / effectiveBeta(s) + bleed : iControl;
    rows.push({
      id: "opamp-swing-current",
      label: "Op-amp output current against the swing figures' current",
      verdict: iOut > o.swingCurrent ? "warn" : "pass",
      value: iOut,
      limit: o.swingCurrent,
      unit: "A",
      formula: "Iout ≤ I(swing): beyond it the output stays further from the rails than the swing figures say",
      detail: `The swing figures hold at ${fmt(o.swingCurrent)} A; at full scale the output supplies ${fmt(iOut)} A.`,
    });
  }
  return rows;
}
