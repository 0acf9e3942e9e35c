import { describe, expect, it } from "vitest";
import { MAP_STOPS, OKABE_ITO, ramp } from "@/components/plots/palette";

describe("map and trace colours come from Quell's palette (shared/DESIGN-LANGUAGE.md)", () => {
  const rgb = (hex: string) => `rgb(${parseInt(hex.slice(1, 3), 16)},${parseInt(hex.slice(3, 5), 16)},${parseInt(hex.slice(5, 7), 16)})`;
  it("the map scale runs paper → light teal → teal → signal teal → deep teal, hitting each stop", () => {
    expect(MAP_STOPS).toEqual(["#F7F5F0", "#CFE8E4", "#5FB3A8", "#0F766E", "#0B3B3A"]);
    MAP_STOPS.forEach((hex, i) => expect(ramp(i / (MAP_STOPS.length - 1))).toBe(rgb(hex)));
  });
  it("clamps outside [0, 1] and maps a non-number to the low end", () => {
    expect(ramp(-1)).toBe(rgb("#F7F5F0"));
    expect(ramp(2)).toBe(rgb("#0B3B3A"));
    expect(ramp(Number.NaN)).toBe(rgb("#F7F5F0"));
  });
  it("traces take the Okabe–Ito palette (Okabe & Ito, 2008)", () => {
    expect(OKABE_ITO).toEqual(["#0072B2", "#D55E00", "#009E73", "#CC79A7", "#E69F00", "#56B4E9", "#F0E442", "#000000"]);
  });
});
