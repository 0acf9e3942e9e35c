import { describe, expect, it } from "vitest";
import { COALESCE_WINDOW_MS, createWorkbenchStore } from "@/lib/workbench/store";

interface S { compensation: number; base: number }
type R = { runOf: number };
type T = { sweep: number[]; map: number[] };

function make(start: S = { compensation: 2.2e-9, base: 220 }) {
  let clock = 0;
  const store = createWorkbenchStore<S, R, T>({ scenario: start, studyKinds: ["sweep", "map"], now: () => clock });
  return { store, tick: (ms: number) => (clock += ms) };
}

describe("workbench store: undo, redo and the dirty flag", () => {
  it("undoes and redoes edits in order and clears redo on a new edit", () => {
    const { store } = make();
    const s = store.getState();
    s.edit((x) => ({ ...x, compensation: 4.7e-9 }));
    store.getState().edit((x) => ({ ...x, base: 470 }));
    expect(store.getState().scenario).toEqual({ compensation: 4.7e-9, base: 470 });
    store.getState().undo();
    expect(store.getState().scenario).toEqual({ compensation: 4.7e-9, base: 220 });
    store.getState().undo();
    expect(store.getState().scenario).toEqual({ compensation: 2.2e-9, base: 220 });
    store.getState().undo(); // nothing left: no change
    expect(store.getState().scenario).toEqual({ compensation: 2.2e-9, base: 220 });
    store.getState().redo();
    expect(store.getState().scenario).toEqual({ compensation: 4.7e-9, base: 220 });
    store.getState().edit((x) => ({ ...x, base: 1000 }));
    expect(store.getState().future).toHaveLength(0);
    store.getState().redo();
    expect(store.getState().scenario).toEqual({ compensation: 4.7e-9, base: 1000 });
  });

  it("is dirty after an edit, clean again when undone back to the saved scenario, and after markSaved", () => {
    const { store } = make();
    expect(store.getState().dirty).toBe(false);
    store.getState().edit((x) => ({ ...x, compensation: 1e-9 }));
    expect(store.getState().dirty).toBe(true);
    store.getState().undo();
    expect(store.getState().dirty).toBe(false);
    store.getState().redo();
    expect(store.getState().dirty).toBe(true);
    store.getState().markSaved();
    expect(store.getState().dirty).toBe(false);
    store.getState().undo();
    expect(store.getState().dirty).toBe(true);
  });

  it("merges a slider drag (same key, inside the window) into one undo step", () => {
    const { store, tick } = make();
    store.getState().edit((x) => ({ ...x, base: 300 }), { coalesceKey: "base" });
    tick(50);
    store.getState().edit((x) => ({ ...x, base: 400 }), { coalesceKey: "base" });
    tick(50);
    store.getState().edit((x) => ({ ...x, base: 500 }), { coalesceKey: "base" });
    expect(store.getState().past).toHaveLength(1);
    tick(COALESCE_WINDOW_MS + 1);
    store.getState().edit((x) => ({ ...x, base: 600 }), { coalesceKey: "base" });
    expect(store.getState().past).toHaveLength(2);
    store.getState().undo();
    expect(store.getState().scenario.base).toBe(500);
    store.getState().undo();
    expect(store.getState().scenario.base).toBe(220);
  });

  it("load() replaces the scenario and forgets history", () => {
    const { store } = make();
    store.getState().edit((x) => ({ ...x, base: 1 }));
    store.getState().load({ compensation: 1e-6, base: 10 });
    expect(store.getState().past).toHaveLength(0);
    expect(store.getState().dirty).toBe(false);
  });
});

describe("workbench store: live runs", () => {
  it("rejects results and errors from a run that a newer run superseded", () => {
    const { store } = make();
    const first = store.getState().beginRun();
    const second = store.getState().beginRun();
    expect(store.getState().finishRun(first, { runOf: first })).toBe(false);
    expect(store.getState().run.current).toBeNull();
    expect(store.getState().failRun(first, "late failure")).toBe(false);
    expect(store.getState().run.error).toBeNull();
    expect(store.getState().finishRun(second, { runOf: second })).toBe(true);
    expect(store.getState().run.current).toEqual({ runOf: second });
    expect(store.getState().run.pending).toBe(false);
  });

  it("keeps the last good result through a failure and moves it to `previous` on the next success", () => {
    const { store } = make();
    const a = store.getState().beginRun();
    store.getState().finishRun(a, { runOf: a });
    const b = store.getState().beginRun();
    store.getState().failRun(b, "no convergence at node sense");
    expect(store.getState().run.current).toEqual({ runOf: a });
    expect(store.getState().run.error).toBe("no convergence at node sense");
    const c = store.getState().beginRun();
    store.getState().finishRun(c, { runOf: c });
    expect(store.getState().run.previous).toEqual({ runOf: a });
    expect(store.getState().run.current).toEqual({ runOf: c });
    expect(store.getState().run.error).toBeNull();
  });
});

describe("workbench store: studies", () => {
  it("tracks progress and time left, and drops chunks of a cancelled or superseded study", () => {
    const { store, tick } = make();
    const id = store.getState().beginStudy("sweep", 10);
    tick(100);
    expect(store.getState().studyChunk("sweep", id, [1, 2], 2)).toBe(true);
    const st = store.getState().studies.sweep;
    expect(st.done).toBe(2);
    // 100 ms for 2 points → 400 ms for the remaining 8 (linear extrapolation).
    expect(st.etaMs).toBeCloseTo(400, 9);
    const id2 = store.getState().beginStudy("sweep", 4);
    expect(store.getState().studyChunk("sweep", id, [3], 1)).toBe(false);
    expect(store.getState().studies.sweep.chunks).toEqual([]);
    store.getState().cancelStudy("sweep");
    expect(store.getState().studies.sweep.status).toBe("cancelled");
    expect(store.getState().studyChunk("sweep", id2, [4], 1)).toBe(false);
    expect(store.getState().studies.map.status).toBe("idle");
  });
});

import { getPath, setPath } from "@/lib/workbench/paths";

describe("scenario paths", () => {
  it("writes a nested field by copying only the objects on the path", () => {
    const s = { parts: { compCapacitor: 1e-9, senseResistor: 0.1 }, load: { cable: { length: 4 } } };
    const t = setPath(s, "load.cable.length", 10);
    expect(getPath(t, "load.cable.length")).toBe(10);
    expect(s.load.cable.length).toBe(4);
    expect(t.parts).toBe(s.parts);
    expect(setPath(s, "parts.compCapacitor", 1e-9)).toBe(s);
    expect(() => setPath(s, "parts.nope", 1)).toThrow(RangeError);
  });
});
