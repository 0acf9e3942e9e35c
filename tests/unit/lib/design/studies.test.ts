import { describe, expect, it } from "vitest";
import { isSimError } from "@/lib/sim";
import {
  SWEEPABLE_PARAMETERS, accuracyBudget, axisValues, compensate, compensatePick, compensateScan, worstCaseCorners, defaultScenario, getParameter, map2d, mergeMap, mergeSpread, mergeSweep, nearestE, spread, sweep1d,
  withParameter,
} from "@/lib/design";
import { valveCoilDemo } from "@/lib/design/demos";

describe("parameters and axes", () => {
  it("every sweepable path exists in every template's scenario", () => {
    const s = defaultScenario("sink-npn");
    for (const p of SWEEPABLE_PARAMETERS) expect(Number.isFinite(getParameter(s, p.path))).toBe(true);
  });
  it("withParameter copies and changes one value; unknown paths are named", () => {
    const s = defaultScenario("sink-npn");
    const v = withParameter(s, "load.cable.length", 7);
    expect(v.load.cable.length).toBe(7);
    expect(s.load.cable.length).toBe(2);
    expect(() => withParameter(s, "parts.nothing", 1)).toThrow(/Unknown parameter "parts.nothing"/);
  });
  it("log axes are geometric with both ends included (closed form 10^(i/(n−1)) per decade)", () => {
    const v = axisValues({ path: "x", from: 1e-9, to: 1e-6, points: 4, scale: "log", values: [] });
    [1e-9, 1e-8, 1e-7, 1e-6].forEach((x, i) => expect(v[i] / x).toBeCloseTo(1, 12));
    expect(axisValues({ path: "x", from: 0, to: 1, points: 3, scale: "linear", values: [] })).toEqual([0, 0.5, 1]);
  });
});

