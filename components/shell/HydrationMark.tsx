"use client";

import { useEffect } from "react";

/**
 * Marks the page as interactive (`<html data-hydrated>`) once React has hydrated it, so end-to-end tests act only
 * when event handlers are attached (an input changed before hydration loses its event).
 */
export function HydrationMark() {
  useEffect(() => {
    document.documentElement.dataset.hydrated = "1";
  }, []);
  return null;
}
