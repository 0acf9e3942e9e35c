/**
 * Oscilloscope CSV exports → a time column and scaled channels in SI units.
 *
 * Accepts what bench scopes and their PC software write: a preamble of settings lines, a header row of column
 * names (units in brackets or after a slash), optionally a separate units row, then numeric rows of time plus one or
 * more channels; comma, semicolon or tab delimited (decimal commas with semicolon or tab). The parser is strict on the
 * data block: a row with the wrong number of fields, a cell that is not a number or time that does not increase is an
 * error naming the line, and nothing is returned. Pure; runs in the browser (preview) and on the server (upload).
 */
import Papa from "papaparse";
import { isUnitsRow, parseUnit, splitHeading, type BaseUnit } from "./units";

/** Largest file accepted, bytes. */
export const MAX_TRACE_BYTES = 8 * 1024 * 1024;
/** Most data rows accepted. */
export const MAX_TRACE_ROWS = 250_000;
/** Fewest data rows that make a step response. */
export const MIN_TRACE_ROWS = 16;
/** Most channels (columns after time). */
export const MAX_TRACE_CHANNELS = 8;

export interface ChannelOption {
  /** Display name; defaults to the header. */
  name?: string;
  /** Unit of the value as written when the file does not say it ("V", "mV", "A", "mA"). */
  sourceUnit?: string;
  /** Multiplier applied after the unit prefix, e.g. a current probe's A/V or 1/Rsense to turn volts into amps. */
  scale?: number;
  /** Unit after scaling; defaults to the source unit's base (V or A). */
  unit?: string;
}

export interface TraceParseOptions {
  /** Time unit when the file does not say it, or to override it ("s", "ms", "µs", "us", "ns"). */
  timeUnit?: string;
  /** Per-channel settings, in column order after time. */
  channels?: ChannelOption[];
  maxBytes?: number;
  maxRows?: number;
}

export interface ParsedChannel {
  name: string;
  /** Unit after scaling. */
  unit: string;
  /** Unit as written in the file (or given by the user). */
  sourceUnit: string;
  /** Total factor from the number in the file to the stored value (prefix × user scale). */
  scale: number;
  values: Float64Array;
}

export interface ParsedTrace {
  /** Seconds. */
  time: Float64Array;
  channels: ParsedChannel[];
  delimiter: string;
  /** 1-based line of the first data row. */
  firstDataLine: number;
  /** Settings lines above the header, as written (at most 40). */
  preamble: string[];
  warnings: string[];
}

export interface TraceProblem {
  /** 1-based line in the file; 0 for the file as a whole. */
  line: number;
  message: string;
}

/** The file cannot be read as a trace; `problems` name the lines. */
export class TraceParseError extends Error {
  readonly problems: TraceProblem[];
  constructor(problems: TraceProblem[]) {
    super(describeProblems(problems));
    this.name = "TraceParseError";
    this.problems = problems;
  }
}

/**
 * The first problem as a sentence that starts with a capital: "Line 3 of bench.csv: column 2 (CH1): "abc" is not a
 * number (and 2 more problems)." The file name is optional.
 */
export function describeProblems(problems: TraceProblem[], fileName?: string): string {
  const first = problems[0];
  const more = problems.length > 1 ? ` (and ${problems.length - 1} more problem${problems.length > 2 ? "s" : ""})` : "";
  const of = fileName ? ` of ${fileName}` : "";
  const text = first.line > 0
    ? `Line ${first.line}${of}: ${first.message}`
    : `${fileName ? `${fileName}: ` : ""}${first.message.charAt(0).toUpperCase()}${first.message.slice(1)}`;
  return `${text}${more}${/[.!?]$/.test(text + more) ? "" : "."}`;
}

export function isTraceParseError(e: unknown): e is TraceParseError {
  return e instanceof TraceParseError;
}

const MAX_PROBLEMS = 10;
const NUMERIC = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;
const NUMERIC_COMMA = /^[+-]?\d+,\d+(?:[eE][+-]?\d+)?$/;

function byteLength(text: string): number {
  return new TextEncoder().encode(text).length;
}

function trimTrailingEmpty(cells: string[]): string[] {
  let n = cells.length;
  while (n > 0 && cells[n - 1].trim() === "") n--;
  return n === cells.length ? cells : cells.slice(0, n);
}

/** Lines read to find the header and the start of the data. */
const HEAD_LINES = 500;

/** Number of lines (a final line without a newline counts; a trailing newline does not add one). */
function countLines(text: string): number {
  let n = 1;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (c === 10) n++;
    else if (c === 13) { n++; if (text.charCodeAt(i + 1) === 10) i++; }
  }
  return n;
}

