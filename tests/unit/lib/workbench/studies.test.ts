import { expose } from "comlink";
import { afterEach, describe, expect, it } from "vitest";
import { createWorkbenchStore } from "@/lib/workbench/store";
import { WorkerPool } from "@/lib/workbench/pool";
import { StudyRunner } from "@/lib/workbench/studies";
import { STUDY_KINDS, type LiveResult, type StudyChunks } from "@/lib/workbench/types";
import type { Scenario, SweepAxis } from "@/lib/design/schema";
import type { SimWorkerApi } from "@/workers/sim.worker";
import { map2d, sweep1d } from "@/workers/jobs";
import { valveCoilDemo } from "@/lib/design/demos";

/**
 * The study runner against workers that run the real design-layer study functions (over comlink on a
 * MessageChannel, as the pool would with Web Workers): chunks land in the store with their progress, and a cancel
 * stops the stream.
 */
const api = {
  sweep: (s: Scenario, axis: SweepAxis, a: number, b: number) => sweep1d(s, axis, {}, { start: a, end: b }),
  map: (s: Scenario, settings: Scenario["studies"]["map"], a: number, b: number) => map2d(s, settings, {}, { start: a, end: b }),
};
const ports: MessagePort[] = [];
function fakeWorker(): Worker {
  const { port1, port2 } = new MessageChannel();
  expose(api, port2);
  ports.push(port1, port2);
  const w = port1 as unknown as Worker & { terminate(): void };
  w.terminate = () => {
    port1.close();
    port2.close();
  };
  return w;
}
afterEach(() => {
  for (const p of ports) p.close();
  ports.length = 0;
});

function setup(edit: (s: Scenario) => Scenario) {
  const store = createWorkbenchStore<Scenario, LiveResult, StudyChunks>({ scenario: edit(valveCoilDemo()), studyKinds: STUDY_KINDS });
  // Only `sweep` and `map` are exercised here; the cast gives the runner the worker API it expects.
  const pool = new WorkerPool<SimWorkerApi>(fakeWorker, 2, 0);
  return { store, pool, runner: new StudyRunner(store, pool) };
}

describe("StudyRunner", () => {
  it("streams one chunk per sweep point into the store and finishes with every point done", async () => {
    const { store, pool, runner } = setup((s) => ({ ...s, studies: { ...s.studies, sweep: { ...s.studies.sweep, points: 3 } } }));
    await runner.sweep();
    const st = store.getState().studies.sweep;
    expect(st.status).toBe("done");
    expect(st.done).toBe(3);
    expect(st.total).toBe(3);
    expect(st.chunks).toHaveLength(3);
    expect(st.chunks.flatMap((c) => c.points.map((p) => p.index)).sort()).toEqual([0, 1, 2]);
    pool.terminate();
  }, 60_000);

  it("cancels a map part-way: status cancelled, progress short of the total, no chunk after the cancel", async () => {
    const { store, pool, runner } = setup((s) => ({
      ...s,
      studies: { ...s.studies, map: { ...s.studies.map, x: { ...s.studies.map.x, points: 10 }, y: { ...s.studies.map.y, points: 10 } } },
    }));
    const running = runner.map();
    while (store.getState().studies.map.done === 0) await new Promise((r) => setTimeout(r, 10));
    runner.cancel("map");
    await running;
    const st = store.getState().studies.map;
    expect(st.status).toBe("cancelled");
    expect(st.done).toBeGreaterThan(0);
    expect(st.done).toBeLessThan(100);
    const n = st.chunks.length;
    await new Promise((r) => setTimeout(r, 300));
    expect(store.getState().studies.map.chunks).toHaveLength(n);
    pool.terminate();
  }, 60_000);

  it("refuses a sweep whose list of values is empty, with the design layer's message", async () => {
    const { store, pool, runner } = setup((s) => ({ ...s, studies: { ...s.studies, sweep: { ...s.studies.sweep, scale: "list", values: [] } } }));
    await runner.sweep();
    expect(store.getState().studies.sweep.status).toBe("failed");
    expect(store.getState().studies.sweep.error).toMatch(/empty/);
    pool.terminate();
  });
});
