"use client";
/**
 * Runs the review simulation (operating point, step response, checks) of a stored scenario body in the browser,
 * after the first paint, and keeps the result. A newer body supersedes an older run (run id guard).
 */
import { useEffect, useRef, useState } from "react";
import { tryUpgradeScenario } from "@/lib/design/upgrade";
import type { Scenario } from "@/lib/design/schema";
import { simulateForReview, type ReviewSimulation } from "@/lib/traces/simulate";

export type SimulationState =
  | { status: "running"; scenario: Scenario | null }
  | { status: "done"; scenario: Scenario; sim: ReviewSimulation; ms: number }
  | { status: "error"; scenario: Scenario | null; error: string };

export function useSimulation(body: unknown): SimulationState {
  const [state, setState] = useState<SimulationState>({ status: "running", scenario: null });
  const runId = useRef(0);
  useEffect(() => {
    const id = ++runId.current;
    const up = tryUpgradeScenario(body);
    if (!up.ok) {
      setState({ status: "error", scenario: null, error: `This revision cannot be simulated: ${up.error}` });
      return;
    }
    setState({ status: "running", scenario: up.scenario });
    const timer = setTimeout(() => {
      const t0 = performance.now();
      try {
        const sim = simulateForReview(up.scenario);
        if (id === runId.current) setState({ status: "done", scenario: up.scenario, sim, ms: performance.now() - t0 });
      } catch (e) {
        if (id === runId.current) setState({ status: "error", scenario: up.scenario, error: e instanceof Error ? e.message : String(e) });
      }
    }, 0);
    return () => clearTimeout(timer);
  }, [body]);
  return state;
}
