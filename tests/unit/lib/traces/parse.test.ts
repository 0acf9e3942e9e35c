import { describe, expect, it } from "vitest";
import { channelSettings, parseTraceCsv, TraceParseError, MIN_TRACE_ROWS } from "@/lib/traces";

/** Rows of a 1 kHz-sampled ramp: time k·dt, channel 1 = k·0.01, channel 2 = −k. Made here, so the values are known. */
function rows(n: number, dt: number, fmt: (t: number, a: number, b: number) => string): string[] {
  return Array.from({ length: n }, (_, k) => fmt(k * dt, k * 0.01, -k));
}

function expectProblem(fn: () => unknown, line: number, pattern: RegExp) {
  try {
    fn();
  } catch (e) {
    expect(e).toBeInstanceOf(TraceParseError);
    const p = (e as TraceParseError).problems[0];
    expect(p.line).toBe(line);
    expect(p.message).toMatch(pattern);
    expect((e as Error).message).toContain(line > 0 ? `Line ${line}: ${p.message}` : p.message.slice(1));
    // one sentence that starts with a capital and ends with a full stop
    expect((e as Error).message).toMatch(/^[A-Z].*\.$/);
    return;
  }
  throw new Error("expected a TraceParseError");
}

describe("parseTraceCsv: header styles", () => {
  it("reads a plain header with units in brackets (ms and mV → s and V)", () => {
    const text = ["Time [ms],CH1 [mV],CH2 [mA]", ...rows(40, 0.5, (t, a, b) => `${t},${a},${b}`)].join("\n");
    const r = parseTraceCsv(text);
    expect(r.delimiter).toBe(",");
    expect(r.firstDataLine).toBe(2);
    expect(r.time.length).toBe(40);
    // 0.5 ms per row × 39 rows = 19.5 ms = 0.0195 s (SI prefix m = 1e-3)
    expect(r.time[39]).toBeCloseTo(0.0195, 12);
    expect(r.channels.map((c) => [c.name, c.unit, c.sourceUnit])).toEqual([["CH1", "V", "mV"], ["CH2", "A", "mA"]]);
    // 39 × 0.01 mV = 0.39 mV = 3.9e-4 V
    expect(r.channels[0].values[39]).toBeCloseTo(3.9e-4, 15);
    expect(r.channels[1].values[39]).toBeCloseTo(-0.039, 15);
    expect(r.warnings).toEqual([]);
  });

  it("reads a settings preamble, a names row and a separate units row", () => {
    const text = [
      "Model,Bench scope",
      "Sample Interval,1.000000e-06",
      "Trigger Point,100",
      "",
      "TIME,CH1",
      "us,V",
      ...rows(20, 1, (t, a) => `${t.toExponential(6)},${a.toExponential(6)}`),
    ].join("\r\n");
    const r = parseTraceCsv(text);
    expect(r.preamble).toEqual(["Model,Bench scope", "Sample Interval,1.000000e-06", "Trigger Point,100"]);
    expect(r.firstDataLine).toBe(7);
    expect(r.time[19]).toBeCloseTo(19e-6, 15); // 19 µs
    expect(r.channels[0]).toMatchObject({ name: "CH1", unit: "V", sourceUnit: "V" });
  });

  it("reads a units row written in brackets", () => {
    const text = ["Time,Ch A", "(ms),[mA]", ...rows(20, 1, (t, a) => `${t},${a}`)].join("\n");
    const r = parseTraceCsv(text);
    expect(r.time[2]).toBeCloseTo(2e-3, 15); // 2 ms
    expect(r.channels[0]).toMatchObject({ name: "Ch A", unit: "A", sourceUnit: "mA" });
    expect(r.channels[0].values[2]).toBeCloseTo(2e-5, 15); // 0.02 mA
  });

  it("reads slash units, semicolons with decimal commas, and a BOM", () => {
    const text = "\ufeffTime/s;Current/A\n" + rows(20, 0.001, (t, a) => `${t.toFixed(3).replace(".", ",")};${a.toFixed(2).replace(".", ",")}`).join("\n");
    const r = parseTraceCsv(text);
    expect(r.delimiter).toBe(";");
    expect(r.time[10]).toBeCloseTo(0.01, 12);
    expect(r.channels[0].name).toBe("Current");
    expect(r.channels[0].values[10]).toBeCloseTo(0.1, 12);
  });

  it("reads tab-separated files without a header, with the user's units and scale (volts across 0.1 Ω → amps)", () => {
    const text = rows(20, 2, (t, a) => `${t}\t${a}`).join("\n") + "\n\n";
    const r = parseTraceCsv(text, { timeUnit: "µs", channels: [{ sourceUnit: "V", scale: 1 / 0.1, unit: "A", name: "Load current" }] });
    expect(r.delimiter).toBe("\t");
    expect(r.time[5]).toBeCloseTo(10e-6, 15);
    // I = V / Rsense (Ohm's law): 0.05 V / 0.1 Ω = 0.5 A
    expect(r.channels[0].values[5]).toBeCloseTo(0.5, 12);
    expect(r.channels[0]).toMatchObject({ name: "Load current", unit: "A", sourceUnit: "V" });
  });

  it("combines a header prefix with the user's probe factor (mV × 10 A/V)", () => {
    const text = ["Time (s),Probe (mV)", ...rows(20, 1e-6, (t, a) => `${t},${a * 100}`)].join("\n");
    const r = parseTraceCsv(text, { channels: [{ scale: 10, unit: "A" }] });
    // row 3: 3 mV × 1e-3 × 10 A/V = 0.03 A
    expect(r.channels[0].values[3]).toBeCloseTo(0.03, 12);
    expect(r.channels[0].scale).toBeCloseTo(1e-2, 15);
  });

  it("warns when the time unit is missing and assumes seconds", () => {
    const text = ["X,Y", ...rows(20, 1, (t, a) => `${t},${a}`)].join("\n");
    const r = parseTraceCsv(text);
    expect(r.warnings.join(" ")).toMatch(/seconds assumed/);
    expect(r.time[3]).toBe(3);
  });
});

