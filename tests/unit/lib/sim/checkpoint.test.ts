/**
 * Budget and cancellation inside every loop (lib/sim/checkpoint.ts): a caller's shouldStop that turns true after N
 * polls stops the run at that poll, part way through, with SimError "cancelled" — for the AC frequency loop, the DC
 * sweep, the transient's steps, the Newton iterations and the LU's ordering and factorisation. No timing here: the
 * wall-clock overrun of a large AC run under a budget is measured by `npm run bench -- engine` (case ac-budget).
 */
import { describe, expect, it } from "vitest";
import { isSimError, simulate, type Netlist } from "@/lib/sim";
import { StaticLU } from "@/lib/sim/sparse";

/** shouldStop that answers true from its n-th call on, counting its calls */
function stopAfter(n: number): { shouldStop: () => boolean; calls: () => number } {
  let k = 0;
  return { shouldStop: () => ++k >= n, calls: () => k };
}

function codeOf(fn: () => unknown): string {
  try {
    fn();
  } catch (e) {
    if (isSimError(e)) return e.code;
    throw e;
  }
  return "finished";
}

const rc: Netlist["elements"] = [
  { kind: "vsource", name: "V1", nodes: ["in", "gnd"], dc: 1, ac: 1 },
  { kind: "resistor", name: "R1", nodes: ["in", "out"], value: 1e3 },
  { kind: "capacitor", name: "C1", nodes: ["out", "gnd"], value: 1e-9 },
];

describe("checkpoint: shouldStop stops every analysis loop part way (SimError \"cancelled\")", () => {
  it("AC: polled every 8th frequency; stops at the 7th poll (frequency 49 of 201)", () => {
    const stop = stopAfter(7);
    const progress: number[] = [];
    const code = codeOf(() => simulate(
      { elements: rc, analysis: { kind: "ac", fStart: 1, fStop: 1e10, pointsPerDecade: 20 } }, // 201 frequencies
      { shouldStop: stop.shouldStop, onProgress: (f) => progress.push(f) },
    ));
    expect(code).toBe("cancelled");
    expect(stop.calls()).toBe(7); // frequencies 1, 9, …, 49 (the linear OP converges before its first poll)
    expect(Math.max(...progress)).toBeLessThan(0.25); // progress 31/201 was the last one reported
  });

  it("DC sweep: polled once per point; stops at the 10th of 1000 points", () => {
    const stop = stopAfter(10);
    const code = codeOf(() => simulate(
      { elements: rc, analysis: { kind: "dcsweep", source: "V1", from: 0, to: 1, points: 1000 } },
      { shouldStop: stop.shouldStop },
    ));
    expect(code).toBe("cancelled");
    expect(stop.calls()).toBe(10);
  });

  it("transient: polled every 8th step; stops at the 20th poll (step 153) of a 1000-step run", () => {
    const stop = stopAfter(20);
    const progress: number[] = [];
    const code = codeOf(() => simulate(
      { elements: rc, analysis: { kind: "tran", tStop: 1e-3, tStep: 1e-6 } },
      { shouldStop: stop.shouldStop, onProgress: (f) => progress.push(f) },
    ));
    expect(code).toBe("cancelled");
    expect(stop.calls()).toBe(20);
    expect(Math.max(...progress)).toBeLessThan(0.2); // stopped in the first fifth of the run
  });

  it("Newton: polled every 32 iterations of the analysis, also across continuation's many short Newton runs", () => {
    // three diodes from 100 V through 10 Ω with Newton capped at 4 iterations per solve: only the continuation
    // stages (damped Newton, gmin and source stepping) reach the answer, after well over 64 iterations in all
    const stop = stopAfter(2);
    const code = codeOf(() => simulate(
      {
        elements: [
          { kind: "vsource", name: "V1", nodes: ["a", "gnd"], dc: 100 },
          { kind: "resistor", name: "R1", nodes: ["a", "d1"], value: 10 },
          { kind: "diode", name: "D1", nodes: ["d1", "d2"] },
          { kind: "diode", name: "D2", nodes: ["d2", "d3"] },
          { kind: "diode", name: "D3", nodes: ["d3", "gnd"] },
        ],
        analysis: { kind: "op" },
        options: { maxNewton: 4 },
      },
      { shouldStop: stop.shouldStop },
    ));
    expect(code).toBe("cancelled");
    expect(stop.calls()).toBe(2);
  });

  it("LU: a long ordering and a long factorisation poll every 64 columns and stop where the poll throws", () => {
    // a 400-unknown tridiagonal matrix (a resistor ladder's), stored with the circuit's stride n + 1
    const n = 400, stride = n + 1;
    const structure = new Uint8Array(stride * stride);
    const a = new Float64Array(stride * stride);
    for (let i = 0; i < n; i++) {
      structure[i * stride + i] = 1; a[i * stride + i] = 2.5;
      if (i > 0) { structure[i * stride + i - 1] = 1; a[i * stride + i - 1] = -1; }
      if (i + 1 < n) { structure[i * stride + i + 1] = 1; a[i * stride + i + 1] = -1; }
    }
    const lu = new StaticLU(n, stride, structure);
    let polls = 0;
    lu.poll = () => { if (++polls === 3) throw new Error("stop"); };
    expect(() => lu.analyse(a)).toThrow("stop");
    expect(polls).toBe(3); // columns 63, 127 and 191 of the ordering: stopped part way
    expect(lu.analysed).toBe(false);
    lu.poll = null;
    expect(lu.analyse(a)).toBe(-1);
    polls = 0;
    lu.poll = () => { if (++polls === 2) throw new Error("stop"); };
    expect(() => lu.factor(a.slice())).toThrow("stop");
    expect(polls).toBe(2);
  });
});
