"use client";
/**
 * The scenario's latest bench trace that is in amperes, for the step plot's overlay: the trace list (newest first)
 * and the samples of its first current channel, through the same read routes as the bench-traces page. Loaded only
 * while the overlay is switched on.
 */
import { useEffect, useState } from "react";

export interface LatestTrace {
  id: string;
  label: string;
  channel: string;
  time: Float64Array;
  values: Float64Array;
}

export type LatestTraceState =
  | { status: "off" | "loading" }
  | { status: "none" }
  | { status: "error"; error: string }
  | { status: "done"; trace: LatestTrace };

async function json(url: string, signal: AbortSignal): Promise<Record<string, unknown>> {
  const r = await fetch(url, { signal });
  const body = await r.json().catch(() => ({}));
  if (!r.ok) throw new Error(body.error ?? `HTTP ${r.status}`);
  return body;
}

export function useLatestTrace(scenarioId: string | null, enabled: boolean): LatestTraceState {
  const [state, setState] = useState<LatestTraceState>({ status: "off" });
  useEffect(() => {
    if (!enabled || !scenarioId) { setState({ status: "off" }); return; }
    const ctrl = new AbortController();
    setState({ status: "loading" });
    (async () => {
      const list = (await json(`/api/scenarios/${scenarioId}/traces`, ctrl.signal)) as { traces: { id: string; channels: { unit: string }[] }[] };
      const meta = list.traces.find((t) => t.channels.some((c) => c.unit === "A"));
      if (!meta) { setState({ status: "none" }); return; }
      const data = (await json(`/api/traces/${meta.id}`, ctrl.signal)) as { id: string; label: string; time: number[]; channels: { name: string; unit: string; values: number[] }[] };
      const ch = data.channels.find((x) => x.unit === "A")!;
      setState({
        status: "done",
        trace: { id: data.id, label: data.label, channel: ch.name, time: Float64Array.from(data.time), values: Float64Array.from(ch.values) },
      });
    })().catch((e: unknown) => {
      if ((e as Error).name === "AbortError") return;
      setState({ status: "error", error: (e as Error).message });
    });
    return () => ctrl.abort();
  }, [scenarioId, enabled]);
  return state;
}
