"use client";
/**
 * A canvas drawn sharp on high-density screens: its backing store is sized to CSS size × devicePixelRatio, and the
 * drawing function gets a context scaled back to CSS pixels, cleared. Redraws when `deps` change (as useEffect).
 */
import { useEffect, useRef, type DependencyList } from "react";

export function useHiDpiCanvas(
  draw: (ctx: CanvasRenderingContext2D, width: number, height: number) => void,
  deps: DependencyList,
  size: { height: number; /** CSS width, px; the canvas's own width (at least `minWidth`) when absent */ width?: number; minWidth?: number },
) {
  const ref = useRef<HTMLCanvasElement>(null);
  useEffect(() => {
    const c = ref.current;
    if (!c) return;
    const width = size.width ?? Math.max(size.minWidth ?? 0, c.clientWidth);
    const height = size.height;
    const pr = window.devicePixelRatio || 1;
    c.width = Math.round(width * pr);
    c.height = Math.round(height * pr);
    const ctx = c.getContext("2d");
    if (!ctx) return;
    ctx.setTransform(pr, 0, 0, pr, 0, 0);
    ctx.clearRect(0, 0, width, height);
    draw(ctx, width, height);
    // The caller lists what the drawing depends on (`deps`), as with useEffect.
  }, deps);
  return ref;
}