/** Index just past the end of line `n` (1-based), or the text's length. */
function nthLineEnd(text: string, n: number): number {
  let seen = 0;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (c === 10 || c === 13) {
      if (c === 13 && text.charCodeAt(i + 1) === 10) i++;
      if (++seen === n) return i + 1;
    }
  }
  return text.length;
}

/** The last `n` non-empty lines, read from the end. */
function lastLines(text: string, n: number): string[] {
  const out: string[] = [];
  let end = text.length;
  while (end > 0 && out.length < n) {
    let i = end - 1;
    while (i >= 0 && text.charCodeAt(i) !== 10 && text.charCodeAt(i) !== 13) i--;
    const line = text.slice(i + 1, end);
    if (line.trim() !== "") out.push(line);
    end = i;
    if (end > 0 && text.charCodeAt(end) === 10 && text.charCodeAt(end - 1) === 13) end--;
  }
  return out;
}

/** Pick the delimiter that splits the last lines of the file into the same number (≥ 2) of fields. */
function detectDelimiter(lines: string[]): string | null {
  const tail: string[] = [];
  for (let i = lines.length - 1; i >= 0 && tail.length < 20; i--) if (lines[i].trim() !== "") tail.push(lines[i]);
  for (const d of ["\t", ";", ","]) {
    const counts = tail.map((l) => l.replace(new RegExp(`${d === "\t" ? "\\t" : d}+\\s*$`), "").split(d).length);
    // The most common field count must be ≥ 2 and hold for most lines (a broken row must not hide the delimiter).
    const freq = new Map<number, number>();
    for (const c of counts) freq.set(c, (freq.get(c) ?? 0) + 1);
    let mode = 0;
    let modeCount = 0;
    for (const [c, f] of freq) if (f > modeCount) { mode = c; modeCount = f; }
    // A comma also appears in decimal-comma files; the semicolon and tab are tried first.
    if (mode >= 2 && modeCount >= 0.75 * counts.length) return d;
  }
  return null;
}

/**
 * When no delimiter splits the file's last lines alike: the first line that breaks the columns. With a delimiter that
 * splits most lines into two or more fields, the first line after the first such line whose field count differs;
 * with none (a one-column file), the first non-empty line.
 */
function firstLineWithoutColumns(lines: string[]): TraceProblem {
  const expected = "expected a time column and at least one channel separated by commas, semicolons or tabs";
  let best: { d: string; width: number; count: number } | null = null;
  for (const d of ["\t", ";", ","]) {
    const freq = new Map<number, number>();
    for (const l of lines) {
      if (l.trim() === "") continue;
      const n = l.replace(/\s+$/, "").split(d).length;
      if (n >= 2) freq.set(n, (freq.get(n) ?? 0) + 1);
    }
    for (const [width, count] of freq) if (!best || count > best.count) best = { d, width, count };
  }
  const quote = (l: string) => `“${l.trim().slice(0, 40)}${l.trim().length > 40 ? "…" : ""}”`;
  if (!best) {
    const i = lines.findIndex((l) => l.trim() !== "");
    return { line: i + 1, message: `${quote(lines[i])} is a single column: ${expected}` };
  }
  const name = best.d === "\t" ? "tabs" : best.d === ";" ? "semicolons" : "commas";
  let seen = false;
  for (let i = 0; i < lines.length; i++) {
    const l = lines[i];
    if (l.trim() === "") continue;
    const n = l.replace(/\s+$/, "").split(best.d).length;
    if (n === best.width) { seen = true; continue; }
    if (seen || n < best.width) {
      return { line: i + 1, message: `${quote(l)} has ${n} field${n === 1 ? "" : "s"} where the lines around it have ${best.width} separated by ${name}` };
    }
  }
  return { line: 0, message: `no column delimiter found: ${expected}` };
}

/**
 * Parse an oscilloscope CSV export. Throws `TraceParseError` (naming the line and the problem) when the file
 * cannot be read; returns the time column in seconds and each channel scaled to SI units.
 */
