"use client";
import { useHydrated } from "./useHydrated";

/**
 * Placed inside a page that streams behind a Suspense boundary (a route with loading.tsx): marks when the boundary's
 * content has hydrated (`data-island`, `data-ready`), which can be after the layout's HydrationMark.
 */
export function IslandMark() {
  const ready = useHydrated();
  return <span hidden data-island data-ready={ready ? "1" : undefined} />;
}