describe("studies on the reference sink", () => {
  const s = defaultScenario("sink-npn");

  it("a 1D sweep of the compensation capacitor: one step and one Bode curve per value, and chunks agree with the whole", () => {
    const axis = { path: "parts.compCapacitor", from: 100e-12, to: 10e-9, points: 3, scale: "log" as const, values: [] };
    const whole = sweep1d(s, axis);
    expect(whole.points.length).toBe(3);
    for (const p of whole.points) {
      expect(p.step!.time.length).toBeGreaterThan(10);
      expect(p.loop!.freq.length).toBeGreaterThan(10);
    }
    const tail = sweep1d(s, axis, {}, { start: 2, end: 3 });
    expect(Number.isNaN(tail.phaseMarginDeg[0])).toBe(true);
    expect(tail.phaseMarginDeg[2]).toBe(whole.phaseMarginDeg[2]);
    // the chunks a worker pool computes, merged, are the whole sweep (same engine runs, so equal to the bit)
    const merged = mergeSweep([tail, sweep1d(s, axis, {}, { start: 0, end: 2 })]);
    for (const key of ["phaseMarginDeg", "overshootPct", "settlingTime1pct", "riseTime", "finalCurrent"] as const) {
      expect(Array.from(merged[key])).toEqual(Array.from(whole[key]));
    }
    expect(merged.points.map((p) => p.index)).toEqual([0, 1, 2]);
    // A larger compensation capacitor slows the loop: the 10 nF step settles later than the 1 nF one's rise.
    expect(whole.riseTime[2]).toBeGreaterThan(whole.riseTime[0]);
  });

  it("a 2D map fills its grid row by row and reports progress", () => {
    let last = 0;
    const m = map2d(
      s,
      {
        x: { path: "parts.compCapacitor", from: 1e-9, to: 4.7e-9, points: 2, scale: "log", values: [] },
        y: { path: "load.cable.length", from: 1, to: 10, points: 2, scale: "log", values: [] },
        metric: "phaseMarginDeg",
      },
      { onProgress: (d) => { last = d; } },
    );
    expect(m.values.length).toBe(4);
    for (const v of m.values) expect(v).toBeGreaterThan(0);
    expect(last).toBe(4);
    // two chunks merged give the whole grid
    const settings = { x: { path: "parts.compCapacitor", from: 1e-9, to: 4.7e-9, points: 2, scale: "log" as const, values: [] }, y: { path: "load.cable.length", from: 1, to: 10, points: 2, scale: "log" as const, values: [] }, metric: "phaseMarginDeg" as const };
    const merged = mergeMap([map2d(s, settings, {}, { start: 3, end: 4 }), map2d(s, settings, {}, { start: 0, end: 3 })]);
    expect(Array.from(merged.values)).toEqual(Array.from(m.values));
    expect(merged.failed.size).toBe(0);
  });

  it("cancellation stops a study with SimError 'cancelled'", () => {
    let calls = 0;
    try {
      sweep1d(s, s.studies.sweep, { shouldStop: () => ++calls > 1 });
      expect.unreachable();
    } catch (e) {
      expect(isSimError(e) && e.code === "cancelled").toBe(true);
    }
  });

  it("Spread is reproducible from its seed and independent of how runs are split into chunks", () => {
    const one = spread(s, { runs: 12, seed: 5 });
    const parts = mergeSpread([spread(s, { runs: 12, seed: 5 }, {}, { start: 0, end: 5 }), spread(s, { runs: 12, seed: 5 }, {}, { start: 5, end: 12 })]);
    expect(Array.from(parts.errorPctFs)).toEqual(Array.from(one.errorPctFs));
    expect(one.summary!.errorPctFs.count + one.failures.length).toBe(12);
  });

  it("Compensate picks an E-series capacitor that meets the targets it reports", () => {
    // One load corner and the E6 series keep the search short; the logic is the same as for the full range.
    const one = structuredClone(s);
    one.load.resistanceMin = one.load.resistanceMax = one.load.resistance;
    const r = compensate(one, { targetPhaseMarginDeg: 60, maxOvershootPct: 5, series: "E6", tuneBaseResistor: false });
    expect(r.chosen).not.toBeNull();
    const c = r.chosen!;
    expect(nearestE(c.compCapacitor, "E6")).toBeCloseTo(c.compCapacitor, 20);
    expect(c.minPhaseMarginDeg).toBeGreaterThanOrEqual(60);
    expect(c.worstOvershootPct).toBeLessThanOrEqual(5);
    expect(c.phaseMarginToSpareDeg).toBeCloseTo(c.minPhaseMarginDeg - 60, 12);
    // The lazy one-thread search and the pool's full scan + pick choose the same value.
    const settings = { targetPhaseMarginDeg: 60, maxOvershootPct: 5, series: "E6" as const, tuneBaseResistor: false };
    const full = compensatePick(one, settings, compensateScan(one, settings));
    expect(full.chosen?.compCapacitor).toBe(c.compCapacitor);
  });

  it("Spread stays between the worst-case corners, and the corners inside the analytic worst-case budget", () => {
    // Reference: the checks' hand budget (offset/Vsense, Ib·R/Vsense, 2·tol·(1−k), sense tol, …) bounds the
    // simulated corners; random draws within the tolerances cannot leave the corners of a monotone circuit.
    const m = defaultScenario("sink-nmos");
    const corners = worstCaseCorners(m);
    const budget = accuracyBudget(m).worstCase * 100;
    expect(corners.high).toBeGreaterThan(0);
    expect(corners.low).toBeLessThan(0);
    expect(corners.high).toBeLessThanOrEqual(budget);
    expect(-corners.low).toBeLessThanOrEqual(budget);
    const sp = spread(m, { runs: 40, seed: 11 });
    expect(sp.summary!.errorPctFs.max).toBeLessThanOrEqual(corners.high + 1e-9);
    expect(sp.summary!.errorPctFs.min).toBeGreaterThanOrEqual(corners.low - 1e-9);
  });

  // The NPN template with a 10 Ω sense resistor: its clamp holds the full step, while the 5 mH coil rings against the
  // ~0.5 nF at its terminals at every small change (tests/unit/lib/design/explain.test.ts). A series R–C across the
  // load near √(L/C) ≈ 3 kΩ damps a parallel tank once its capacitor is comparable with the tank's (docs/references.md
  // §4.4, common practice): the sweep shows both overshoots, the map's judged metric the worse of them.
  it("Sweep and Map carry the small-signal overshoot the card judges: a load snubber's capacitor tames the ring the full step hides", () => {
    const ring = defaultScenario("sink-npn");
    ring.parts.senseResistor = 10;
    ring.networks.loadSnubber = { resistance: 2200, capacitance: 100e-12 };
    const axis = { path: "networks.loadSnubber.capacitance", from: 100e-12, to: 2.2e-9, points: 3, scale: "log" as const, values: [] };
    const sw = sweep1d(ring, axis);
    expect(sw.failures).toEqual([]);
    for (let i = 0; i < 3; i++) expect(sw.overshootPct[i]).toBeLessThan(5);
    expect(sw.smallOvershootPct[0]).toBeGreaterThan(15);
    expect(sw.smallOvershootPct[2]).toBeLessThan(5);
    expect(sw.smallOvershootPct[1]).toBeLessThan(sw.smallOvershootPct[0]);
    const map = map2d(ring, { x: axis, y: { path: "parts.senseResistor", from: 10, to: 10, points: 1, scale: "linear", values: [] }, metric: "judgedOvershootPct" });
    for (let i = 0; i < 3; i++) expect(map.values[i]).toBeCloseTo(Math.max(sw.overshootPct[i], sw.smallOvershootPct[i]), 6);
  });

  it("a point whose linearised step grows has no overshoot figure, and says why", () => {
    // the valve demo with a 10 Ω sense resistor is unstable (docs/references.md §4.3; tests/unit/lib/design/metrics.test.ts)
    const v = valveCoilDemo();
    const axis = { path: "parts.senseResistor", from: 10, to: 10, points: 1, scale: "linear" as const, values: [] };
    const sw = sweep1d(v, axis);
    expect(Number.isNaN(sw.smallOvershootPct[0])).toBe(true);
    expect(sw.failures.map((f) => f.message)).toContain("the small-signal step grows: the closed loop is unstable");
    const map = map2d(v, { x: axis, y: axis, metric: "judgedOvershootPct" });
    expect(Number.isNaN(map.values[0])).toBe(true);
    expect(map.failures).toEqual([{ index: 0, message: "the small-signal step grows: the closed loop is unstable" }]);
  });
});
