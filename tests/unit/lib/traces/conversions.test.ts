import { describe, expect, it } from "vitest";
import { CONVERSIONS, conversionSettings, needsOf } from "@/lib/traces/conversions";
import { channelSettings } from "@/lib/traces/units";

// Reference: Ohm's law, I = V/R, and SI prefixes (m = 10⁻³): the settings of a choice, applied the way the server
// applies them (channelSettings), turn a file's number into the current it stands for.
describe("the channel conversions the upload form and the correction share", () => {
  const amps = (kind: Parameters<typeof conversionSettings>[0], text: string, reading: number) => {
    const { settings, error } = conversionSettings(kind, text);
    expect(error).toBeNull();
    const c = channelSettings(settings.sourceUnit ?? "V", settings.scale ?? 1, settings.unit);
    return { unit: c.unit, value: reading * c.scale };
  };

  it("50 mV across 0.1 Ω is 0.5 A; 0.05 V across 0.1 Ω is 0.5 A", () => {
    const m = amps("msense", "0.1", 50);
    expect(m.unit).toBe("A");
    expect(m.value).toBeCloseTo(0.5, 12);
    const v = amps("sense", "0.1", 0.05);
    expect(v.unit).toBe("A");
    expect(v.value).toBeCloseTo(0.5, 12);
  });

  it("a reading in milliamperes is a thousandth of an ampere; a probe factor of 10 A/V makes 0.2 V read 2 A", () => {
    expect(amps("mA", "", 250).value).toBeCloseTo(0.25, 12);
    const { settings } = conversionSettings("factor", "10", "A");
    expect(settings).toEqual({ scale: 10, unit: "A" });
    expect(0.2 * channelSettings("V", settings.scale, settings.unit).scale).toBeCloseTo(2, 12);
  });

  it("a probe factor without a unit after keeps the source unit's; 'as the file says' sets nothing", () => {
    expect(conversionSettings("factor", "-2").settings).toEqual({ scale: -2 });
    expect(conversionSettings("keep", "whatever")).toEqual({ settings: {}, error: null });
  });

  it("a missing, zero or negative resistance and a zero factor are refused in plain words", () => {
    for (const t of ["", "0", "-1", "abc"]) expect(conversionSettings("sense", t).error).toMatch(/^Sense resistor: enter a resistance above zero/);
    for (const t of ["", "0", "x"]) expect(conversionSettings("factor", t).error).toMatch(/^Probe factor: enter a non-zero number/);
  });

  it("every choice that needs a number says which, and refuses a blank one", () => {
    for (const c of CONVERSIONS) {
      expect(needsOf(c.value)).toBe(c.needs);
      expect(conversionSettings(c.value, "").error === null).toBe(c.needs === null);
    }
  });
});
