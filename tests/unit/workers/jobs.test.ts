import { describe, expect, it } from "vitest";
import { collectBuffers, liveRun } from "@/workers/jobs";
import { valveCoilDemo } from "@/lib/design/demos";

/** The worker's jobs run in plain Node: the shapes the plots rely on, and the transfer list. */
describe("worker jobs", () => {
  it("liveRun gives columns aligned with their axis and every buffer listed once for transfer", () => {
    const r = liveRun(valveCoilDemo());
    expect(r.step).not.toBeNull();
    const st = r.step!;
    for (const col of [st.iLoad, st.vCommand, st.vOpampOut, st.vPass]) {
      expect(col).toBeInstanceOf(Float64Array);
      expect(col.length).toBe(st.time.length);
    }
    // Time strictly increases (uPlot needs a sorted x column).
    for (let i = 1; i < st.time.length; i++) expect(st.time[i]!).toBeGreaterThan(st.time[i - 1]!);
    const loop = r.loop!;
    expect(loop.magDb.length).toBe(loop.freq.length);
    expect(loop.phaseDeg.length).toBe(loop.freq.length);
    const buffers = collectBuffers(r);
    expect(new Set(buffers).size).toBe(buffers.length);
    expect(buffers).toContain(st.time.buffer);
    expect(buffers).toContain(loop.freq.buffer);
    // A check row carries its formula (the Verdict table shows it).
    expect(r.checks.every((c) => c.formula.length > 0)).toBe(true);
  });

  it("fails the run with the field named when the scenario is invalid", () => {
    const s = valveCoilDemo();
    expect(() => liveRun({ ...s, parts: { ...s.parts, senseResistor: -1 } })).toThrow(/senseResistor/);
  });

  it("collectBuffers finds typed arrays in nested objects and arrays, once per shared buffer", () => {
    const shared = new Float64Array(8);
    const a = shared.subarray(0, 4), b = shared.subarray(4);
    const other = new Float64Array(2);
    expect(collectBuffers({ a, list: [b, { other }], n: 1, s: "x" })).toEqual([shared.buffer, other.buffer]);
  });
});

import { expectTypeOf } from "vitest";
import type { Remote } from "comlink";
import type { SimWorkerApi } from "@/workers/sim.worker";
import type { LiveResult, StepView } from "@/lib/workbench/types";

describe("worker API types (derived from the worker module)", () => {
  it("the client sees the live results as the plots expect them", () => {
    type Api = Remote<SimWorkerApi>;
    expectTypeOf<Awaited<ReturnType<Api["live"]>>>().toEqualTypeOf<LiveResult>();
    expectTypeOf<Awaited<ReturnType<Api["liveStep"]>>>().toEqualTypeOf<StepView>();
    expectTypeOf<Awaited<ReturnType<Api["liveRest"]>>>().toEqualTypeOf<Omit<LiveResult, "step">>();
  });
});
