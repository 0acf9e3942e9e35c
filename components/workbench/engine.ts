"use client";
/** The page's engine: one bridge for live runs, a pool for studies, the live runner bound to the store. */
import { useEffect, useState } from "react";
import { WorkerBridge } from "@/lib/workbench/bridge";
import { WorkerPool, poolSize } from "@/lib/workbench/pool";
import { LiveRunner, changedApartFrom } from "@/lib/workbench/live";
import { createSimWorker } from "@/lib/workbench/worker";
import type { SimWorkerApi } from "@/workers/sim.worker";
import { useWbStore } from "./context";

export interface Engine {
  bridge: WorkerBridge<SimWorkerApi>;
  pool: WorkerPool<SimWorkerApi>;
}

export function useEngine(): Engine | null {
  const store = useWbStore();
  const [engine, setEngine] = useState<Engine | null>(null);
  useEffect(() => {
    // Two live workers: the step response and the rest (loop gain first) run at once on two cores.
    const bridge = new WorkerBridge<SimWorkerApi>(createSimWorker);
    const stepBridge = new WorkerBridge<SimWorkerApi>(createSimWorker);
    const pool = new WorkerPool<SimWorkerApi>(createSimWorker, poolSize(navigator.hardwareConcurrency), 15_000);
    const runner = new LiveRunner(store, async (signal, scenario) => {
      const [step, rest] = await Promise.all([
        stepBridge.run(signal, (api) => api.liveStep(scenario)),
        bridge.run(signal, (api) => api.liveRest(scenario)),
      ]);
      return { step, ...rest };
    }, { affectsRun: changedApartFrom(["studies"]) });
    runner.start();
    setEngine({ bridge, pool });
    return () => {
      runner.dispose();
      bridge.terminate();
      stepBridge.terminate();
      pool.terminate();
    };
  }, [store]);
  return engine;
}
