/**
 * CSV export of plotted waveforms: one column per series, a header naming each with its unit, numbers written
 * with full precision (shortest round-trip form) so a re-import gives the same doubles. RFC 4180 quoting.
 */

export interface CsvColumn {
  name: string;
  /** SI unit, written in the header as "name (unit)". */
  unit?: string;
  data: ArrayLike<number>;
}

function quote(field: string): string {
  return /[",\r\n]/.test(field) ? `"${field.replace(/"/g, '""')}"` : field;
}

/** Build a CSV document; columns may differ in length (short ones leave empty cells). Lines end with CRLF. */
export function toCsv(columns: readonly CsvColumn[]): string {
  if (columns.length === 0) throw new RangeError("toCsv: no columns to write");
  const header = columns.map((c) => quote(c.unit ? `${c.name} (${c.unit})` : c.name)).join(",");
  let rows = 0;
  for (const c of columns) rows = Math.max(rows, c.data.length);
  const lines: string[] = [header];
  const cells: string[] = new Array(columns.length);
  for (let i = 0; i < rows; i++) {
    for (let j = 0; j < columns.length; j++) {
      const d = columns[j]!.data;
      if (i >= d.length) {
        cells[j] = "";
        continue;
      }
      const v = d[i]!;
      cells[j] = Number.isFinite(v) ? String(v) : Number.isNaN(v) ? "NaN" : v > 0 ? "Infinity" : "-Infinity";
    }
    lines.push(cells.join(","));
  }
  return lines.join("\r\n") + "\r\n";
}

/** A file name safe on every OS: letters, digits, dash, underscore, dot. */
export function safeFileName(title: string, ext: string): string {
  const base = title.normalize("NFKD").replace(/[^\w.-]+/g, "-").replace(/^-+|-+$/g, "").slice(0, 80) || "quell";
  return `${base}.${ext}`;
}
