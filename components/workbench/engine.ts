"use client";
/** The page's engine: one bridge for live runs, a pool for studies, the live runner bound to the store. */
import { useEffect, useState } from "react";
import { WorkerBridge } from "@/lib/workbench/bridge";
import { WorkerPool, poolSize } from "@/lib/workbench/pool";
import { LiveRunner } from "@/lib/workbench/live";
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
    const bridge = new WorkerBridge<SimWorkerApi>(createSimWorker);
    const pool = new WorkerPool<SimWorkerApi>(createSimWorker, poolSize(navigator.hardwareConcurrency), 15_000);
    const runner = new LiveRunner(store, (signal, scenario) => bridge.run(signal, (api) => api.live(scenario)));
    runner.start();
    setEngine({ bridge, pool });
    return () => {
      runner.dispose();
      bridge.terminate();
      pool.terminate();
    };
  }, [store]);
  return engine;
}
