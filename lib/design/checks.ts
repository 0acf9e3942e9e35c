/**
 * Design checks: a table of pass / warn / fail rows, each with its numbers and the formula used, and cautions that
 * defer to local codes and licensed practice. Hand formulas from the scenario; when an operating point is given, its
 * measured values are checked too. One function per check (./check-rows.ts), the cautions in ./cautions.ts, the
 * formulas they share in ./check-formulas.ts.
 */
import type { Scenario } from "./schema";
import { accuracyBudget, fullScaleCurrent, worstDissipation, type AccuracyBudget, type Caution, type CheckRow, type OpLike } from "./check-formulas";
import {
  accuracyCheck, commandCurrentCheck, commonModeCheck, complianceCheck, driveChecks, operatingPointChecks, sensePowerCheck,
  soaCheck, thermalChecks, type CheckContext,
} from "./check-rows";
import { cautionsFor } from "./cautions";
import { clampChecks, networkDissipationChecks } from "./network-checks";
import { opampDatasheetChecks } from "./datasheet-checks";

export * from "./check-formulas";

/** The checks in the order of the table. */
const CHECKS: readonly ((c: CheckContext) => CheckRow[])[] = [
  complianceCheck,
  driveChecks,
  commonModeCheck,
  opampDatasheetChecks,
  thermalChecks,
  soaCheck,
  clampChecks,
  sensePowerCheck,
  networkDissipationChecks,
  accuracyCheck,
  commandCurrentCheck,
  operatingPointChecks,
];

/** The figures several checks share, computed once. */
function checkContext(s: Scenario, op?: OpLike): CheckContext {
  const L = s.load;
  const vcc = s.supplies.opampPositive;
  const vee = s.supplies.opampNegative;
  return {
    s,
    op,
    p: s.parts,
    L,
    iFs: fullScaleCurrent(s),
    howland: s.template === "howland",
    highSide: s.template === "source-highside",
    vcc,
    vee,
    outMax: vcc - (s.opamp.swingHigh ?? 0),
    outMin: vee + (s.opamp.swingLow ?? 0),
    rMax: L.kind === "led" ? L.resistance : L.resistanceMax,
    diss: worstDissipation(s),
    budget: accuracyBudget(s),
  };
}

export function runChecks(s: Scenario, op?: OpLike): { checks: CheckRow[]; cautions: Caution[]; budget: AccuracyBudget } {
  const c = checkContext(s, op);
  return { checks: CHECKS.flatMap((check) => check(c)), cautions: cautionsFor(c), budget: c.budget };
}
