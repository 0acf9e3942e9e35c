/**
 * The workbench's state: the scenario being edited with its undo/redo history and dirty flag, the live run's
 * results (current, previous for the ghost trace, last error) guarded by a run id, and each study's progress.
 *
 * Framework-free (zustand's vanilla `createStore`); one store per page, handed down by a React context provider
 * in components/workbench. Generic over the scenario type `S`, the live result type `R` and a map of study kind →
 * chunk type `T`, so it can be tested in plain Node with small objects.
 */
import { createStore, type StoreApi } from "zustand/vanilla";

/** Edits with the same coalesce key closer together than this share one undo step (slider drags), ms. */
export const COALESCE_WINDOW_MS = 800;
/** How many undo steps are kept. */
export const HISTORY_LIMIT = 200;

export type StudyStatus = "idle" | "running" | "done" | "cancelled" | "failed";

export interface StudyState<C> {
  status: StudyStatus;
  /** Id of the study run whose chunks are accepted; older ids are dropped. */
  runId: number;
  /** Points finished and points in all. */
  done: number;
  total: number;
  /** performance.now()-style clock value when the run started, ms. */
  startedAt: number;
  /** Estimated time left, ms (null before the first chunk). */
  etaMs: number | null;
  /** Chunks in arrival order (each carries its own index range). */
  chunks: C[];
  error: string | null;
}

export interface RunState<R> {
  /** Id of the newest run started; results from older runs are rejected. */
  latestId: number;
  /** A run is in flight. */
  pending: boolean;
  /** Last good result (kept when a later run fails). */
  current: R | null;
  /** The good result before `current`, drawn as the ghost trace. */
  previous: R | null;
  /** The engine's message for the newest failed run, cleared by the next good one. */
  error: string | null;
  /** Wall time of the last good run, ms. */
  elapsedMs: number | null;
}

export interface EditOptions {
  /** Edits with the same key inside COALESCE_WINDOW_MS merge into one undo step. */
  coalesceKey?: string;
}

export interface WorkbenchState<S, R, T extends Record<string, unknown>> {
  scenario: S;
  /** The scenario as last saved (or loaded); dirty = scenario differs from it. */
  saved: S;
  dirty: boolean;
  past: S[];
  future: S[];
  lastEdit: { key: string; at: number } | null;
  /** Part key selected in the schematic or the part list. */
  selectedPart: string | null;
  showOperatingPoint: boolean;
  run: RunState<R>;
  studies: { [K in keyof T]: StudyState<T[K]> };

  edit(next: S | ((s: S) => S), options?: EditOptions): void;
  undo(): void;
  redo(): void;
  /** Replace the scenario and forget the history (a freshly loaded revision). */
  load(s: S): void;
  /** Mark the current (or given) scenario as saved. */
  markSaved(s?: S): void;
  selectPart(key: string | null): void;
  setShowOperatingPoint(on: boolean): void;

  beginRun(): number;
  finishRun(id: number, result: R, elapsedMs?: number): boolean;
  failRun(id: number, message: string): boolean;

  beginStudy<K extends keyof T>(kind: K, total: number): number;
  studyChunk<K extends keyof T>(kind: K, id: number, chunk: T[K], pointsDone: number): boolean;
  finishStudy<K extends keyof T>(kind: K, id: number): boolean;
  cancelStudy<K extends keyof T>(kind: K): void;
  failStudy<K extends keyof T>(kind: K, id: number, message: string): boolean;
}

export type WorkbenchStore<S, R, T extends Record<string, unknown>> = StoreApi<WorkbenchState<S, R, T>>;

export interface WorkbenchInit<S, T extends Record<string, unknown>> {
  scenario: S;
  studyKinds: readonly (keyof T)[];
  /** Clock, ms; injectable for tests. */
  now?: () => number;
}

function idleStudy<C>(): StudyState<C> {
  return { status: "idle", runId: 0, done: 0, total: 0, startedAt: 0, etaMs: null, chunks: [], error: null };
}

