/**
 * A pool of worker bridges for studies: tasks (index ranges of a study) are handed out one at a time to whichever
 * worker is free, each result streams back through `onResult` as soon as it is ready, and one AbortSignal cancels
 * the lot (terminating the workers that are busy).
 */
import type { Remote } from "comlink";
import { WorkerBridge, abortError, isAbortError } from "./bridge";

/** Workers to use: one per logical core the browser reports, at least 1, at most 8. */
export function poolSize(hardwareConcurrency: number | undefined): number {
  const n = hardwareConcurrency && Number.isFinite(hardwareConcurrency) ? Math.floor(hardwareConcurrency) : 2;
  return Math.max(1, Math.min(8, n));
}

export class WorkerPool<Api> {
  private readonly bridges: WorkerBridge<Api>[];

  constructor(createWorker: () => Worker, size: number, idleMs?: number) {
    this.bridges = Array.from({ length: Math.max(1, size) }, () => new WorkerBridge<Api>(createWorker, idleMs));
  }

  get size(): number {
    return this.bridges.length;
  }

  /**
   * Run every task, at most `size` at once. Resolves when all are done; rejects with the first error (the other
   * workers are stopped) or with AbortError when `signal` fires.
   */
  async map<T, R>(
    signal: AbortSignal,
    tasks: readonly T[],
    job: (api: Remote<Api>, task: T, index: number) => Promise<R>,
    onResult: (result: R, task: T, index: number) => void,
  ): Promise<void> {
    if (signal.aborted) throw abortError();
    const inner = new AbortController();
    const relay = () => inner.abort();
    signal.addEventListener("abort", relay, { once: true });
    let next = 0;
    let failure: unknown = null;
    const lane = async (bridge: WorkerBridge<Api>) => {
      while (next < tasks.length && failure === null && !inner.signal.aborted) {
        const i = next++;
        const task = tasks[i]!;
        try {
          const r = await bridge.run(inner.signal, (api) => job(api, task, i));
          if (!inner.signal.aborted) onResult(r, task, i);
        } catch (e) {
          if (!isAbortError(e) && failure === null) {
            failure = e;
            inner.abort();
          }
          return;
        }
      }
    };
    try {
      await Promise.all(this.bridges.map(lane));
    } finally {
      signal.removeEventListener("abort", relay);
    }
    if (failure !== null) throw failure;
    if (signal.aborted) throw abortError();
  }

  terminate(): void {
    for (const b of this.bridges) b.terminate();
  }
}

/** Split [0, n) into ranges of at most `size` points: [[0,size), [size,2·size), …]. */
export function chunkRanges(n: number, size: number): [number, number][] {
  const out: [number, number][] = [];
  const step = Math.max(1, Math.floor(size));
  for (let a = 0; a < n; a += step) out.push([a, Math.min(n, a + step)]);
  return out;
}
