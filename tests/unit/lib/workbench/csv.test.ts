import Papa from "papaparse";
import { describe, expect, it } from "vitest";
import { safeFileName, toCsv } from "@/lib/workbench/csv";

describe("CSV export", () => {
  it("round-trips through an independent CSV parser (papaparse, RFC 4180) to the same doubles", () => {
    const time = new Float64Array([0, 1e-6, 2.5e-6, 1 / 3]);
    const current = new Float64Array([0, 0.123456789012345, -7.5e-4, Math.PI]);
    const text = toCsv([
      { name: "time", unit: "s", data: time },
      { name: "load current, \"coil\"", unit: "A", data: current },
    ]);
    const parsed = Papa.parse<string[]>(text.trimEnd(), { delimiter: ",", newline: "\r\n" });
    expect(parsed.errors).toEqual([]);
    expect(parsed.data[0]).toEqual(["time (s)", 'load current, "coil" (A)']);
    const rows = parsed.data.slice(1);
    expect(rows.map((r) => Number(r[0]))).toEqual(Array.from(time));
    expect(rows.map((r) => Number(r[1]))).toEqual(Array.from(current));
  });

  it("leaves cells empty where a column is shorter and writes non-finite values by name", () => {
    const text = toCsv([{ name: "a", data: [1, 2] }, { name: "b", data: [NaN] }]);
    expect(text).toBe("a,b\r\n1,NaN\r\n2,\r\n");
  });

  it("refuses an empty column list", () => {
    expect(() => toCsv([])).toThrow(RangeError);
  });

  it("makes file names safe", () => {
    expect(safeFileName("Valve coil driver / step", "csv")).toBe("Valve-coil-driver-step.csv");
  });
});
