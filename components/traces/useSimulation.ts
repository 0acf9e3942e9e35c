"use client";
/**
 * Runs the review simulation (operating point, step response, loop gain, checks) of a stored scenario body in the
 * simulation worker — the same `runScenario` the workbench uses, with the review policy and a time budget — after the
 * first paint, and keeps the result. A newer body supersedes an older run (its job is aborted and the worker
 * stopped); `cancel()` stops a run the user no longer wants to wait for.
 */
import { useCallback, useEffect, useRef, useState } from "react";
import { tryUpgradeScenario } from "@/lib/design/upgrade";
import type { Scenario } from "@/lib/design/schema";
import type { ReviewSimulation } from "@/lib/design/review";
import { WorkerBridge, isAbortError } from "@/lib/workbench/bridge";
import { createSimWorker } from "@/lib/workbench/worker";
import type { SimWorkerApi } from "@/workers/sim.worker";

export type SimulationState =
  | { status: "running"; scenario: Scenario | null }
  | { status: "done"; scenario: Scenario; sim: ReviewSimulation; ms: number }
  | { status: "error"; scenario: Scenario | null; error: string };

export function useSimulation(body: unknown): SimulationState & { cancel: () => void } {
  const [state, setState] = useState<SimulationState>({ status: "running", scenario: null });
  const controller = useRef<AbortController | null>(null);
  const bridge = useRef<WorkerBridge<SimWorkerApi> | null>(null);
  useEffect(() => {
    const b = new WorkerBridge<SimWorkerApi>(createSimWorker);
    bridge.current = b;
    return () => {
      controller.current?.abort();
      b.terminate();
      bridge.current = null;
    };
  }, []);
  useEffect(() => {
    controller.current?.abort();
    const up = tryUpgradeScenario(body);
    if (!up.ok) {
      setState({ status: "error", scenario: null, error: `This revision cannot be simulated: ${up.error}` });
      return;
    }
    const c = new AbortController();
    controller.current = c;
    setState({ status: "running", scenario: up.scenario });
    const t0 = performance.now();
    const b = bridge.current ?? new WorkerBridge<SimWorkerApi>(createSimWorker);
    bridge.current = b;
    b.run(c.signal, (api) => api.review(up.scenario))
      .then((sim) => {
        if (!c.signal.aborted) setState({ status: "done", scenario: up.scenario, sim, ms: performance.now() - t0 });
      })
      .catch((e: unknown) => {
        if (isAbortError(e)) return;
        if (!c.signal.aborted) setState({ status: "error", scenario: up.scenario, error: e instanceof Error ? e.message : String(e) });
      });
    return () => c.abort();
  }, [body]);
  const cancel = useCallback(() => {
    const c = controller.current;
    if (!c || c.signal.aborted) return;
    c.abort();
    setState((s) => (s.status === "running" ? { status: "error", scenario: s.scenario, error: "Simulation stopped. Reload the page to run it again." } : s));
  }, []);
  return { ...state, cancel };
}
