"use client";
/** One workbench store per page, handed down by context (never a module-level store). */
import { createContext, useContext, useState, type ReactNode } from "react";
import { useStore } from "zustand";
import type { Scenario } from "@/lib/design/schema";
import { createWorkbenchStore } from "@/lib/workbench/store";
import { STUDY_KINDS, type LiveResult, type StudyChunks, type WbState, type WbStore } from "@/lib/workbench/types";

const StoreContext = createContext<WbStore | null>(null);

export function WorkbenchProvider({ scenario, children }: { scenario: Scenario; children: ReactNode }) {
  const [store] = useState(() =>
    createWorkbenchStore<Scenario, LiveResult, StudyChunks>({ scenario, studyKinds: STUDY_KINDS }),
  );
  return <StoreContext.Provider value={store}>{children}</StoreContext.Provider>;
}

export function useWbStore(): WbStore {
  const s = useContext(StoreContext);
  if (!s) throw new Error("useWbStore: no WorkbenchProvider above this component");
  return s;
}

/** Select a narrow slice of the workbench state. */
export function useWb<T>(selector: (s: WbState) => T): T {
  return useStore(useWbStore(), selector);
}
