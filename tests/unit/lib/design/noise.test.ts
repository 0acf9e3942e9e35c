import { describe, expect, it } from "vitest";
import { simulate, type AcResult, type OpResult } from "@/lib/sim";
import { valveCoilDemo } from "@/lib/design/demos";
import { compileNetlist } from "@/lib/design/run";
import { NAMES } from "@/lib/design/compile";
import { bandPower, noiseCheck, noiseSettings, runNoiseStudy, type NoiseStudyResult } from "@/lib/design/noise";
import type { Scenario } from "@/lib/design/schema";
import { compensate, mergeSpread, spread, sweep1d } from "@/lib/design/studies";

/**
 * The Noise study (lib/design/noise.ts). The sense resistor's thermal noise (Johnson 1928 / Nyquist 1928,
 * docs/references.md §8.1) is a current √(4kT/Rs) in parallel with Rs. Its load-current noise is that density times
 * the closed-loop gain factor |Iload/Iinjected|(f), the transfer from a current injected across Rs to the load current
 * (measured here by a separate AC run with a 1 A AC source across Rs). At low frequency the loop holds the sense
 * voltage, so the injected current flows through the pass transistor's emitter: the factor is α = IC/IE.
 */
const K = 1.380649e-23; // J/K, exact (2019 SI)

function withSenseOnly(s: Scenario): NoiseStudyResult {
  const names = compileNetlist(s, "closedloop").elements.map((e) => e.name).filter((n) => n !== NAMES.sense);
  return runNoiseStudy(s, {}, { fMin: 0.1, bandLow: 0.1, bandHigh: 1e5 }, names);
}

