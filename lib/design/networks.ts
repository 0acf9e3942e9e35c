/**
 * The optional networks engineers add to a template's circuit (scenario.networks) and the coil clamp (load.clamp):
 * starting values when one is switched on, which templates take which, the rows the review's part list shows, and
 * the closed forms the checks use (clamp voltage, coil turn-off time and clamp energy).
 */
import type { Networks, Scenario, Snubber } from "./schema";

export type NetworkKey = keyof Networks;

export const NETWORK_KEYS: readonly NetworkKey[] = ["loadSnubber", "passSnubber", "baseEmitterResistor", "feedbackCapacitor"];

/** Values a network starts from when switched on (or swept while off): common starting points, to be tuned. */
export const NETWORK_DEFAULTS: { loadSnubber: Snubber; passSnubber: Snubber; baseEmitterResistor: number; feedbackCapacitor: number } = {
  loadSnubber: { resistance: 47, capacitance: 1e-6 },
  passSnubber: { resistance: 100, capacitance: 10e-9 },
  baseEmitterResistor: 10e3,
  feedbackCapacitor: 1e-9,
};

/** Whether the template has the place the network goes (the Howland pump has no pass device or feedback resistor). */
export function networkApplies(s: Scenario, key: NetworkKey): boolean {
  return key === "loadSnubber" || s.template !== "howland";
}

/** The gate words for MOSFET pass devices, the base words otherwise. */
export function usesGateDrive(s: Scenario): boolean {
  return s.template === "sink-nmos" || (s.template === "source-highside" && s.pass.kind === "pmos");
}

export function networkLabel(s: Scenario, key: NetworkKey): string {
  switch (key) {
    case "loadSnubber": return "Load snubber (R–C across the load)";
    case "passSnubber": return usesGateDrive(s) ? "Pass-device snubber (R–C across D–S)" : "Pass-device snubber (R–C across C–E)";
    case "baseEmitterResistor": return usesGateDrive(s) ? "Gate–source resistor" : "Base–emitter resistor";
    case "feedbackCapacitor": return "Feedback-resistor capacitor";
  }
}

/** One fitted network part, as the review's part list and the schematic name it (netlist element name first). */
export interface NetworkPart {
  element: string;
  label: string;
  value: number;
  unit: "Ω" | "F";
}

/** The fitted network parts (and the Zener of a diode-Zener clamp is listed by `clampParts`). */
export function networkParts(s: Scenario): NetworkPart[] {
  const n = s.networks;
  const out: NetworkPart[] = [];
  if (n.loadSnubber) {
    out.push({ element: "load-snubber-r", label: "Load snubber resistor", value: n.loadSnubber.resistance, unit: "Ω" });
    out.push({ element: "load-snubber-c", label: "Load snubber capacitor", value: n.loadSnubber.capacitance, unit: "F" });
  }
  if (s.template === "howland") return out;
  if (n.passSnubber) {
    out.push({ element: "pass-snubber-r", label: "Pass-device snubber resistor", value: n.passSnubber.resistance, unit: "Ω" });
    out.push({ element: "pass-snubber-c", label: "Pass-device snubber capacitor", value: n.passSnubber.capacitance, unit: "F" });
  }
  if (n.baseEmitterResistor !== null) {
    const gate = usesGateDrive(s);
    out.push({ element: gate ? "gate-source-resistor" : "base-emitter-resistor", label: networkLabel(s, "baseEmitterResistor"), value: n.baseEmitterResistor, unit: "Ω" });
  }
  if (n.feedbackCapacitor !== null) out.push({ element: "feedback-capacitor", label: "Feedback-resistor capacitor", value: n.feedbackCapacitor, unit: "F" });
  return out;
}

/** The clamp's parts in words ("none" when the load is not a coil or has no clamp). */
export function clampText(s: Scenario): string {
  if (s.load.kind !== "coil" || s.load.clamp.kind === "none") return "none";
  return s.load.clamp.kind === "diode" ? "freewheel diode" : `diode + ${Number(s.load.clamp.zenerVoltage.toPrecision(3))} V Zener`;
}

/** The clamp diode's model in compile.ts: Is = 1 pA, n = 1.5, Rs = 50 mΩ (the Zener's junction shares it). */
export const CLAMP_DIODE = { Is: 1e-12, n: 1.5, Rs: 0.05 } as const;

/** Forward drop of the clamp diode at current i, V: n·Vt·ln(i/Is + 1) + i·Rs (Shockley with series resistance). */
export function clampDiodeDrop(i: number, tempC: number): number {
  const vt = (1.380649e-23 * (tempC + 273.15)) / 1.602176634e-19;
  return CLAMP_DIODE.n * vt * Math.log(Math.abs(i) / CLAMP_DIODE.Is + 1) + Math.abs(i) * CLAMP_DIODE.Rs;
}

/**
 * Voltage across the coil while the clamp carries current i, V (0 = no clamp): the diode's drop, plus for a
 * diode-Zener clamp the Zener's BV and its knee (the model's reverse junction: n·Vt·ln(i/Is + 1) + i·Rs).
 */
export function clampVoltage(s: Scenario, i: number): number {
  const c = s.load.clamp;
  if (s.load.kind !== "coil" || c.kind === "none") return 0;
  const vd = clampDiodeDrop(i, s.thermal.ambient);
  return c.kind === "diode" ? vd : c.zenerVoltage + 2 * vd;
}

/**
 * Coil turn-off through a constant clamp voltage Vc (standard inductor discharge, e.g. Mohan, Undeland & Robbins,
 * "Power Electronics", the first-order R–L circuit with a constant source): L·di/dt = −(R·i + Vc), so
 * i(t) = (I + Vc/R)·e^(−t/τ) − Vc/R with τ = L/R, reaching zero at t = τ·ln(1 + I·R/Vc); the clamp absorbs
 * E = Vc·∫i dt = Vc·τ·(I − (Vc/R)·ln(1 + I·R/Vc)) (→ L·I²/2 as R → 0). With R = 0: t = L·I/Vc.
 */
export function coilTurnOff(inductance: number, resistance: number, current: number, vClamp: number): { time: number; clampEnergy: number } {
  if (!(vClamp > 0)) return { time: Infinity, clampEnergy: 0 };
  if (resistance <= 0) return { time: (inductance * current) / vClamp, clampEnergy: 0.5 * inductance * current * current };
  const tau = inductance / resistance;
  const ln = Math.log(1 + (current * resistance) / vClamp);
  return { time: tau * ln, clampEnergy: vClamp * tau * (current - (vClamp / resistance) * ln) };
}
