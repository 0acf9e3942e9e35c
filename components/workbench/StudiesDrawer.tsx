"use client";
/**
 * Studies open in a drawer from the bottom, over the response zone: Sweep (1D overlays and metric against the
 * parameter), Map (2D heatmap), Spread (tolerance Monte Carlo histograms) and Compensate (with Apply). Each shows
 * a progress bar, the time left, and Cancel.
 */
import { useEffect, useMemo, useState } from "react";
import { StudyRunner } from "@/lib/workbench/studies";
import type { StudyKind } from "@/lib/workbench/types";
import { useWb, useWbStore } from "./context";
import type { Engine } from "./engine";
import { SweepTab } from "./studies/SweepTab";
import { MapTab } from "./studies/MapTab";
import { SpreadTab } from "./studies/SpreadTab";
import { CompensateTab } from "./studies/CompensateTab";

const TABS: { id: StudyKind; label: string }[] = [
  { id: "sweep", label: "Sweep" },
  { id: "map", label: "Map" },
  { id: "spread", label: "Spread" },
  { id: "compensate", label: "Compensate" },
];

export function StudiesDrawer({ open, onToggle, engine }: { open: boolean; onToggle: () => void; engine: Engine | null }) {
  const store = useWbStore();
  const [tab, setTab] = useState<StudyKind>("sweep");
  const runner = useMemo(() => (engine ? new StudyRunner(store, engine.pool) : null), [engine, store]);
  useEffect(() => () => runner?.cancelAll(), [runner]);
  const running = useWb((s) => TABS.filter((t) => s.studies[t.id].status === "running").map((t) => t.label).join(", "));
  return (
    <div className="fixed inset-x-0 bottom-0 z-30 border-t border-hairline bg-white shadow-[0_-4px_16px_rgba(28,36,48,0.08)]" data-testid="studies-drawer">
      <div className="flex items-center gap-3 px-4">
        <button type="button" onClick={onToggle} aria-expanded={open} aria-controls="studies-panel" className="py-1.5 text-[13px] font-semibold" data-testid="studies-toggle">
          Studies {open ? "▾" : "▴"}
        </button>
        {open && (
          <div role="tablist" aria-label="Studies" className="flex gap-1">
            {TABS.map((t) => (
              <button key={t.id} type="button" role="tab" aria-selected={tab === t.id} data-testid={`studies-tab-${t.id}`}
                className={`rounded px-2.5 py-1 text-[13px] ${tab === t.id ? "bg-signal-light font-semibold text-signal-dark" : "text-ink-muted hover:text-ink"}`}
                onClick={() => setTab(t.id)}>
                {t.label}
              </button>
            ))}
          </div>
        )}
        {running && <span className="text-[12px] text-ink-muted">running: {running}</span>}
      </div>
      {open && (
        <div id="studies-panel" role="tabpanel" className="max-h-[55vh] overflow-y-auto border-t border-hairline bg-paper px-4 py-3">
          {tab === "sweep" && <SweepTab runner={runner} />}
          {tab === "map" && <MapTab runner={runner} />}
          {tab === "spread" && <SpreadTab runner={runner} />}
          {tab === "compensate" && <CompensateTab runner={runner} />}
        </div>
      )}
    </div>
  );
}
