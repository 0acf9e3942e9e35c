/**
 * Part-value fields: engineering-notation input checked against a range (never silently clamped), a compact
 * form for typing back into a field, and the mapping of logarithmic sliders.
 */
import { formatEng, parseEng, type ParseResult } from "./eng";

export interface FieldRule {
  /** unit symbol shown and accepted after the number ("Ω", "F") */
  unit?: string;
  /** allowed range, SI; inclusive */
  min?: number;
  max?: number;
  /** whether 0 is allowed even when min > 0 (e.g. "no compensation capacitor") */
  allowZero?: boolean;
}

/** Parse a field and check its range; the error says what is allowed, in the field's unit. */
export function parseField(text: string, rule: FieldRule = {}): ParseResult {
  const r = parseEng(text, rule.unit);
  if (!r.ok) return r;
  const v = r.value;
  if (v === 0 && rule.allowZero) return r;
  const unit = rule.unit ?? "";
  if (rule.min !== undefined && v < rule.min) {
    return { ok: false, error: `${formatEng(v, unit)} is below the smallest allowed value, ${formatEng(rule.min, unit)}` };
  }
  if (rule.max !== undefined && v > rule.max) {
    return { ok: false, error: `${formatEng(v, unit)} is above the largest allowed value, ${formatEng(rule.max, unit)}` };
  }
  return r;
}

/** Compact engineering form for an input box: 2200 → "2.2k", 3.3e-9 → "3.3n", 1e6 → "1M" (parseEng reads it back). */
export function formatEngInput(value: number, digits = 4): string {
  if (!Number.isFinite(value)) return String(value);
  if (value === 0) return "0";
  const text = formatEng(value, "", digits);
  // formatEng writes "2.200 k": drop the space and trailing zeros of the mantissa.
  const m = /^(−?)([\d.]+) ?(.*)$/.exec(text);
  if (!m) return String(value);
  let mant = m[2];
  if (mant.includes(".")) mant = mant.replace(/0+$/, "").replace(/\.$/, "");
  const prefix = m[3] === "µ" ? "µ" : m[3];
  return `${m[1] ? "-" : ""}${mant}${prefix}`;
}

/** Slider position 0…1 → value on a logarithmic scale between min and max (both > 0). */
export function logSliderValue(position: number, min: number, max: number): number {
  if (!(min > 0 && max > min)) throw new RangeError("A logarithmic slider needs 0 < min < max");
  const p = Math.min(1, Math.max(0, position));
  return Math.exp(Math.log(min) + p * (Math.log(max) - Math.log(min)));
}

/** Value → slider position 0…1 on a logarithmic scale (values outside the range pin to the ends). */
export function logSliderPosition(value: number, min: number, max: number): number {
  if (!(min > 0 && max > min)) throw new RangeError("A logarithmic slider needs 0 < min < max");
  if (!(value > 0)) return 0;
  const p = (Math.log(value) - Math.log(min)) / (Math.log(max) - Math.log(min));
  return Math.min(1, Math.max(0, p));
}
