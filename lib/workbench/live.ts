/**
 * Re-simulates on every edit: watches the store's scenario, waits out a short debounce, then runs the live job on
 * the worker. A newer edit supersedes the older run — its result is dropped by run id — and a stale run that has
 * been going longer than `staleKillMs` is aborted, which terminates its worker so the new run starts at once.
 */
import type { StoreApi } from "zustand/vanilla";
import { isAbortError } from "./bridge";
import type { WorkbenchState } from "./store";

/** Debounce between a dragged (coalesced) edit and its run, ms; discrete edits run on the next tick. */
export const LIVE_DEBOUNCE_MS = 60;
/** A superseded run older than this is killed rather than waited for, ms. */
export const STALE_KILL_MS = 200;

export interface LiveRunnerOptions {
  /** Whether a change from `prev` to `next` needs a new run (default: any change). */
  affectsRun?: (next: unknown, prev: unknown) => boolean;
  debounceMs?: number;
  staleKillMs?: number;
  now?: () => number;
}

export type LiveJob<S, R> = (signal: AbortSignal, scenario: S) => Promise<R>;

/**
 * For objects edited by copying along the changed path: true when any top-level field other than `ignored` changed.
 * (Study settings live in the scenario but do not change what the live run computes.)
 */
export function changedApartFrom(ignored: readonly string[]) {
  return (next: unknown, prev: unknown): boolean => {
    if (next === null || prev === null || typeof next !== "object" || typeof prev !== "object") return next !== prev;
    const a = next as Record<string, unknown>, b = prev as Record<string, unknown>;
    for (const k of new Set([...Object.keys(a), ...Object.keys(b)])) {
      if (!ignored.includes(k) && a[k] !== b[k]) return true;
    }
    return false;
  };
}

/** A readable message from whatever a run threw (engine SimError, scenario error, worker crash). */
export function errorMessage(e: unknown): string {
  if (e instanceof Error) return e.message || e.name;
  if (e && typeof e === "object" && "message" in e && typeof (e as { message: unknown }).message === "string") {
    return (e as { message: string }).message;
  }
  return String(e);
}

export class LiveRunner<S, R, T extends Record<string, unknown>> {
  private timer: ReturnType<typeof setTimeout> | null = null;
  private inflight: { ctl: AbortController; startedAt: number } | null = null;
  private unsubscribe: (() => void) | null = null;
  private readonly debounceMs: number;
  private readonly staleKillMs: number;
  private readonly now: () => number;
  private readonly affectsRun: (next: unknown, prev: unknown) => boolean;

  constructor(
    private readonly store: StoreApi<WorkbenchState<S, R, T>>,
    private readonly job: LiveJob<S, R>,
    options: LiveRunnerOptions = {},
  ) {
    this.debounceMs = options.debounceMs ?? LIVE_DEBOUNCE_MS;
    this.staleKillMs = options.staleKillMs ?? STALE_KILL_MS;
    this.now = options.now ?? (() => performance.now());
    this.affectsRun = options.affectsRun ?? (() => true);
  }

  /** Run now for the current scenario and then after every scenario change. */
  start(): void {
    if (this.unsubscribe) return;
    this.unsubscribe = this.store.subscribe((st, prev) => {
      // A drag (coalesced edits) waits out the debounce; a discrete edit (Enter, a choice, undo) runs at once.
      if (st.scenario !== prev.scenario && this.affectsRun(st.scenario, prev.scenario)) {
        this.schedule(st.lastEdit === null ? 0 : this.debounceMs);
      }
    });
    void this.runNow();
  }

  schedule(delayMs = this.debounceMs): void {
    if (this.timer) clearTimeout(this.timer);
    this.timer = setTimeout(() => {
      this.timer = null;
      void this.runNow();
    }, delayMs);
  }

  async runNow(): Promise<void> {
    const prev = this.inflight;
    if (prev && this.now() - prev.startedAt > this.staleKillMs) prev.ctl.abort();
    const id = this.store.getState().beginRun();
    const scenario = this.store.getState().scenario;
    const ctl = new AbortController();
    const mine = { ctl, startedAt: this.now() };
    this.inflight = mine;
    try {
      const result = await this.job(ctl.signal, scenario);
      // The duration counts from the request (startedAt above), not from when the worker took the job: time spent
      // queued behind a stale run is counted too.
      this.store.getState().finishRun(id, result, this.now() - mine.startedAt);
    } catch (e) {
      if (!isAbortError(e)) this.store.getState().failRun(id, errorMessage(e));
    } finally {
      if (this.inflight === mine) this.inflight = null;
    }
  }

  dispose(): void {
    this.unsubscribe?.();
    this.unsubscribe = null;
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
    this.inflight?.ctl.abort();
    this.inflight = null;
  }
}