describe("parseTraceCsv: broken files name the line and the problem", () => {
  const good = (n = 30) => rows(n, 1e-6, (t, a) => `${t},${a}`);

  it("a cell that is not a number", () => {
    const lines = ["Time (s),CH1 (V)", ...good()];
    lines[12] = "1.1e-5,abc"; // line 13
    expectProblem(() => parseTraceCsv(lines.join("\n")), 13, /column 2 \(CH1\): "abc" is not a number/);
  });

  it("a broken second data row is not mistaken for a heading", () => {
    const lines = ["Time (s),CH1 (V)", ...good()];
    lines[2] = "1e-6,?"; // line 3
    expectProblem(() => parseTraceCsv(lines.join("\n")), 3, /column 2: "\?" is not a number/);
  });

  it("a row with a missing field", () => {
    const lines = ["Time (s),CH1 (V),CH2 (V)", ...rows(30, 1e-6, (t, a, b) => `${t},${a},${b}`)];
    lines[20] = "1.9e-5,0.19"; // line 21
    expectProblem(() => parseTraceCsv(lines.join("\n")), 21, /expected 3 fields \(time and 2 channels\), found 2/);
  });

  it("time that does not increase", () => {
    const lines = ["Time (s),CH1 (V)", ...good()];
    lines[8] = "5e-6,0.07"; // line 9 goes back to 5 µs after 6 µs
    expectProblem(() => parseTraceCsv(lines.join("\n")), 9, /time 5e-6 does not increase/);
  });

  it("counts every problem up to ten and names the first", () => {
    const lines = ["Time (s),CH1 (V)", ...good(60)];
    for (let i = 10; i < 60; i += 5) lines[i] = `${i * 1e-6},x`;
    try {
      parseTraceCsv(lines.join("\n"));
      throw new Error("expected a TraceParseError");
    } catch (e) {
      expect((e as TraceParseError).problems.length).toBe(10);
      expect((e as Error).message).toMatch(/^Line 11: .*\(and 9 more problems\)\.$/);
    }
  });

  it("too many rows names the first line past the limit", () => {
    const text = ["Time (s),CH1 (V)", ...good(120)].join("\n");
    expectProblem(() => parseTraceCsv(text, { maxRows: 100 }), 102, /more than 100 data rows \(the file has 120\)/);
  });

  it("too big a file", () => {
    const text = ["Time (s),CH1 (V)", ...good(2000)].join("\n");
    expectProblem(() => parseTraceCsv(text, { maxBytes: 10_000 }), 0, /the file is 0\.0 MB; the limit is 0\.0 MB|the limit is/);
  });

  it("too few rows", () => {
    const text = ["Time (s),CH1 (V)", ...good(MIN_TRACE_ROWS - 1)].join("\n");
    expectProblem(() => parseTraceCsv(text), 2, /only 15 data rows/);
  });

  it("a settings preamble longer than the 500 lines searched for the header", () => {
    const text = [...Array.from({ length: 600 }, (_, k) => `Setting ${k},value`), "Time (s),CH1 (V)", ...good()].join("\n");
    expectProblem(() => parseTraceCsv(text), 0, /no block of numeric rows found in the first 500 lines/);
  });

  it("an empty file, a single column, and a channel in seconds", () => {
    expectProblem(() => parseTraceCsv("  \n"), 0, /empty/);
    // a one-column file: its first line is the offending one (the issue saw "line 5")
    expectProblem(() => parseTraceCsv(Array.from({ length: 30 }, (_, k) => String(k)).join("\n") + "\n"), 1, /^“0” is a single column: expected a time column/);
    expectProblem(() => parseTraceCsv(["Time (s),CH1 (V)", ...good()].join("\n"), { channels: [{ sourceUnit: "ms" }] }), 0, /channel 1: "ms" is not a voltage or current unit/);
    expectProblem(() => parseTraceCsv(["Current (A),CH1 (V)", ...good()].join("\n")), 1, /first column is in A, not a time unit/);
    expectProblem(() => parseTraceCsv(["Time (s),CH1 (V)", ...good()].join("\n"), { channels: [{ scale: 0 }] }), 0, /scale factor must be a finite, non-zero number/);
  });
});

