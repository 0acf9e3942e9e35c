/**
 * Parameters a study can vary, addressed by a path into the scenario, and the values of a sweep axis. A network's
 * value ("networks.loadSnubber.resistance") may be varied while the network is off: the study fits it, starting from
 * NETWORK_DEFAULTS for the values it does not vary.
 */
import { NETWORK_DEFAULTS } from "./networks";
import type { Scenario, SweepAxis } from "./schema";

export interface SweepableParameter {
  path: string;
  label: string;
  unit: string;
  from: number;
  to: number;
  scale: "linear" | "log";
}

/** Parameters a study can vary, addressed by path into the scenario. */
export const SWEEPABLE_PARAMETERS: readonly SweepableParameter[] = [
  { path: "parts.compCapacitor", label: "Compensation capacitor", unit: "F", from: 10e-12, to: 100e-9, scale: "log" },
  { path: "parts.baseResistor", label: "Base/gate resistor", unit: "Ω", from: 10, to: 10e3, scale: "log" },
  { path: "parts.feedbackResistor", label: "Feedback resistor", unit: "Ω", from: 100, to: 1e6, scale: "log" },
  { path: "parts.senseResistor", label: "Sense resistor", unit: "Ω", from: 0.01, to: 10, scale: "log" },
  { path: "parts.dividerTop", label: "Divider top", unit: "Ω", from: 1e3, to: 1e6, scale: "log" },
  { path: "parts.dividerBottom", label: "Divider bottom", unit: "Ω", from: 100, to: 100e3, scale: "log" },
  { path: "load.resistance", label: "Load resistance", unit: "Ω", from: 1, to: 100, scale: "log" },
  { path: "load.inductance", label: "Load inductance", unit: "H", from: 10e-6, to: 100e-3, scale: "log" },
  { path: "load.extraCapacitance", label: "Extra load capacitance", unit: "F", from: 1e-9, to: 10e-6, scale: "log" },
  { path: "load.cable.length", label: "Cable length", unit: "m", from: 0.5, to: 50, scale: "log" },
  { path: "load.cellVoltage", label: "Cell voltage", unit: "V", from: 3, to: 4.2, scale: "linear" },
  { path: "supplies.load", label: "Load supply", unit: "V", from: 5, to: 60, scale: "linear" },
  { path: "opamp.GBW", label: "Op-amp gain–bandwidth", unit: "Hz", from: 100e3, to: 100e6, scale: "log" },
  { path: "opamp.Rout", label: "Op-amp output resistance", unit: "Ω", from: 1, to: 500, scale: "log" },
  { path: "pass.betaF", label: "Pass-device beta", unit: "", from: 10, to: 500, scale: "log" },
  { path: "pass.Cjc0", label: "Pass-device Cjc0", unit: "F", from: 10e-12, to: 1e-9, scale: "log" },
  { path: "networks.loadSnubber.resistance", label: "Load snubber resistor", unit: "Ω", from: 1, to: 1e3, scale: "log" },
  { path: "networks.loadSnubber.capacitance", label: "Load snubber capacitor", unit: "F", from: 1e-9, to: 1e-6, scale: "log" },
  { path: "networks.passSnubber.resistance", label: "Pass-device snubber resistor", unit: "Ω", from: 1, to: 1e3, scale: "log" },
  { path: "networks.passSnubber.capacitance", label: "Pass-device snubber capacitor", unit: "F", from: 100e-12, to: 100e-9, scale: "log" },
  { path: "networks.baseEmitterResistor", label: "Base–emitter (gate–source) resistor", unit: "Ω", from: 100, to: 100e3, scale: "log" },
  { path: "networks.feedbackCapacitor", label: "Feedback-resistor capacitor", unit: "F", from: 10e-12, to: 10e-9, scale: "log" },
  { path: "load.clamp.zenerVoltage", label: "Clamp Zener voltage", unit: "V", from: 5, to: 60, scale: "linear" },
  { path: "thermal.ambient", label: "Ambient temperature", unit: "°C", from: -20, to: 85, scale: "linear" },
];

/** The scenario with the network `path` names fitted (at its starting values) when it is off; else `s` itself. */
function withNetworkFitted(s: Scenario, path: string): Scenario {
  const [head, key] = path.split(".");
  if (head !== "networks" || !(key in NETWORK_DEFAULTS)) return s;
  const k = key as keyof typeof NETWORK_DEFAULTS;
  if (s.networks[k] !== null) return s;
  const copy = structuredClone(s);
  (copy.networks as Record<string, unknown>)[k] = structuredClone(NETWORK_DEFAULTS[k]);
  return copy;
}

/** Read a numeric parameter by path ("parts.compCapacitor"); a network that is off reads its starting value. */
export function getParameter(s: Scenario, path: string): number {
  let cur: unknown = withNetworkFitted(s, path);
  for (const key of path.split(".")) {
    if (cur === null || typeof cur !== "object" || !(key in (cur as object))) throw new RangeError(`Unknown parameter "${path}"`);
    cur = (cur as Record<string, unknown>)[key];
  }
  if (typeof cur !== "number") throw new RangeError(`Parameter "${path}" is not a number`);
  return cur;
}

/** A copy of the scenario with one numeric parameter changed. */
export function withParameter(s: Scenario, path: string, value: number): Scenario {
  getParameter(s, path);
  if (!Number.isFinite(value)) throw new RangeError(`${path}: ${value} is not a finite number`);
  const fitted = withNetworkFitted(s, path);
  const copy = fitted === s ? structuredClone(s) : fitted;
  const keys = path.split(".");
  let cur = copy as unknown as Record<string, unknown>;
  for (let i = 0; i < keys.length - 1; i++) cur = cur[keys[i]] as Record<string, unknown>;
  cur[keys[keys.length - 1]] = value;
  return copy;
}

/** The values of a sweep axis: linear, logarithmic (both ends included) or the given list. */
export function axisValues(axis: SweepAxis): number[] {
  if (axis.scale === "list") {
    if (axis.values.length === 0) throw new RangeError(`${axis.path}: the list of values is empty`);
    return [...axis.values];
  }
  const n = axis.points;
  if (n === 1) return [axis.from];
  if (axis.scale === "log") {
    if (!(axis.from > 0 && axis.to > 0)) throw new RangeError(`${axis.path}: a logarithmic sweep needs positive ends`);
    const a = Math.log(axis.from), b = Math.log(axis.to);
    return Array.from({ length: n }, (_, i) => Math.exp(a + ((b - a) * i) / (n - 1)));
  }
  return Array.from({ length: n }, (_, i) => axis.from + ((axis.to - axis.from) * i) / (n - 1));
}
