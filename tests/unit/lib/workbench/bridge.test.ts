import { expose } from "comlink";
import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import { DEFAULT_IDLE_MS, WorkerBridge, isAbortError } from "@/lib/workbench/bridge";
import { WorkerPool, chunkRanges, poolSize } from "@/lib/workbench/pool";

/**
 * A stand-in for a Web Worker: comlink over a MessageChannel, with terminate() closing the ports. A long solve is
 * `hold(x)`: it answers x only when the test releases it, so no test waits on the clock. Timers are fake (the idle
 * timeout is advanced by hand); setImmediate stays real so that the channel's messages keep flowing.
 */
const held: { x: number; release: () => void }[] = [];
const api = {
  double: (x: number) => 2 * x,
  hold: (x: number) => new Promise<number>((r) => held.push({ x, release: () => r(x) })),
  fail: () => {
    throw new Error("no convergence at node sense");
  },
};
type Api = typeof api;
const open: MessagePort[] = [];
let terminated = 0;
function fakeWorker(): Worker {
  const { port1, port2 } = new MessageChannel();
  expose(api, port2);
  open.push(port1, port2);
  const w = port1 as unknown as Worker & { terminate(): void };
  w.terminate = () => {
    terminated += 1;
    port1.close();
    port2.close();
  };
  return w;
}

/** Turns of the real event loop until `cond` holds (messages between the ports need them); fails after 1000. */
async function until(cond: () => boolean): Promise<void> {
  for (let i = 0; i < 1000 && !cond(); i++) await new Promise((r) => setImmediate(r));
  expect(cond()).toBe(true);
}

beforeEach(() => {
  vi.useFakeTimers({ toFake: ["setTimeout", "clearTimeout", "setInterval", "clearInterval", "Date"] });
});
afterEach(() => {
  vi.useRealTimers();
  for (const p of open) p.close();
  open.length = 0;
  held.length = 0;
  terminated = 0;
});

describe("WorkerBridge", () => {
  it("starts the worker lazily, once, and runs jobs in order", async () => {
    const bridge = new WorkerBridge<Api>(fakeWorker, 0);
    expect(bridge.starts).toBe(0);
    const signal = new AbortController().signal;
    const order: number[] = [];
    const both = Promise.all([
      bridge.run(signal, (w) => w.hold(30)).then((v) => order.push(v)),
      bridge.run(signal, (w) => w.double(2)).then((v) => order.push(v)),
    ]);
    await until(() => held.length === 1);
    expect(order).toEqual([]); // the second job waits for the first
    held[0]!.release();
    await both;
    expect(order).toEqual([30, 4]);
    expect(bridge.starts).toBe(1);
    bridge.terminate();
  });

  it("terminates the worker when a running job is aborted and starts a fresh one for the next", async () => {
    const bridge = new WorkerBridge<Api>(fakeWorker, 0);
    const ctl = new AbortController();
    const p = bridge.run(ctl.signal, (w) => w.hold(5_000));
    await until(() => held.length === 1);
    ctl.abort();
    const err = await p.catch((e: unknown) => e);
    expect(isAbortError(err)).toBe(true);
    expect(terminated).toBe(1);
    expect(await bridge.run(new AbortController().signal, (w) => w.double(21))).toBe(42);
    expect(bridge.starts).toBe(2);
    bridge.terminate();
  });

  it("passes the worker's error through", async () => {
    const bridge = new WorkerBridge<Api>(fakeWorker, 0);
    await expect(bridge.run(new AbortController().signal, (w) => w.fail())).rejects.toThrow("no convergence");
    bridge.terminate();
  });

  it("kills an idle worker after the idle time, not before", async () => {
    const bridge = new WorkerBridge<Api>(fakeWorker, DEFAULT_IDLE_MS);
    await bridge.run(new AbortController().signal, (w) => w.double(1));
    await until(() => !bridge.busy);
    vi.advanceTimersByTime(DEFAULT_IDLE_MS - 1);
    expect(terminated).toBe(0);
    vi.advanceTimersByTime(1);
    expect(terminated).toBe(1);
  });

  it("a job queued before the idle time runs on the same worker", async () => {
    const bridge = new WorkerBridge<Api>(fakeWorker, DEFAULT_IDLE_MS);
    await bridge.run(new AbortController().signal, (w) => w.double(1));
    await until(() => !bridge.busy);
    vi.advanceTimersByTime(DEFAULT_IDLE_MS - 1);
    expect(await bridge.run(new AbortController().signal, (w) => w.double(2))).toBe(4);
    expect(bridge.starts).toBe(1);
    expect(terminated).toBe(0);
    bridge.terminate();
  });
});

describe("WorkerPool", () => {
  it("runs every task once across the workers and streams each result", async () => {
    const pool = new WorkerPool<Api>(fakeWorker, 2, 0);
    const seen: number[] = [];
    await pool.map(new AbortController().signal, [1, 2, 3, 4, 5], (w, t) => w.double(t), (r) => seen.push(r));
    expect(seen.sort((a, b) => a - b)).toEqual([2, 4, 6, 8, 10]);
    pool.terminate();
  });

  it("stops on cancel with AbortError and delivers nothing after it", async () => {
    const pool = new WorkerPool<Api>(fakeWorker, 2, 0);
    const ctl = new AbortController();
    const seen: number[] = [];
    const p = pool.map(ctl.signal, [10, 5_000, 5_000, 5_000], (w, t) => w.hold(t), (r) => seen.push(r));
    await until(() => held.length === 2); // one task on each worker
    held.find((h) => h.x === 10)!.release();
    await until(() => seen.length === 1 && held.length === 3); // its result streamed; that worker took the next task
    ctl.abort();
    const err = await p.catch((e: unknown) => e);
    expect(isAbortError(err)).toBe(true);
    expect(seen).toEqual([10]);
    pool.terminate();
  });

  it("sizes from hardwareConcurrency and splits ranges", () => {
    expect(poolSize(2)).toBe(2);
    expect(poolSize(undefined)).toBe(2);
    expect(poolSize(64)).toBe(8);
    expect(chunkRanges(10, 4)).toEqual([[0, 4], [4, 8], [8, 10]]);
  });
});

describe("WorkerBridge when the worker dies", () => {
  it("fails the job in flight with a message instead of waiting for ever, and starts afresh", async () => {
    let first: (Worker & EventTarget) | null = null;
    const bridge = new WorkerBridge<Api>(() => {
      const w = fakeWorker();
      if (!first) first = w as Worker & EventTarget;
      return w;
    }, 0);
    const p = bridge.run(new AbortController().signal, (w) => w.hold(5_000));
    await until(() => held.length === 1);
    const ev = new Event("error") as Event & { message?: string };
    Object.defineProperty(ev, "message", { value: "SyntaxError in sim.worker" });
    first!.dispatchEvent(ev);
    await expect(p).rejects.toThrow("The simulation worker stopped: SyntaxError in sim.worker");
    expect(await bridge.run(new AbortController().signal, (w) => w.double(4))).toBe(8);
    expect(bridge.starts).toBe(2);
    bridge.terminate();
  });
});