export function parseTraceCsv(text: string, options: TraceParseOptions = {}): ParsedTrace {
  const maxBytes = options.maxBytes ?? MAX_TRACE_BYTES;
  const maxRows = options.maxRows ?? MAX_TRACE_ROWS;
  if (text.length > maxBytes || (text.length * 3 > maxBytes && byteLength(text) > maxBytes)) {
    throw new TraceParseError([
      { line: 0, message: `the file is ${(byteLength(text) / 1048576).toFixed(1)} MB; the limit is ${(maxBytes / 1048576).toFixed(1)} MB` },
    ]);
  }
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  if (body.trim() === "") throw new TraceParseError([{ line: 0, message: "the file is empty" }]);

  // The file is read twice without splitting it whole (a 250 000-row export would otherwise make a quarter of a
  // million row arrays that live through the whole parse): the first HEAD_LINES lines find the header and the data
  // block, then papaparse streams the rows (step callback) straight into typed arrays.
  const lineCount = countLines(body);
  const headEnd = nthLineEnd(body, HEAD_LINES);
  const headText = body.slice(0, headEnd);
  const headLines = headText.split(/\r\n|\n|\r/);
  const delimiter = detectDelimiter(lastLines(body, 20));
  if (!delimiter) throw new TraceParseError([firstLineWithoutColumns(headLines)]);
  const decimalComma = delimiter !== ",";

  // One line per row: with quotes only around single-line headings, papaparse's row index is the line index.
  const parsed = Papa.parse<string[]>(headText, { delimiter, skipEmptyLines: false, header: false, dynamicTyping: false });
  const rows = parsed.data;
  const problems: TraceProblem[] = [];
  for (const err of parsed.errors) {
    if (err.type === "Quotes" && problems.length < MAX_PROBLEMS) {
      problems.push({ line: (err.row ?? 0) + 1, message: err.message });
    }
  }
  if (problems.length) throw new TraceParseError(problems);

  const toNumber = (cell: string): number | null => {
    const s = cell.trim();
    if (NUMERIC.test(s)) return Number(s);
    if (decimalComma && NUMERIC_COMMA.test(s)) return Number(s.replace(",", "."));
    return null;
  };
  const isNumericRow = (cells: string[]) => cells.length >= 2 && cells.every((c) => toNumber(c) !== null);

  // The data block starts at the first numeric row followed by numeric rows of the same width.
  let start = -1;
  let width = 0;
  for (let i = 0; i < rows.length && start < 0; i++) {
    const cells = trimTrailingEmpty(rows[i]);
    if (!isNumericRow(cells)) continue;
    let ok = false;
    for (let j = i + 1; j < rows.length; j++) {
      const next = trimTrailingEmpty(rows[j]);
      if (next.length === 0) continue;
      ok = next.length === cells.length && isNumericRow(next);
      break;
    }
    if (ok) { start = i; width = cells.length; }
  }
  if (start < 0) {
    throw new TraceParseError([
      {
        line: 0,
        message: lineCount > HEAD_LINES
          ? `no block of numeric rows found in the first ${HEAD_LINES} lines: expected a time column and at least one channel`
          : "no block of numeric rows found: expected a time column and at least one channel",
      },
    ]);
  }
  if (width - 1 > MAX_TRACE_CHANNELS) {
    throw new TraceParseError([
      { line: start + 1, message: `${width - 1} channels; at most ${MAX_TRACE_CHANNELS} are accepted` },
    ]);
  }

  // Header: the nearest non-empty rows above the data of the same width (names, then perhaps a units row).
  const above: string[][] = [];
  let preambleEnd = start;
  for (let i = start - 1; i >= 0 && above.length < 2; i--) {
    const cells = trimTrailingEmpty(rows[i]);
    if (cells.length === 0) { if (above.length === 0) continue; else break; }
    // A row whose time cell is a number, right above the data, is a broken data row, not a heading: say so.
    if (above.length === 0 && toNumber(cells[0]) !== null) {
      if (cells.length !== width) {
        throw new TraceParseError([{ line: i + 1, message: `expected ${width} fields (time and ${width - 1} channel${width > 2 ? "s" : ""}), found ${cells.length}` }]);
      }
      const c = cells.findIndex((x) => toNumber(x) === null);
      if (c >= 0) throw new TraceParseError([{ line: i + 1, message: `column ${c + 1}: "${cells[c].trim().slice(0, 40)}" is not a number` }]);
    }
    if (cells.length !== width || isNumericRow(cells)) break;
    above.unshift(cells);
    preambleEnd = i;
  }
  let names: string[] | null = null;
  let unitsRow: string[] | null = null;
  if (above.length === 2 && isUnitsRow(above[1])) { names = above[0]; unitsRow = above[1]; }
  else if (above.length >= 1) {
    const last = above[above.length - 1];
    if (isUnitsRow(last) && above.length === 1) unitsRow = last;
    else names = last;
  }
  const preamble = headLines.slice(0, preambleEnd).filter((l) => l.trim() !== "").slice(0, 40);

  const warnings: string[] = [];
  const columnLabel = (c: number) => {
    if (names) return splitHeading(names[c]).label || (c === 0 ? "Time" : `CH${c}`);
    return c === 0 ? "Time" : `CH${c}`;
  };
  const columnUnit = (c: number) => {
    if (unitsRow && unitsRow[c]) { const u = parseUnit(unitsRow[c]); if (u) return u; }
    if (names) return splitHeading(names[c]).unit;
    return null;
  };

  // Time unit: the user's choice wins; else the header; else seconds, with a warning.
  let timeFactor = 1;
  if (options.timeUnit) {
    const u = parseUnit(options.timeUnit);
    if (!u || u.base !== "s") throw new TraceParseError([{ line: 0, message: `time unit "${options.timeUnit}" is not a time unit (s, ms, µs, ns)` }]);
    timeFactor = u.factor;
  } else {
    const u = columnUnit(0);
    if (u && u.base === "s") timeFactor = u.factor;
    else if (u) throw new TraceParseError([{ line: preambleEnd + 1, message: `the first column is in ${u.text}, not a time unit` }]);
    else warnings.push("the time unit is not in the header: seconds assumed");
  }

  const nChannels = width - 1;
  const channelMeta: { name: string; unit: string; sourceUnit: string; scale: number }[] = [];
  for (let c = 1; c <= nChannels; c++) {
    const opt = options.channels?.[c - 1] ?? {};
    let source = columnUnit(c);
    if (opt.sourceUnit) {
      const u = parseUnit(opt.sourceUnit);
      if (!u || u.base === "s") throw new TraceParseError([{ line: 0, message: `channel ${c}: "${opt.sourceUnit}" is not a voltage or current unit` }]);
      source = u;
    }
    const userScale = opt.scale ?? 1;
    if (!Number.isFinite(userScale) || userScale === 0) {
      throw new TraceParseError([{ line: 0, message: `channel ${c}: scale factor must be a finite, non-zero number` }]);
    }
    const base: BaseUnit | "" = source ? source.base : "";
    if (!source && opt.scale === undefined) warnings.push(`channel ${c}: unit not in the header, values kept as written`);
    channelMeta.push({
      name: opt.name?.trim() || columnLabel(c),
      unit: opt.unit?.trim() || base || "",
      sourceUnit: source ? source.text : "",
      scale: (source ? source.factor : 1) * userScale,
    });
  }

  // Data rows, streamed. Arrays are sized for every line after the start and trimmed at the end.
  const capacity = Math.max(0, Math.min(lineCount - start, maxRows + 1));
  let time = new Float64Array(capacity);
  let values = Array.from({ length: nChannels }, () => new Float64Array(capacity));
  let count = 0;
  let overLine = 0;
  let prevTime = -Infinity;
  let index = -1;
  const rowProblems: TraceProblem[] = [];
  Papa.parse<string[]>(body, {
    delimiter,
    skipEmptyLines: false,
    header: false,
    dynamicTyping: false,
    step(result) {
      index++;
      if (index < start) return;
      const line = index + 1;
      if (result.errors.length && rowProblems.length < MAX_PROBLEMS) {
        for (const err of result.errors) if (err.type === "Quotes") rowProblems.push({ line, message: err.message });
      }
      const raw = result.data;
      let n = raw.length;
      while (n > 0 && raw[n - 1].trim() === "") n--;
      if (n === 0) return;
      count++;
      if (count > maxRows) {
        if (overLine === 0) overLine = line;
        return;
      }
      if (rowProblems.length >= MAX_PROBLEMS) return;
      const k = count - 1;
      if (n !== width) {
        rowProblems.push({ line, message: `expected ${width} fields (time and ${nChannels} channel${nChannels > 1 ? "s" : ""}), found ${n}` });
        return;
      }
      for (let c = 0; c < width; c++) {
        const v = toNumber(raw[c]);
        if (v === null || !Number.isFinite(v)) {
          const label = c === 0 ? "time" : channelMeta[c - 1].name;
          rowProblems.push({ line, message: `column ${c + 1} (${label}): "${raw[c].trim().slice(0, 40)}" is not a number` });
          return;
        }
        if (c === 0) time[k] = v * timeFactor;
        else values[c - 1][k] = v * channelMeta[c - 1].scale;
      }
      if (!(time[k] > prevTime)) {
        rowProblems.push({ line, message: `time ${raw[0].trim()} does not increase (the row above is at or after it)` });
      }
      prevTime = time[k];
    },
  });
  if (count > maxRows) {
    // The limit comes first: the rows past it were not read.
    throw new TraceParseError([{ line: overLine, message: `more than ${maxRows.toLocaleString("en")} data rows (the file has ${count.toLocaleString("en")}); the limit is ${maxRows.toLocaleString("en")}` }]);
  }
  if (rowProblems.length) throw new TraceParseError(rowProblems);
  if (count < MIN_TRACE_ROWS) {
    throw new TraceParseError([{ line: start + 1, message: `only ${count} data rows; a step response needs at least ${MIN_TRACE_ROWS}` }]);
  }
  if (count < capacity) {
    time = time.slice(0, count);
    values = values.map((v) => v.slice(0, count));
  }

  return {
    time,
    channels: channelMeta.map((m, c) => ({ ...m, values: values[c] })),
    delimiter,
    firstDataLine: start + 1,
    preamble,
    warnings,
  };
}
