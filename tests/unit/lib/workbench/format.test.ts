import { describe, expect, it } from "vitest";
import { editText } from "@/lib/workbench/format";
import { parseEng } from "@/lib/units/eng";

describe("editText (what a value field shows)", () => {
  it("writes SI prefixes the way people type them (SI brochure prefixes; µ as typed by the formatter)", () => {
    expect(editText(2.2e-9)).toBe("2.2n");
    expect(editText(47_000)).toBe("47k");
    expect(editText(0.1)).toBe("100m");
    expect(editText(5620)).toBe("5.62k");
    expect(editText(1e6)).toBe("1M");
    expect(editText(4.7e-6)).toBe("4.7µ");
    expect(editText(-15)).toBe("-15");
    expect(editText(0)).toBe("0");
  });

  it("reads back through parseEng to the value at four significant digits", () => {
    for (const v of [1e-12, 3.3e-9, 0.0175, 1, 18, 220, 5.62e3, 47e3, 2.2e6, 123.456, -0.5]) {
      const r = parseEng(editText(v));
      expect(r.ok).toBe(true);
      if (r.ok) expect(r.value).toBeCloseTo(Number(v.toPrecision(4)), 12 - Math.floor(Math.log10(Math.abs(v))));
    }
  });
});

import { editTextFor } from "@/lib/workbench/format";

describe("editTextFor", () => {
  it("writes percentages, degrees and plain numbers without SI prefixes", () => {
    expect(editTextFor(0.1, "%")).toBe("0.1");
    expect(editTextFor(45, "°")).toBe("45");
    expect(editTextFor(2e5, "")).toBe("200000");
    expect(editTextFor(2.2e-9, "F")).toBe("2.2n");
  });
});
