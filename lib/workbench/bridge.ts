/**
 * A bridge that owns one Web Worker's life: starts it lazily, runs jobs one at a time in order, terminates it when
 * a job's AbortSignal fires (a running solve cannot be stopped any other way) and after an idle timeout.
 * UI code never touches `Worker` or comlink directly.
 */
import { wrap, releaseProxy, type Remote } from "comlink";

/** Idle time before the worker is terminated, ms. */
export const DEFAULT_IDLE_MS = 30_000;

export function abortError(): DOMException {
  return new DOMException("The run was superseded or cancelled", "AbortError");
}

/** AbortError is normal control flow: never shown, never logged as a failure. */
export function isAbortError(e: unknown): boolean {
  return e instanceof Error ? e.name === "AbortError" : (e as { name?: string } | null)?.name === "AbortError";
}

export function assertSignal(signal: AbortSignal): void {
  if (signal.aborted) throw abortError();
}

export class WorkerBridge<Api> {
  private worker: Worker | null = null;
  private api: Remote<Api> | null = null;
  private queue: Promise<unknown> = Promise.resolve();
  private idleTimer: ReturnType<typeof setTimeout> | null = null;
  private running = 0;
  /** Rejects the job in flight when the worker dies (a load error or an uncaught error inside it). */
  private failCurrent: ((e: Error) => void) | null = null;
  /** Times a worker was started (for tests and diagnostics). */
  starts = 0;

  constructor(
    private readonly createWorker: () => Worker,
    private readonly idleMs: number = DEFAULT_IDLE_MS,
  ) {}

  /** Jobs queued or running on this bridge. */
  get busy(): boolean {
    return this.running > 0;
  }

  private start(): Remote<Api> {
    if (!this.api) {
      const worker = this.createWorker();
      // comlink would wait for ever on a worker that failed to load or crashed: fail the job instead.
      worker.addEventListener("error", (ev: Event) => {
        const msg = (ev as ErrorEvent).message || "the worker could not start";
        if (this.worker === worker) this.terminate();
        this.failCurrent?.(new Error(`The simulation worker stopped: ${msg}`));
      });
      this.worker = worker;
      this.api = wrap<Api>(worker);
      this.starts += 1;
    }
    return this.api;
  }

  /** Stop the worker now; queued jobs start a fresh one. */
  terminate(): void {
    if (this.idleTimer) clearTimeout(this.idleTimer);
    this.idleTimer = null;
    if (this.api) {
      try {
        this.api[releaseProxy]();
      } catch {
        /* the port may already be closed */
      }
    }
    this.worker?.terminate();
    this.worker = null;
    this.api = null;
  }

  /**
   * Run `job` against the worker's API after the jobs queued before it. Rejects with AbortError when `signal`
   * fires before or during the job; during the job the worker is terminated.
   */
  run<T>(signal: AbortSignal, job: (api: Remote<Api>) => Promise<T>): Promise<T> {
    this.running += 1;
    if (this.idleTimer) clearTimeout(this.idleTimer);
    this.idleTimer = null;
    const result = this.queue.then(() => this.runNow(signal, job));
    this.queue = result.catch(() => undefined).finally(() => {
      this.running -= 1;
      if (this.running === 0) this.armIdle();
    });
    return result;
  }

  private runNow<T>(signal: AbortSignal, job: (api: Remote<Api>) => Promise<T>): Promise<T> {
    if (signal.aborted) return Promise.reject(abortError());
    const api = this.start();
    return new Promise<T>((resolve, reject) => {
      let settled = false;
      const done = () => {
        settled = true;
        signal.removeEventListener("abort", onAbort);
        if (this.failCurrent === fail) this.failCurrent = null;
      };
      const onAbort = () => {
        if (settled) return;
        done();
        this.terminate();
        reject(abortError());
      };
      const fail = (e: Error) => {
        if (settled) return;
        done();
        reject(e);
      };
      this.failCurrent = fail;
      signal.addEventListener("abort", onAbort, { once: true });
      job(api).then(
        (v) => {
          if (settled) return;
          done();
          if (signal.aborted) reject(abortError());
          else resolve(v);
        },
        (e: unknown) => {
          if (settled) return;
          done();
          reject(signal.aborted ? abortError() : e);
        },
      );
    });
  }

  private armIdle(): void {
    if (!this.worker || this.idleMs <= 0 || !Number.isFinite(this.idleMs)) return;
    this.idleTimer = setTimeout(() => {
      if (this.running === 0) this.terminate();
    }, this.idleMs);
  }
}