/** Create one page's workbench store. */
export function createWorkbenchStore<S, R, T extends Record<string, unknown>>(
  init: WorkbenchInit<S, T>,
): WorkbenchStore<S, R, T> {
  const now = init.now ?? (() => (typeof performance !== "undefined" ? performance.now() : Date.now()));
  const studies = {} as { [K in keyof T]: StudyState<T[K]> };
  for (const k of init.studyKinds) studies[k] = idleStudy<T[typeof k]>();
  let studyCounter = 0;

  return createStore<WorkbenchState<S, R, T>>()((set, get) => ({
    scenario: init.scenario,
    saved: init.scenario,
    dirty: false,
    past: [],
    future: [],
    lastEdit: null,
    selectedPart: null,
    showOperatingPoint: false,
    run: { latestId: 0, pending: false, current: null, previous: null, error: null, elapsedMs: null },
    studies,

    edit(next, options) {
      const st = get();
      const value = typeof next === "function" ? (next as (s: S) => S)(st.scenario) : next;
      if (Object.is(value, st.scenario)) return;
      const t = now();
      const key = options?.coalesceKey;
      const merge = key !== undefined && st.lastEdit !== null && st.lastEdit.key === key
        && t - st.lastEdit.at < COALESCE_WINDOW_MS && st.past.length > 0;
      const past = merge ? st.past : [...st.past, st.scenario].slice(-HISTORY_LIMIT);
      set({
        scenario: value,
        past,
        future: [],
        dirty: !Object.is(value, st.saved),
        lastEdit: key !== undefined ? { key, at: t } : null,
      });
    },
    undo() {
      const st = get();
      if (st.past.length === 0) return;
      const prev = st.past[st.past.length - 1]!;
      set({
        scenario: prev,
        past: st.past.slice(0, -1),
        future: [st.scenario, ...st.future],
        dirty: !Object.is(prev, st.saved),
        lastEdit: null,
      });
    },
    redo() {
      const st = get();
      if (st.future.length === 0) return;
      const next = st.future[0]!;
      set({
        scenario: next,
        past: [...st.past, st.scenario],
        future: st.future.slice(1),
        dirty: !Object.is(next, st.saved),
        lastEdit: null,
      });
    },
    load(s) {
      set({ scenario: s, saved: s, dirty: false, past: [], future: [], lastEdit: null });
    },
    markSaved(s) {
      const st = get();
      const saved = s ?? st.scenario;
      set({ saved, dirty: !Object.is(st.scenario, saved) });
    },
    selectPart(key) {
      set({ selectedPart: key });
    },
    setShowOperatingPoint(on) {
      set({ showOperatingPoint: on });
    },

    beginRun() {
      const run = get().run;
      const id = run.latestId + 1;
      set({ run: { ...run, latestId: id, pending: true } });
      return id;
    },
    finishRun(id, result, elapsedMs) {
      const run = get().run;
      if (id !== run.latestId) return false;
      set({
        run: {
          ...run,
          pending: false,
          previous: run.current,
          current: result,
          error: null,
          elapsedMs: elapsedMs ?? null,
        },
      });
      return true;
    },
    failRun(id, message) {
      const run = get().run;
      if (id !== run.latestId) return false;
      set({ run: { ...run, pending: false, error: message } });
      return true;
    },

    beginStudy(kind, total) {
      studyCounter += 1;
      const id = studyCounter;
      const fresh: StudyState<T[typeof kind]> = {
        ...idleStudy<T[typeof kind]>(),
        status: "running",
        runId: id,
        total,
        startedAt: now(),
      };
      set({ studies: { ...get().studies, [kind]: fresh } });
      return id;
    },
    studyChunk(kind, id, chunk, pointsDone) {
      const cur = get().studies[kind];
      if (cur.runId !== id || cur.status !== "running") return false;
      const done = Math.min(cur.total, cur.done + pointsDone);
      const elapsed = now() - cur.startedAt;
      const etaMs = done > 0 ? (elapsed / done) * (cur.total - done) : null;
      set({ studies: { ...get().studies, [kind]: { ...cur, done, etaMs, chunks: [...cur.chunks, chunk] } } });
      return true;
    },
    finishStudy(kind, id) {
      const cur = get().studies[kind];
      if (cur.runId !== id || cur.status !== "running") return false;
      set({ studies: { ...get().studies, [kind]: { ...cur, status: "done", etaMs: 0 } } });
      return true;
    },
    cancelStudy(kind) {
      const cur = get().studies[kind];
      if (cur.status !== "running") return;
      set({ studies: { ...get().studies, [kind]: { ...cur, status: "cancelled", etaMs: null } } });
    },
    failStudy(kind, id, message) {
      const cur = get().studies[kind];
      if (cur.runId !== id || cur.status !== "running") return false;
      set({ studies: { ...get().studies, [kind]: { ...cur, status: "failed", error: message, etaMs: null } } });
      return true;
    },
  }));
}
