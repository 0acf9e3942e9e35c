import { describe, expect, it } from "vitest";
import { eSeries, eValuesBetween, nearestE, nextDown, nextUp, toleranceBand } from "@/lib/design/eseries";

// Reference: IEC 60063:2015 preferred-number tables, as reproduced in docs/references.md §5e (RWTH Aachen MSP430 book,
// appendix A.5, cross-checked against the G4USP table).
const E24 = [1.0, 1.1, 1.2, 1.3, 1.5, 1.6, 1.8, 2.0, 2.2, 2.4, 2.7, 3.0, 3.3, 3.6, 3.9, 4.3, 4.7, 5.1, 5.6, 6.2, 6.8, 7.5, 8.2, 9.1];
const E12 = [1.0, 1.2, 1.5, 1.8, 2.2, 2.7, 3.3, 3.9, 4.7, 5.6, 6.8, 8.2];
// IEC 60063 E6 (every second E12 value) — from memory, consistent with the E12 table above.
const E6 = [1.0, 1.5, 2.2, 3.3, 4.7, 6.8];
const E96 = `1.00 1.02 1.05 1.07 1.10 1.13 1.15 1.18 1.21 1.24 1.27 1.30 1.33 1.37 1.40 1.43 1.47 1.50 1.54 1.58 1.62 1.65
  1.69 1.74 1.78 1.82 1.87 1.91 1.96 2.00 2.05 2.10 2.15 2.21 2.26 2.32 2.37 2.43 2.49 2.55 2.61 2.67 2.74 2.80
  2.87 2.94 3.01 3.09 3.16 3.24 3.32 3.40 3.48 3.57 3.65 3.74 3.83 3.92 4.02 4.12 4.22 4.32 4.42 4.53 4.64 4.75
  4.87 4.99 5.11 5.23 5.36 5.49 5.62 5.76 5.90 6.04 6.19 6.34 6.49 6.65 6.81 6.98 7.15 7.32 7.50 7.68 7.87 8.06
  8.25 8.45 8.66 8.87 9.09 9.31 9.53 9.76`.split(/\s+/).map(Number);

describe("E-series tables (IEC 60063)", () => {
  it("E24, E12 and E6 match the standard's two-digit tables", () => {
    expect([...eSeries("E24")]).toEqual(E24);
    expect([...eSeries("E12")]).toEqual(E12);
    expect([...eSeries("E6")]).toEqual(E6);
  });
  it("E96 matches the three-digit table and E48 is every second E96 value", () => {
    expect([...eSeries("E96")]).toEqual(E96);
    expect([...eSeries("E48")]).toEqual(E96.filter((_, i) => i % 2 === 0));
  });
  it("E192 holds 192 values, contains every E96 value, and lists 9.20 (IEC 60063's departure from the formula, docs/references.md §5e [MEM])", () => {
    const e192 = eSeries("E192");
    expect(e192.length).toBe(192);
    for (const v of E96) expect(e192).toContain(v);
    expect(e192).toContain(9.2);
    expect(e192).not.toContain(9.19);
  });
});

describe("E-series helpers", () => {
  it("snaps to the nearest value on a log scale across decades", () => {
    expect(nearestE(4650, "E24")).toBe(4700); // between 4.3k and 4.7k, log-nearer 4.7k
    expect(nearestE(2.2e-6, "E12")).toBeCloseTo(2.2e-6, 20);
    expect(nearestE(9.6, "E12")).toBe(10); // above 8.2: the next decade's 10 is nearer
    expect(nearestE(1.04e3, "E96")).toBe(1.05e3); // 1.02k vs 1.05k: ln ratios 0.0194 vs 0.0096
  });
  it("steps up and down strictly", () => {
    expect(nextUp(4.7e3, "E24")).toBe(5.1e3);
    expect(nextDown(4.7e3, "E24")).toBe(4.3e3);
    expect(nextUp(8.2, "E12")).toBe(10);
    expect(nextDown(1, "E6")).toBe(0.68);
  });
  it("gives the tolerance band of a series (E24 ±5 %, E96 ±1 % — IEC 60063 usual tolerances)", () => {
    expect(toleranceBand(1000, "E24")).toEqual({ low: 950, high: 1050, tolerance: 0.05 });
    const b = toleranceBand(1000, "E96");
    expect(b.low).toBeCloseTo(990, 9);
    expect(b.high).toBeCloseTo(1010, 9);
  });
  it("lists the values within a range", () => {
    expect(eValuesBetween(100e-12, 1e-9, "E6")).toEqual([100e-12, 150e-12, 220e-12, 330e-12, 470e-12, 680e-12, 1e-9]);
  });
  it("refuses values that are not positive", () => {
    expect(() => nearestE(0, "E12")).toThrow(/positive/);
    expect(() => nearestE(Number.NaN, "E12")).toThrow(/positive/);
  });
});
