import { formatEng } from "@/lib/units/eng";

/**
 * Compact editable text for a value, in the notation people type: 2.2e-9 → "2.2n", 47000 → "47k", 0.1 → "100m",
 * 5620 → "5.62k". Four significant digits, trailing zeros dropped; `parseEng` reads it back.
 */
export function editText(value: number): string {
  if (value === 0) return "0";
  if (!Number.isFinite(value)) return String(value);
  const t = formatEng(value, "", 4); // "2.200 n"
  const m = /^(−?)([\d.]+)\s*(\S*)$/.exec(t);
  if (!m) return String(value);
  const num = m[2]!.includes(".") ? m[2]!.replace(/0+$/, "").replace(/\.$/, "") : m[2]!;
  return `${m[1] === "−" ? "-" : ""}${num}${m[3] ?? ""}`;
}

/** Units shown as plain decimals rather than with SI prefixes (100m % would read badly). */
export const PLAIN_UNITS: ReadonlySet<string> = new Set(["", "%", "°", "°C", "°C/W"]);

/** `editText` for SI quantities; plain decimals (four significant digits) for the units in PLAIN_UNITS. */
export function editTextFor(value: number, unit: string): string {
  if (!PLAIN_UNITS.has(unit) || !Number.isFinite(value)) return editText(value);
  return String(Number(value.toPrecision(4)));
}
