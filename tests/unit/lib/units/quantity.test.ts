import { describe, expect, it } from "vitest";
import { formatQuantity } from "@/lib/units/quantity";

// References: SI prefixes k = 10³, m = 10⁻³, µ = 10⁻⁶ (BIPM, The International System of Units, 9th ed., 2019,
// Table 7); three significant digits and whole degrees are the house style (DESIGN-LANGUAGE, common practice).
describe("formatQuantity (one form for every table)", () => {
  it("writes SI quantities in engineering notation with three significant digits", () => {
    expect(formatQuantity(2200, "Ω")).toBe("2.20 kΩ");
    expect(formatQuantity(0.0015, "A")).toBe("1.50 mA");
    expect(formatQuantity(4.7e-6, "s")).toBe("4.70 µs");
    expect(formatQuantity(1.23456, "V", 4)).toBe("1.235 V");
  });
  it("writes a bare ratio without a prefix, percentages with two decimals, temperatures in whole degrees", () => {
    expect(formatQuantity(0.403, "")).toBe("0.403");
    expect(formatQuantity(1.5, "%")).toBe("1.50 %");
    expect(formatQuantity(0.25, "% FS")).toBe("0.25 % FS");
    expect(formatQuantity(3.1, "% of step")).toBe("3.10 %");
    expect(formatQuantity(84.6, "°C")).toBe("85 °C");
  });
  it("shows a dash when there is no number", () => {
    expect(formatQuantity(null, "A")).toBe("—");
    expect(formatQuantity(undefined, "s")).toBe("—");
    expect(formatQuantity(Number.NaN, "V")).toBe("—");
  });
});
