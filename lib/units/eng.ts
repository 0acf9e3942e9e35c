/**
 * Engineering notation: parse "2.2k", "3.3n", "150m", "4.7µ"/"4.7u", "1M" (mega), "10meg", "1e-3", with an
 * optional unit after the prefix ("2.2kΩ", "100nF", "5 V"); format numbers with SI prefixes.
 */

/** SI prefixes we read and write, exponent of ten for each. "M" is mega; "m" is milli. */
const PREFIX: Record<string, number> = {
  f: -15, p: -12, n: -9, u: -6, "µ": -6, "μ": -6, m: -3, k: 3, K: 3, M: 6, G: 9, T: 12,
};

export type ParseResult = { ok: true; value: number } | { ok: false; error: string };

const NUMBER = /^([+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)\s*(meg|[fpnuµμmkKMGT])?\s*([A-Za-zΩ°%/]*)$/;

/**
 * Parse a value typed by a person. `unit`, when given, may follow the number and prefix ("4.7kΩ" with unit "Ω").
 * Returns a reason instead of throwing, so forms can show it beside the field.
 */
export function parseEng(text: string, unit?: string): ParseResult {
  const s = text.trim().replace(/,/g, "");
  if (s === "") return { ok: false, error: "Enter a value" };
  const m = NUMBER.exec(s);
  if (!m) return { ok: false, error: `"${text}" is not a number (examples: 2.2k, 3.3n, 150m, 4.7µ)` };
  const [, num, prefix, rest] = m;
  let exp = 0;
  if (prefix) exp = prefix === "meg" ? 6 : PREFIX[prefix];
  if (rest) {
    const allowed = unit ? [unit, unit.toLowerCase(), ...(unit === "Ω" ? ["ohm", "ohms", "R"] : [])] : [];
    if (!allowed.includes(rest)) {
      return { ok: false, error: unit ? `Unexpected "${rest}" (unit is ${unit})` : `Unexpected "${rest}"` };
    }
  }
  const value = Number(num) * 10 ** exp;
  if (!Number.isFinite(value)) return { ok: false, error: "Value is out of range" };
  return { ok: true, value };
}

const OUT_PREFIX: [number, string][] = [
  [12, "T"], [9, "G"], [6, "M"], [3, "k"], [0, ""], [-3, "m"], [-6, "µ"], [-9, "n"], [-12, "p"], [-15, "f"],
];

/** Format with an SI prefix and `digits` significant digits (3 by default): 2200 → "2.20 k", with unit "2.20 kΩ". */
export function formatEng(value: number, unit = "", digits = 3): string {
  if (!Number.isFinite(value)) return Number.isNaN(value) ? "—" : value > 0 ? "∞" : "−∞";
  if (value === 0) return `0 ${unit}`.trim();
  const sign = value < 0 ? "−" : "";
  const a = Math.abs(value);
  let exp = Math.floor(Math.log10(a) / 3) * 3;
  exp = Math.max(-15, Math.min(12, exp));
  let mant = a / 10 ** exp;
  let text = mant.toPrecision(digits);
  // Rounding may carry to 1000 (999.7 → "1000"): move up one prefix.
  if (Number(text) >= 1000 && exp < 12) {
    exp += 3;
    mant = a / 10 ** exp;
    text = mant.toPrecision(digits);
  }
  const prefix = OUT_PREFIX.find(([e]) => e === exp)?.[1] ?? "";
  return `${sign}${text} ${prefix}${unit}`.trim();
}
