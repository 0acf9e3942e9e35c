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
