/**
 * Words for what an operating point holds, keyed by the names our netlists use (NAMES in compile.ts), so components
 * never need to know a netlist's element names.
 */
import { NAMES } from "./compile";

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

export function opHighlights(op: { currents: Record<string, number>; devices?: Record<string, object> }): OpHighlights {
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
