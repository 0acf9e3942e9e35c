"use client";
import { useEffect, useState } from "react";

/**
 * True once this component has hydrated. A client island inside a page's Suspense boundary can hydrate after the
 * layout (after `<html data-hydrated>`, see HydrationMark); an input changed before then loses its event. Such a
 * page renders IslandMark, which marks itself `data-island` and, once hydrated, `data-ready="1"`; end-to-end tests
 * wait for every island.
 */
export function useHydrated(): boolean {
  const [ready, setReady] = useState(false);
  useEffect(() => setReady(true), []);
  return ready;
}
