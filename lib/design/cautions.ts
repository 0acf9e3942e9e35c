/**
 * Cautions: where a design can hurt someone (supplies above the extra-low-voltage limit, an unclamped coil, laser
 * and bright LED light, lithium cells, a package too hot to touch). Each ends deferring to local codes and licensed
 * practice.
 */
import { DEFERENCE, fmt, type Caution } from "./check-formulas";
import type { CheckContext } from "./check-rows";

/** The cautions that apply to the scenario, in a fixed order. */
export function cautionsFor(c: CheckContext): Caution[] {
  const { s, L, iFs, howland, diss } = c;
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
  if (L.kind === "coil" && L.inductance > 0 && L.clamp.kind === "none") {
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
  return cautions;
}
