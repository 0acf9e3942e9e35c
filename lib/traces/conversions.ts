/**
 * What a channel's numbers are, as the user says it: one list of choices for the upload form and for the correction
 * after upload, and the settings each choice gives (the file's unit, the factor, the unit after it).
 */
import type { ChannelSourceUnit } from "./units";

export type Conversion = "keep" | "A" | "mA" | "V" | "mV" | "sense" | "msense" | "factor";

export interface ConversionChoice {
  value: Conversion;
  label: string;
  /** what the choice needs typed in: a sense resistance (Ω) or a probe factor */
  needs: "resistance" | "factor" | null;
}

export const CONVERSIONS: readonly ConversionChoice[] = [
  { value: "keep", label: "as the file says", needs: null },
  { value: "A", label: "already in amperes (A)", needs: null },
  { value: "mA", label: "in milliamperes (mA)", needs: null },
  { value: "V", label: "already in volts (V)", needs: null },
  { value: "mV", label: "in millivolts (mV)", needs: null },
  { value: "sense", label: "volts across a sense resistor → amps", needs: "resistance" },
  { value: "msense", label: "millivolts across a sense resistor → amps", needs: "resistance" },
  { value: "factor", label: "multiply by a probe factor (e.g. 10 for 10 A/V)", needs: "factor" },
];

/** What a choice needs typed in beside it. */
export function needsOf(kind: Conversion): ConversionChoice["needs"] {
  return CONVERSIONS.find((c) => c.value === kind)?.needs ?? null;
}

export interface ConversionSettings {
  /** the file's unit; absent = the column header's (or, where one must be named, volts) */
  sourceUnit?: ChannelSourceUnit;
  /** probe factor, or 1/R of a sense resistor */
  scale?: number;
  /** the unit after scaling; absent = the source unit's own */
  unit?: "A" | "V";
}

/**
 * The settings a choice gives, from the number typed beside it (`text`) and, for a probe factor, the unit after it
 * (absent: the source unit's own). A bad number gives `error` in plain words instead.
 */
export function conversionSettings(kind: Conversion, text: string, factorUnit?: "A" | "V"): { settings: ConversionSettings; error: string | null } {
  switch (kind) {
    case "keep":
      return { settings: {}, error: null };
    case "A": case "mA": case "V": case "mV":
      return { settings: { sourceUnit: kind }, error: null };
    case "sense": case "msense": {
      const r = Number(text);
      if (text.trim() === "" || !Number.isFinite(r) || r <= 0) return { settings: {}, error: "Sense resistor: enter a resistance above zero, in Ω." };
      return { settings: { ...(kind === "msense" ? { sourceUnit: "mV" as const } : {}), scale: 1 / r, unit: "A" }, error: null };
    }
    case "factor": {
      const f = Number(text);
      if (text.trim() === "" || !Number.isFinite(f) || f === 0) return { settings: {}, error: "Probe factor: enter a non-zero number." };
      return { settings: { scale: f, ...(factorUnit ? { unit: factorUnit } : {}) }, error: null };
    }
  }
}
