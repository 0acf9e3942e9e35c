"use client";
/** A histogram drawn on a canvas from bin edges and counts (the design layer's `histogram`). */
import { forwardRef, useImperativeHandle } from "react";
import { formatEng } from "@/lib/units/eng";
import { OKABE_ITO } from "./palette";
import { useHiDpiCanvas } from "./useHiDpiCanvas";

export interface HistogramProps {
  edges: ArrayLike<number>; counts: ArrayLike<number>; label: string; unit: string; color?: string; height?: number; testId?: string;
}

export const Histogram = forwardRef<{ toPng(): string | null }, HistogramProps>(function Histogram(props, handle) {
  const { edges, counts, label, unit, color = OKABE_ITO[0], height = 160, testId } = props;
  const ref = useHiDpiCanvas((ctx, width) => {
    const n = counts.length;
    if (n === 0 || edges.length !== n + 1) return;
    let max = 0;
    for (let i = 0; i < n; i++) max = Math.max(max, counts[i]!);
    const L = 36, R = 8, T = 8, B = 30;
    const w = width - L - R, h = height - T - B;
    const lo = edges[0]!, hi = edges[n]!;
    const X = (v: number) => L + (hi > lo ? ((v - lo) / (hi - lo)) * w : w / 2);
    ctx.fillStyle = color;
    for (let i = 0; i < n; i++) {
      const bh = max > 0 ? (counts[i]! / max) * h : 0;
      const x0 = X(edges[i]!), x1 = X(edges[i + 1]!);
      ctx.fillRect(x0 + 0.5, T + h - bh, Math.max(1, x1 - x0 - 1), bh);
    }
    ctx.strokeStyle = "#E2DED5";
    ctx.strokeRect(L, T, w, h);
    ctx.fillStyle = "#5B6472";
    ctx.font = '11px "Inter Variable", system-ui, sans-serif';
    // Five ticks with the same number of decimals (enough to tell neighbours apart); the end ticks are aligned
    // inwards so they are not cut off at the canvas edge.
    const step = (hi - lo) / 4;
    const decimals = step > 0 ? Math.min(6, Math.max(0, Math.ceil(-Math.log10(step)))) : 2;
    const tiny = Math.max(Math.abs(lo), Math.abs(hi)) < 1e-3;
    for (let k = 0; k <= 4; k++) {
      const v = lo + step * k;
      ctx.textAlign = k === 0 ? "left" : k === 4 ? "right" : "center";
      ctx.fillText(tiny && v !== 0 ? formatEng(v, "") : v.toFixed(decimals), L + (w * k) / 4, T + h + 13);
    }
    ctx.textAlign = "center";
    ctx.fillText(`${label}${unit ? ` (${unit})` : ""}`, L + w / 2, height - 3);
    ctx.textAlign = "right";
    ctx.fillText(String(max), L - 4, T + 9);
    ctx.fillText("0", L - 4, T + h);
  }, [edges, counts, label, unit, color, height], { height, minWidth: 200 });
  useImperativeHandle(handle, () => ({ toPng: () => ref.current?.toDataURL("image/png") ?? null }));
  return <canvas ref={ref} style={{ width: "100%", height }} role="img" aria-label={`Histogram of ${label}`} data-testid={testId} />;
});
