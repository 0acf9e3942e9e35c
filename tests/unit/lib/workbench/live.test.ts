import { describe, expect, it } from "vitest";
import { createWorkbenchStore } from "@/lib/workbench/store";
import { LiveRunner } from "@/lib/workbench/live";
import { abortError } from "@/lib/workbench/bridge";

type S = { c: number };
type R = { c: number };
const wait = (ms: number) => new Promise((r) => setTimeout(r, ms));

function setup(durations: (c: number) => number, staleKillMs = 1_000) {
  const store = createWorkbenchStore<S, R, Record<string, never>>({ scenario: { c: 1 }, studyKinds: [] });
  const started: number[] = [];
  const aborted: number[] = [];
  const job = (signal: AbortSignal, s: S) =>
    new Promise<R>((resolve, reject) => {
      started.push(s.c);
      const t = setTimeout(() => resolve({ c: s.c }), durations(s.c));
      signal.addEventListener("abort", () => {
        clearTimeout(t);
        aborted.push(s.c);
        reject(abortError());
      });
    });
  const runner = new LiveRunner(store, job, { debounceMs: 10, staleKillMs });
  return { store, runner, started, aborted };
}

describe("LiveRunner", () => {
  it("debounces a burst of edits into one run of the newest scenario", async () => {
    const { store, runner, started } = setup(() => 5);
    runner.start();
    await wait(20);
    for (let c = 2; c <= 6; c++) store.getState().edit({ c });
    await wait(60);
    expect(started).toEqual([1, 6]);
    expect(store.getState().run.current).toEqual({ c: 6 });
    runner.dispose();
  });

  it("drops the result of a superseded run that finishes after the newer one", async () => {
    // First run is slow (80 ms) but younger than the kill threshold when superseded; the second is fast.
    const { store, runner } = setup((c) => (c === 1 ? 80 : 5));
    runner.start();
    store.getState().edit({ c: 2 });
    await wait(40);
    expect(store.getState().run.current).toEqual({ c: 2 });
    await wait(80);
    expect(store.getState().run.current).toEqual({ c: 2 });
    expect(store.getState().run.previous).toBeNull();
    runner.dispose();
  });

  it("aborts a stale run that has been going longer than the kill threshold", async () => {
    const { store, runner, aborted } = setup((c) => (c === 1 ? 10_000 : 5), 30);
    runner.start();
    await wait(50);
    store.getState().edit({ c: 2 });
    await wait(40);
    expect(aborted).toEqual([1]);
    expect(store.getState().run.current).toEqual({ c: 2 });
    expect(store.getState().run.error).toBeNull();
    runner.dispose();
  });

  it("shows the job's message when a run fails and keeps the last good result", async () => {
    const store = createWorkbenchStore<S, R, Record<string, never>>({ scenario: { c: 1 }, studyKinds: [] });
    const runner = new LiveRunner(store, async (_sig, s: S) => {
      if (s.c === 2) throw new Error("no convergence at node e after gmin and source stepping");
      return { c: s.c };
    }, { debounceMs: 5 });
    runner.start();
    await wait(10);
    store.getState().edit({ c: 2 });
    await wait(30);
    expect(store.getState().run.error).toBe("no convergence at node e after gmin and source stepping");
    expect(store.getState().run.current).toEqual({ c: 1 });
    runner.dispose();
  });
});

import { changedApartFrom } from "@/lib/workbench/live";

describe("LiveRunner relevance", () => {
  it("does not re-run for a change only in the ignored fields (study settings)", async () => {
    type S2 = { parts: { c: number }; studies: { points: number } };
    const store = createWorkbenchStore<S2, S2, Record<string, never>>({ scenario: { parts: { c: 1 }, studies: { points: 7 } }, studyKinds: [] });
    let runs = 0;
    const runner = new LiveRunner(store, async (_s, sc: S2) => {
      runs++;
      return sc;
    }, { debounceMs: 5, affectsRun: changedApartFrom(["studies"]) });
    runner.start();
    await wait(20);
    expect(runs).toBe(1);
    store.getState().edit((s) => ({ ...s, studies: { points: 9 } }));
    await wait(20);
    expect(runs).toBe(1);
    store.getState().edit((s) => ({ ...s, parts: { c: 2 } }));
    await wait(20);
    expect(runs).toBe(2);
    runner.dispose();
  });
});
