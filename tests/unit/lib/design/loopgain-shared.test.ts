import { describe, expect, it } from "vitest";
import { NAMES } from "@/lib/design/compile";
import { simulate, type AcResult } from "@/lib/sim";
import { compileNetlistJson, defaultScenario, fullScaleCurrent, runOperatingPoint, spread, spreadScenario, tianLoopGain, type Scenario, type TemplateId } from "@/lib/design";
import { runLoopGain, runOperatingPointAndLoopGain } from "@/lib/design/run";

/**
 * The loop gain now takes both Tian injections (Tian et al. 2001, docs/references.md §4.2) from one compiled circuit with a
 * shared operating point and factorisation. Checked against the plain route: two separate AC runs of the
 * "loopgain-v" and "loopgain-i" netlists combined with T = −(v1 + i2)/(1 + v1 + i2), which must agree to rounding
 * (the small-signal matrix is the same; only the sources differ). The OP of the probe netlist must match the OP of
 * the plain netlist to the Newton tolerance (the probes carry 0 V / 0 A at DC).
 */
function separateRuns(s: Scenario, ppd: number, loop: "current" | "local"): { re: Float64Array; im: Float64Array } {
  const ac = (p: "loopgain-v" | "loopgain-i") => {
    const r = simulate(compileNetlistJson(s, p, { pointsPerDecade: ppd, loop }));
    if (r.kind !== "ac") throw new Error("expected ac");
    return r as AcResult;
  };
  const a = ac("loopgain-v"), b = ac("loopgain-i");
  // the driven side of the break: the base/gate resistor's end for the current loop, the op-amp's output node else
  const v1 = a.nodes[loop === "current" && s.template !== "howland" ? "oa_r" : "oa"];
  const n = a.freq.length;
  const re = new Float64Array(n), im = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    const [r, i] = tianLoopGain(v1.re[k], v1.im[k], -b.currents[NAMES.probeV].re[k], -b.currents[NAMES.probeV].im[k]);
    re[k] = r; im[k] = i;
  }
  return { re, im };
}

describe("loop gain from one operating point (shared Tian injections)", () => {
  for (const t of ["sink-npn", "sink-darlington", "sink-nmos", "source-highside", "howland"] as TemplateId[]) {
    it(`${t}: each loop equals two separate AC runs to 1e-12 of |T|`, () => {
      const s = defaultScenario(t);
      const lg = runLoopGain(s, {}, { pointsPerDecade: 10 });
      const loops = [["current", lg.loops.current], ["local", lg.loops.local]] as const;
      for (const [name, loop] of loops) {
        if (loop === null) {
          expect(t).toBe("howland"); // the pump's loops all pass through the output pin: one break
          continue;
        }
        const ref = separateRuns(s, 10, name);
        expect(loop.re.length).toBe(ref.re.length);
        for (let k = 0; k < ref.re.length; k++) {
          const m = Math.hypot(ref.re[k], ref.im[k]);
          expect(Math.abs(loop.re[k] - ref.re[k])).toBeLessThanOrEqual(1e-12 * m);
          expect(Math.abs(loop.im[k] - ref.im[k])).toBeLessThanOrEqual(1e-12 * m);
        }
      }
      // the headline figures are the current loop's
      expect(lg.phaseMarginDeg).toBe(lg.loops.current.phaseMarginDeg);
    });
  }

  it("the combined run's operating point matches runOperatingPoint (sink-npn, Spread draws)", () => {
    const base = defaultScenario("sink-npn");
    for (let i = 0; i < 5; i++) {
      const { scenario } = spreadScenario(base, 3, i);
      const both = runOperatingPointAndLoopGain(scenario, {}, { pointsPerDecade: 10 });
      const plain = runOperatingPoint(scenario).summary;
      // Newton stops within reltol 1e-3 of the last update; the converged iterates agree far closer in practice
      expect(Math.abs(both.summary.iLoad - plain.iLoad)).toBeLessThanOrEqual(1e-6 * Math.abs(plain.iLoad));
      expect(Math.abs(both.summary.vOpampOut - plain.vOpampOut)).toBeLessThanOrEqual(1e-6 * Math.abs(plain.vOpampOut));
      expect(both.summary.passRegion).toBe(plain.passRegion);
      expect(both.loop.phaseMarginDeg).toBe(runLoopGain(scenario, {}, { pointsPerDecade: 10 }).phaseMarginDeg);
    }
  });

  it("Spread's current error equals the one computed from the plain operating point", () => {
    const s = defaultScenario("sink-npn");
    const r = spread(s, { runs: 4, seed: 9 });
    const fs = fullScaleCurrent(s);
    const nominal = fs * (s.stimulus.commandHigh / s.stimulus.commandFullScale);
    for (let i = 0; i < 4; i++) {
      const plain = runOperatingPoint(spreadScenario(s, 9, i).scenario).summary;
      const want = ((Math.abs(plain.iLoad) - Math.abs(nominal)) / fs) * 100;
      // same quantity; the two OPs differ only by where Newton stopped (≤ 1e-6 of the load current, see above)
      expect(Math.abs(r.errorPctFs[i] - want)).toBeLessThanOrEqual(1e-4 * Math.abs(nominal / fs) * 100);
    }
  });
});
