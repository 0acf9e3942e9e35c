import { describe, expect, it } from "vitest";
import { parseEng } from "@/lib/units/eng";
import { formatEngInput, logSliderPosition, logSliderValue, parseField } from "@/lib/units/field";

// Reference: SI prefixes, BIPM SI Brochure (9th ed., 2019), Table 7.
describe("part-value fields", () => {
  it("accepts values inside the range and refuses values outside it, saying the limit (never clamps)", () => {
    expect(parseField("2.2k", { unit: "Ω", min: 1, max: 1e6 })).toEqual({ ok: true, value: 2200 });
    const low = parseField("0.5", { unit: "Ω", min: 1, max: 1e6 });
    expect(low).toEqual({ ok: false, error: "500 mΩ is below the smallest allowed value, 1.00 Ω" });
    const high = parseField("2M", { unit: "Ω", min: 1, max: 1e6 });
    expect(high.ok).toBe(false);
    if (!high.ok) expect(high.error).toContain("above the largest allowed value, 1.00 MΩ");
    expect(parseField("0", { unit: "F", min: 1e-12, max: 1e-6, allowZero: true })).toEqual({ ok: true, value: 0 });
    expect(parseField("abc", { unit: "F" }).ok).toBe(false);
  });
  it("writes compact input text that parses back to the same value", () => {
    const cases: [number, string][] = [[2200, "2.2k"], [3.3e-9, "3.3n"], [1e6, "1M"], [0.15, "150m"], [4.7e-6, "4.7µ"], [47, "47"], [-5, "-5"], [0, "0"]];
    for (const [v, text] of cases) {
      expect(formatEngInput(v)).toBe(text);
      const r = parseEng(text);
      expect(r.ok && Math.abs(r.value - v) <= Math.abs(v) * 1e-12).toBe(true);
    }
  });
  it("maps log sliders geometrically: the middle of 10 Ω…100 kΩ is 1 kΩ (√(10·10⁵))", () => {
    expect(logSliderValue(0.5, 10, 1e5)).toBeCloseTo(1000, 9);
    expect(logSliderValue(0, 10, 1e6)).toBeCloseTo(10, 12);
    expect(logSliderValue(1, 10, 1e6)).toBeCloseTo(1e6, 6);
    expect(logSliderPosition(1000, 10, 1e5)).toBeCloseTo(0.5, 12);
    expect(logSliderPosition(1e9, 10, 1e6)).toBe(1);
    expect(() => logSliderValue(0.5, 0, 1)).toThrow(/0 < min < max/);
  });
});
