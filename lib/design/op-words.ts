/**
 * Words for what an operating point holds, keyed by the names our netlists use (NAMES in compile.ts), so components
 * never need to know a netlist's element names.
 */
import type { DeviceInfo } from "../sim";
import { NAMES } from "./compile";

/**
 * An operating point as every layer reads it — the checks, the schematic overlay, the review's table, the worker's
 * result: node voltages and element currents (SI) and each device's figures (the engine's OpResult fits).
 */
export interface OperatingPointData {
  nodes: Record<string, number>;
  currents: Record<string, number>;
  devices: Record<string, DeviceInfo>;
}

/** What each netlist node is, in words (node names from lib/design/compile.ts); unknown nodes are left blank. */
export const NODE_WORDS: Readonly<Record<string, string>> = {
  cmd_s: "command source, before its output resistance",
  cmd: "command",
  ref: "non-inverting input (divider tap)",
  inv: "inverting input",
  oa: "op-amp output",
  oa_i: "op-amp output pin",
  b: "base / gate",
  bm: "Darlington mid-point",
  e: "sense node (emitter / source)",
  c: "collector / drain",
  vcc: "op-amp positive supply",
  vee: "op-amp negative supply",
  vs: "load supply",
  lw: "load end of the cable",
  lt: "load terminal",
  lc: "inside the coil, between its resistance and inductance",
  ld: "between the LED string and the load resistance",
  lcell: "cell terminal",
};

/** What each named device is, in the words of the trade. */
export const DEVICE_WORDS: Readonly<Record<string, string>> = {
  [NAMES.opamp]: "op-amp",
  [NAMES.pass]: "pass device",
  [NAMES.driver]: "Darlington driver transistor",
  clamp: "clamp diode",
  "led-string": "LED string",
};

/** The operating point's figures a schematic overlay shows. */
export interface OpHighlights {
  /** the regulated load current, A */
  loadCurrent: number | null;
  /** current into the base/gate resistor, A (null for the Howland pump) */
  driveCurrent: number | null;
  /** dissipation of the pass device (with a Darlington's driver), W */
  passPower: number | null;
  opampLimiting: boolean;
}

export function opHighlights(op: Pick<OperatingPointData, "currents"> & Partial<Pick<OperatingPointData, "devices">>): OpHighlights {
  const drive = op.currents[NAMES.driveResistor];
  let passPower: number | null = null;
  for (const name of [NAMES.pass, NAMES.driver]) {
    const d = op.devices?.[name] as { power?: number } | undefined;
    if (d?.power !== undefined) passPower = (passPower ?? 0) + d.power;
  }
  const u = op.devices?.[NAMES.opamp] as { limiting?: boolean } | undefined;
  const load = op.currents[NAMES.ammeter];
  return {
    loadCurrent: load === undefined ? null : load,
    driveCurrent: drive === undefined ? null : Math.abs(drive),
    passPower,
    opampLimiting: Boolean(u?.limiting),
  };
}
