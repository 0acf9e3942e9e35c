"use client";
/**
 * Keeps the workbench's unsaved edits in the browser (lib/workbench/drafts) while they are unsaved, offers to restore
 * a kept draft when the scenario opens again, and asks before leaving the page (a link inside the app, a reload,
 * closing the tab) while edits are unsaved.
 */
import { useEffect, useState } from "react";
import type { Scenario } from "@/lib/design/schema";
import { tryUpgradeScenario } from "@/lib/design/upgrade";
import { browserStorage, dropDraft, readDraft, writeDraft, type KeptDraft } from "@/lib/workbench/drafts";
import { useWb, useWbStore } from "./context";

/** The question asked before leaving with unsaved edits. */
export const LEAVE_QUESTION = "This scenario has unsaved edits. They are kept in this browser, but not saved as a revision. Leave anyway?";

export function useKeptDraft(scenarioId: string | null, baseRevisionId: string | null, keep: boolean) {
  const store = useWbStore();
  const dirty = useWb((s) => s.dirty);
  const scenario = useWb((s) => s.scenario);
  const [offer, setOffer] = useState<KeptDraft<Scenario> | null>(null);

  // A draft kept from an earlier visit: offered, never applied unasked.
  useEffect(() => {
    if (!keep || !scenarioId) return;
    const d = readDraft<Scenario>(browserStorage(), scenarioId);
    if (!d) return;
    // A draft the current schema cannot read is dropped rather than half applied.
    const read = tryUpgradeScenario(d.scenario);
    if (!read.ok) {
      dropDraft(browserStorage(), scenarioId);
      return;
    }
    if (JSON.stringify(read.scenario) !== JSON.stringify(store.getState().saved)) setOffer({ ...d, scenario: read.scenario });
  }, [keep, scenarioId, store]);

  // While edits are unsaved, the draft follows them; once saved (or undone back to the saved values) it is dropped.
  useEffect(() => {
    if (!keep || !scenarioId || !baseRevisionId) return;
    if (offer) return; // do not overwrite a kept draft before the person has chosen
    if (dirty) writeDraft(browserStorage(), scenarioId, { baseRevisionId, scenario, savedAt: Date.now() });
    else dropDraft(browserStorage(), scenarioId);
  }, [keep, scenarioId, baseRevisionId, dirty, scenario, offer]);

  // Leaving: the browser's own prompt for reloads and closing; a question for links inside the app.
  useEffect(() => {
    if (!keep || !dirty) return;
    const onBefore = (e: BeforeUnloadEvent) => {
      e.preventDefault();
    };
    const onClick = (e: MouseEvent) => {
      if (e.defaultPrevented || e.button !== 0 || e.metaKey || e.ctrlKey || e.shiftKey || e.altKey) return;
      const a = (e.target as Element | null)?.closest?.("a[href]") as HTMLAnchorElement | null;
      if (!a || a.target === "_blank" || a.hasAttribute("download")) return;
      const to = new URL(a.href, window.location.href);
      if (to.origin === window.location.origin && to.pathname === window.location.pathname) return;
      if (!window.confirm(LEAVE_QUESTION)) {
        e.preventDefault();
        e.stopPropagation();
      }
    };
    window.addEventListener("beforeunload", onBefore);
    document.addEventListener("click", onClick, true);
    return () => {
      window.removeEventListener("beforeunload", onBefore);
      document.removeEventListener("click", onClick, true);
    };
  }, [keep, dirty]);

  return {
    offer,
    restore() {
      if (!offer) return;
      store.getState().edit(offer.scenario);
      setOffer(null);
    },
    discard() {
      if (scenarioId) dropDraft(browserStorage(), scenarioId);
      setOffer(null);
    },
  };
}
