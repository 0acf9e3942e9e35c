import { formatEng } from "./eng";

/**
 * A quantity as every table shows it: "—" when there is none; a bare ratio as a plain number (3 significant digits,
 * no SI prefix: "0.403", not "403 m"); a percentage with two decimals and what it is of ("12.50 % FS"; a
 * "% of step" reads "%", the row's label says of what); a temperature in whole degrees; anything else in
 * engineering notation with `digits` significant digits (3 unless a column needs more).
 */
export function formatQuantity(value: number | null | undefined, unit: string, digits = 3): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return "—";
  if (unit === "") return value.toPrecision(digits);
  if (unit.startsWith("%")) return `${value.toFixed(2)} ${unit === "% of step" ? "%" : unit}`;
  if (unit === "°C") return `${value.toFixed(0)} °C`;
  return formatEng(value, unit, digits);
}