describe("parseTraceCsv: the first offending line, not the last", () => {
  it("text on lines 2 and 3 of a comma file names line 2 (the issue saw line 6, the trailing blank line)", () => {
    const text = ["Time (s),I (A)", "hello there", "more text", "0,0", "1e-6,0.1", ""].join("\n");
    expectProblem(() => parseTraceCsv(text), 2, /^“hello there” has 1 field where the lines around it have 2 separated by commas$/);
  });

  it("a one-column file with a header names line 1", () => {
    const text = ["Current", ...Array.from({ length: 4 }, (_, k) => String(k * 0.1)), ""].join("\n");
    expectProblem(() => parseTraceCsv(text), 1, /^“Current” is a single column/);
  });
});

describe("parseTraceCsv: units from column names", () => {
  // Each spelling with the factor its SI prefix gives (SI brochure: m = 1e-3): a value of 2 in the file.
  const cases: [string, string, string, number][] = [
    ["coil_current_A", "coil_current", "A", 2],
    ["I (A)", "I", "A", 2],
    ["I [mA]", "I", "A", 2e-3],
    ["current_mA", "current", "A", 2e-3],
    ["CH1 (mV)", "CH1", "V", 2e-3],
  ];
  for (const [heading, label, unit, value] of cases) {
    it(`"${heading}" → ${label} in ${unit}, 2 as written = ${value} ${unit}`, () => {
      const text = [`Time (s),${heading}`, ...rows(20, 1e-6, (t) => `${t},2`)].join("\n");
      const r = parseTraceCsv(text);
      expect(r.channels[0]).toMatchObject({ name: label, unit });
      expect(r.channels[0].values[5]).toBeCloseTo(value, 15);
      expect(r.warnings).toEqual([]);
    });
  }

  it("a word that only looks like a unit is not one: channel_a and Ch A stay without a unit", () => {
    const text = ["Time (s),channel_a,Ch A", ...rows(20, 1e-6, (t) => `${t},2,3`)].join("\n");
    const r = parseTraceCsv(text);
    expect(r.channels.map((c) => c.unit)).toEqual(["", ""]);
  });

  it("the user's choice 'already in amperes' gives a channel without a unit its unit, unscaled", () => {
    const text = ["t,probe", ...rows(20, 1e-6, (t) => `${t},2`)].join("\n");
    const r = parseTraceCsv(text, { timeUnit: "s", channels: [{ sourceUnit: "A" }] });
    expect(r.channels[0]).toMatchObject({ unit: "A", sourceUnit: "A", scale: 1 });
    expect(r.channels[0].values[3]).toBe(2); // amperes as written: factor 1
  });
});

describe("channelSettings: a channel's unit and scale corrected after upload", () => {
  it("mV across a 0.1 Ω sense resistor → A: factor 1e-3 × 10 = 0.01 (SI prefix m; Ohm's law)", () => {
    const c = channelSettings("mV", 1 / 0.1, "A");
    expect(c).toMatchObject({ unit: "A", sourceUnit: "mV" });
    expect(c.scale).toBeCloseTo(0.01, 15);
  });

  it("already in amperes: unit A, factor 1; no unit: as written", () => {
    expect(channelSettings("A")).toEqual({ unit: "A", sourceUnit: "A", scale: 1 });
    expect(channelSettings("mA")).toEqual({ unit: "A", sourceUnit: "mA", scale: 1e-3 }); // SI prefix m = 1e-3
    expect(channelSettings("")).toEqual({ unit: "", sourceUnit: "", scale: 1 });
  });

  it("refuses a zero scale with a message naming the field", () => {
    expect(() => channelSettings("V", 0)).toThrow(/^scale: a finite, non-zero number\.$/);
  });
});