describe("Noise study on a sink (valve-coil demo, sink-npn)", () => {
  it("the sense resistor alone: √(4kT/Rs)·|Iload/Iinjected| at every frequency, √(4kT/Rs)·α at low frequency", () => {
    const s = valveCoilDemo();
    const Rs = s.parts.senseResistor;
    const T = s.thermal.ambient + 273.15;
    const r = withSenseOnly(s);
    expect(Object.keys(r.contributions)).toEqual([NAMES.sense]);
    // the closed-loop gain factor from a current across Rs, on the same frequencies (a separate AC run)
    const set = noiseSettings(s, { fMin: 0.1 });
    const n = compileNetlist(s, "closedloop", { fStart: set.fMin, fStop: set.fMax, pointsPerDecade: 20 });
    const sense = n.elements.find((e) => e.name === NAMES.sense);
    if (!sense || sense.kind !== "resistor") throw new Error("no sense resistor");
    n.elements = [
      ...n.elements.map((e) => (e.kind === "vsource" ? { ...e, ac: 0 } : e)),
      { kind: "isource", name: "across-sense", nodes: [sense.nodes[1], sense.nodes[0]], dc: 0, ac: 1 },
    ];
    const ac = simulate(n) as AcResult;
    expect(Array.from(ac.freq)).toEqual(Array.from(r.freq));
    const i = ac.currents[NAMES.ammeter];
    for (let k = 0; k < r.freq.length; k += 5) {
      const want = Math.sqrt((4 * K * T) / Rs) * Math.hypot(i.re[k], i.im[k]);
      expect(Math.abs(r.density[k] - want) / want).toBeLessThan(1e-6);
    }
    // low frequency: α of the pass transistor from the operating point (IC/IE), Johnson–Nyquist current √(4kT/Rs)
    const op = simulate({ ...n, analysis: { kind: "op" } }) as OpResult;
    const q = op.devices[NAMES.pass];
    if (q.kind !== "bjt") throw new Error("pass is not a BJT");
    // (the large-signal α = IC/IE; the small-signal one differs by the Early effect as the collector moves with the
    // load current, 0.14 % here, hence the 0.5 % tolerance)
    const alpha = q.ic / q.ie;
    expect(Math.abs(r.density[0] - Math.sqrt((4 * K * T) / Rs) * alpha) / r.density[0]).toBeLessThan(5e-3);
  });

  it("contributors are ranked by their share of the band's noise power, and the shares add up to 1", () => {
    const r = runNoiseStudy(valveCoilDemo());
    expect(r.ranked.length).toBeGreaterThan(3);
    for (let j = 1; j < r.ranked.length; j++) expect(r.ranked[j].share).toBeLessThanOrEqual(r.ranked[j - 1].share);
    // uncorrelated sources: the powers add (the RMS is the root of the sum of squares)
    // (each density is integrated as power laws between the points, so the parts add up to the whole only to the
    // interpolation's accuracy, ~1e-6 at 20 points per decade)
    const sum = r.ranked.reduce((a, c) => a + c.share, 0);
    expect(Math.abs(sum - 1)).toBeLessThan(1e-4);
    expect(Math.abs(Math.hypot(...r.ranked.map((c) => c.rms)) / r.rms - 1)).toBeLessThan(1e-4);
  });

  it("the check passes under 80 % of the target, warns up to it, fails above it, and is absent without a target", () => {
    const s = valveCoilDemo();
    const r = runNoiseStudy(s);
    expect(noiseCheck(r)).toBeNull();
    const at = (target: number) => noiseCheck({ ...r, target })?.verdict;
    expect(at(2 * r.rms)).toBe("pass");
    expect(at(1.1 * r.rms)).toBe("warn");
    expect(at(0.5 * r.rms)).toBe("fail");
    const withTarget: Scenario = { ...s, tolerances: { ...s.tolerances, noiseTarget: 1e-3 } };
    expect(noiseCheck(runNoiseStudy(withTarget))?.limit).toBe(1e-3);
  });

  it("a larger sense resistor with the divider scaled to keep the current lowers the load-current noise", () => {
    const s = valveCoilDemo();
    const a = runNoiseStudy(s).rms;
    const b = runNoiseStudy({ ...s, parts: { ...s.parts, senseResistor: 2 * s.parts.senseResistor, dividerBottom: 2 * s.parts.dividerBottom } }).rms;
    expect(b).toBeLessThan(a);
  });

  it("Sweep's noise column follows the sense resistor; Compensate treats a noise target as a constraint", () => {
    const s = valveCoilDemo();
    // each point's column is the Noise study's figure for the scenario with that value (invariant of the sweep)
    const sw = sweep1d(s, { path: "parts.senseResistor", from: s.parts.senseResistor, to: 2 * s.parts.senseResistor, points: 2, scale: "linear", values: [] });
    expect(sw.noiseRms[0]).toBe(runNoiseStudy(s).rms);
    expect(sw.noiseRms[1]).toBe(runNoiseStudy({ ...s, parts: { ...s.parts, senseResistor: 2 * s.parts.senseResistor } }).rms);
    expect(sw.noiseRms[1]).not.toBe(sw.noiseRms[0]);
    const free = compensate(s, s.studies.compensate);
    expect(free.chosen).not.toBeNull();
    // a target no design can meet (1 pA RMS over 0.1 Hz–100 kHz): nothing is picked, and the message says why
    const strict = compensate({ ...s, tolerances: { ...s.tolerances, noiseTarget: 1e-12 } }, s.studies.compensate);
    expect(strict.chosen).toBeNull();
    expect(strict.message).toMatch(/noise target/);
  });

  it("Spread fills a noise column per run when a noise target is set (and only then); chunks merge", () => {
    const s = valveCoilDemo();
    expect(spread(s, { runs: 2, seed: 7 }).noiseRms).toBeUndefined();
    const t: Scenario = { ...s, tolerances: { ...s.tolerances, noiseTarget: 1e-3 } };
    const a = spread(t, { runs: 3, seed: 7 }, {}, { start: 0, end: 2 });
    const b = spread(t, { runs: 3, seed: 7 }, {}, { start: 2, end: 3 });
    const m = mergeSpread([a, b]);
    expect(Array.from(m.noiseRms!).every((x) => x > 0)).toBe(true);
    // runs draw different parts, so their noise differs
    expect(new Set(Array.from(m.noiseRms!)).size).toBe(3);
  });

  it("invalid bands name the field", () => {
    const s = valveCoilDemo();
    expect(() => noiseSettings(s, { bandLow: 10, bandHigh: 1 })).toThrow(/studies\.noise\.bandHigh/);
    expect(() => noiseSettings(s, { fMin: 1, bandLow: 0.1 })).toThrow(/studies\.noise\.bandLow/);
  });
});

describe("bandPower (closed forms of power-law integrals)", () => {
  const freq = Float64Array.from({ length: 61 }, (_, k) => 10 ** (k / 10)); // 1 Hz … 1 MHz, 10 per decade
  it("1/f: ∫ a/f df = a·ln(f1/f0), also over a band between the points", () => {
    const psd = freq.map((f) => 1e-12 / f);
    expect(bandPower(freq, psd, 1, 1e6) / (1e-12 * Math.log(1e6))).toBeCloseTo(1, 12);
    expect(bandPower(freq, psd, 3, 7000) / (1e-12 * Math.log(7000 / 3))).toBeCloseTo(1, 12);
  });
  it("white: S·(f1 − f0)", () => {
    const psd = freq.map(() => 4e-18);
    expect(bandPower(freq, psd, 10, 2.5e5) / (4e-18 * (2.5e5 - 10))).toBeCloseTo(1, 12);
  });
});
