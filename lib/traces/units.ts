/**
 * Units found in oscilloscope exports: seconds, volts and amperes with an SI prefix, written short ("ms", "mV", "µA")
 * or long ("Seconds", "Volt", "milliamps"). Pure; used by the parser and the upload form.
 */

/** A quantity we know how to scale to SI. */
export type BaseUnit = "s" | "V" | "A";

export interface ParsedUnit {
  /** SI base unit. */
  base: BaseUnit;
  /** Multiply a value written in this unit by `factor` to get the base unit (ms → 1e-3). */
  factor: number;
  /** The unit as written in the file. */
  text: string;
}

const SHORT_PREFIX: Record<string, number> = { "": 1, p: 1e-12, n: 1e-9, u: 1e-6, "µ": 1e-6, "μ": 1e-6, m: 1e-3, k: 1e3 };
const LONG_PREFIX: Record<string, number> = { "": 1, pico: 1e-12, nano: 1e-9, micro: 1e-6, milli: 1e-3, kilo: 1e3 };
const LONG_BASE: Record<string, BaseUnit> = {
  s: "s", sec: "s", secs: "s", second: "s", seconds: "s",
  v: "V", volt: "V", volts: "V",
  a: "A", amp: "A", amps: "A", ampere: "A", amperes: "A",
};

const SHORT = /^(p|n|u|µ|μ|m|k)?(s|S|V|v|A|a)$/;
const LONG = /^(pico|nano|micro|milli|kilo)?(s|sec|secs|seconds?|volts?|v|amps?|amperes?|a)$/i;

/** Read a unit ("ms", "mV", "A", "Volt", "microseconds"); null when it is not a time, voltage or current unit. */
export function parseUnit(text: string): ParsedUnit | null {
  // Units rows sometimes bracket the unit: "(s)", "[mV]".
  const t = text.trim().replace(/^[([]\s*(.*?)\s*[)\]]$/, "$1");
  if (t === "") return null;
  const short = SHORT.exec(t);
  if (short) {
    const base = short[2].toUpperCase() === "S" ? "s" : (short[2].toUpperCase() as BaseUnit);
    // A lone capital "S" is siemens in SI; scope exports never write it for seconds with a prefix, but "S" alone is common.
    return { base, factor: SHORT_PREFIX[short[1] ?? ""], text: t };
  }
  const long = LONG.exec(t);
  if (long) {
    const base = LONG_BASE[long[2].toLowerCase()];
    if (!base) return null;
    return { base, factor: LONG_PREFIX[(long[1] ?? "").toLowerCase()], text: t };
  }
  return null;
}

/** Split a column heading into its label and unit: "Time (ms)", "CH1 [mV]", "Time/s", "Current(A)", "coil_current_A". */
export function splitHeading(heading: string): { label: string; unit: ParsedUnit | null } {
  const h = heading.trim().replace(/^"|"$/g, "");
  const bracket = /^(.*?)\s*[([]\s*([^)\]]+?)\s*[)\]]\s*$/.exec(h);
  if (bracket) {
    const unit = parseUnit(bracket[2]);
    if (unit) return { label: bracket[1] || h, unit };
  }
  const slash = /^(.*?)\s*\/\s*([^/\s]+)$/.exec(h);
  if (slash) {
    const unit = parseUnit(slash[2]);
    if (unit) return { label: slash[1] || h, unit };
  }
  // A unit as the last word after an underscore ("coil_current_A", "current_mA"): only the exact SI spelling, so
  // "channel_a" or "phase_v" are not read as amperes or volts (nor "Ch A", with a space, as amperes).
  const suffix = /^(.+?)_+((?:p|n|u|µ|μ|m|k)?(?:s|V|A))$/.exec(h);
  if (suffix) {
    const unit = parseUnit(suffix[2]);
    if (unit) return { label: suffix[1], unit };
  }
  return { label: h, unit: null };
}

/** True when every non-empty cell of a row reads as a unit (a separate units row under the names). */
export function isUnitsRow(cells: string[]): boolean {
  const filled = cells.map((c) => c.trim()).filter((c) => c !== "");
  return filled.length > 0 && filled.every((c) => parseUnit(c) !== null);
}

/** Time units offered in the upload form, with their factor to seconds. */
export const TIME_UNITS = { s: 1, ms: 1e-3, "µs": 1e-6, ns: 1e-9 } as const;
export type TimeUnitName = keyof typeof TIME_UNITS;

/** Units a channel's numbers may be written in, for the correction after upload ("" = as written, no unit). */
export const CHANNEL_SOURCE_UNITS = ["A", "mA", "µA", "V", "mV", "µV", ""] as const;
export type ChannelSourceUnit = (typeof CHANNEL_SOURCE_UNITS)[number];

/**
 * A channel's settings from what the user says of it: the file's numbers are in `sourceUnit`, and `scale` (a probe's
 * A/V, or 1/R of a sense resistor) turns them into `unit` (default: the source unit's base). Returns the unit of the
 * stored values and the total factor from the file's numbers to them.
 */
export function channelSettings(sourceUnit: ChannelSourceUnit, scale = 1, unit?: "A" | "V"): { unit: string; sourceUnit: string; scale: number } {
  if (!Number.isFinite(scale) || scale === 0) throw new RangeError("scale: a finite, non-zero number.");
  const parsed = sourceUnit === "" ? null : parseUnit(sourceUnit);
  if (sourceUnit !== "" && (!parsed || parsed.base === "s")) throw new RangeError(`sourceUnit: "${sourceUnit}" is not a voltage or current unit.`);
  return { unit: unit ?? parsed?.base ?? "", sourceUnit, scale: (parsed?.factor ?? 1) * scale };
}
