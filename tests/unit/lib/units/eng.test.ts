import { describe, expect, it } from "vitest";
import { formatEng, parseEng } from "@/lib/units/eng";

// Reference: SI prefixes as defined by the BIPM SI Brochure (9th ed., 2019), Table 7.
describe("parseEng", () => {
  const cases: [string, number][] = [
    ["2.2k", 2200],
    ["3.3n", 3.3e-9],
    ["150m", 0.15],
    ["4.7µ", 4.7e-6],
    ["4.7u", 4.7e-6],
    ["1M", 1e6],
    ["10meg", 1e7],
    ["1e-3", 1e-3],
    ["  47 ", 47],
    ["-5", -5],
    [".5p", 0.5e-12],
  ];
  it.each(cases)("reads %s", (text, expected) => {
    const r = parseEng(text);
    expect(r.ok).toBe(true);
    if (r.ok) expect(r.value).toBeCloseTo(expected, 15 - Math.floor(Math.log10(Math.abs(expected))));
  });

  it("accepts the field's unit after the prefix", () => {
    expect(parseEng("2.2kΩ", "Ω")).toEqual({ ok: true, value: 2200 });
    expect(parseEng("100nF", "F")).toMatchObject({ ok: true });
    expect(parseEng("5 V", "V")).toEqual({ ok: true, value: 5 });
  });

  it("explains what is wrong instead of guessing", () => {
    const r = parseEng("abc");
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.error).toContain("is not a number");
    expect(parseEng("")).toEqual({ ok: false, error: "Enter a value" });
    const wrongUnit = parseEng("3.3nH", "F");
    expect(wrongUnit.ok).toBe(false);
  });
});

describe("formatEng", () => {
  it("uses three significant digits and SI prefixes", () => {
    expect(formatEng(2200, "Ω")).toBe("2.20 kΩ");
    expect(formatEng(3.3e-9, "F")).toBe("3.30 nF");
    expect(formatEng(0.75, "A")).toBe("750 mA");
    expect(formatEng(-0.0123, "V")).toBe("−12.3 mV");
    expect(formatEng(0, "W")).toBe("0 W");
  });
  it("carries a rounded 1000 to the next prefix", () => {
    expect(formatEng(999.96, "Hz")).toBe("1.00 kHz");
  });
});
