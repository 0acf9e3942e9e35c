/**
 * The readable names of a design's kinds, for menus and tables: templates by their titles, load kinds and pass
 * elements in the trade's words. An unknown value shows as it is.
 */
import { TEMPLATES } from "./templates";

const LOAD_WORDS: Record<string, string> = {
  resistor: "Resistor",
  coil: "Coil",
  led: "LED string",
  cell: "Cell or supply under test",
};

const PASS_WORDS: Record<string, string> = {
  npn: "NPN transistor",
  pnp: "PNP transistor",
  nmos: "N-channel MOSFET",
  pmos: "P-channel MOSFET",
  darlington: "NPN Darlington",
  opamp: "none (the op-amp drives the load)",
};

export function templateWords(id: string): string {
  return TEMPLATES.find((t) => t.id === id)?.title ?? id;
}

/** "coil+cable" reads "Coil on a cable". */
export function loadWords(kind: string): string {
  const [base, cable] = kind.split("+");
  const w = LOAD_WORDS[base ?? ""] ?? kind;
  return cable === "cable" ? `${w} on a cable` : w;
}

export function passWords(kind: string): string {
  return PASS_WORDS[kind] ?? kind;
}

/**
 * The small-signal step's overshoot as an aside to the full step's ("small-signal 40.4 %"), or that it grows (the
 * closed loop is unstable: no overshoot to quote).
 */
export function smallSignalWords(small: { metrics: { overshootPct: number }; grows: boolean }): string {
  return small.grows ? "small-signal step grows: the loop is unstable" : `small-signal ${small.metrics.overshootPct.toFixed(1)} %`;
}
