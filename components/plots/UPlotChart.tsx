"use client";
/**
 * A thin React wrapper over uPlot. The main series get the worker's Float64Array columns as they are (uPlot
 * decimates per pixel itself). Traces on other x grids — the previous run's ghost, sweep curves — are drawn by a
 * hook straight from their own arrays, so nothing is re-aligned on the main thread. Drag to zoom, double-click to
 * reset; the legend is the cursor readout.
 */
import { forwardRef, useEffect, useImperativeHandle, useRef } from "react";
import uPlot from "uplot";
import "uplot/dist/uPlot.min.css";
import "./uplot-theme.css";

export interface Overlay {
  x: ArrayLike<number>;
  y: ArrayLike<number>;
  stroke: string;
  scale: string;
  width?: number;
  dash?: number[];
  /** 0–1 */
  alpha?: number;
}

export interface Marker {
  /** vertical line at this x (plot units) */
  x?: number;
  /** horizontal line at this y on `scale` */
  y?: number;
  scale?: string;
  label: string;
  color: string;
}

export interface UPlotChartProps {
  options: Omit<uPlot.Options, "width" | "height">;
  data: uPlot.AlignedData;
  height: number;
  /** drawn behind the main series */
  under?: Overlay[];
  /** drawn above the main series */
  over?: Overlay[];
  markers?: Marker[];
  testId?: string;
  ariaLabel: string;
}

export interface UPlotHandle {
  /** PNG of the plot (canvas only). */
  toPng(): string | null;
  /** Redraws done since mount (the bench reads it through the data attribute too). */
  plot(): uPlot | null;
}

function drawOverlays(u: uPlot, list: Overlay[] | undefined) {
  if (!list || list.length === 0) return;
  const ctx = u.ctx;
  const { left, top, width, height } = u.bbox;
  const pr = uPlot.pxRatio;
  ctx.save();
  ctx.beginPath();
  ctx.rect(left, top, width, height);
  ctx.clip();
  for (const o of list) {
    if (!u.scales[o.scale]) continue;
    ctx.strokeStyle = o.stroke;
    ctx.globalAlpha = o.alpha ?? 1;
    ctx.lineWidth = (o.width ?? 1.5) * pr;
    ctx.setLineDash((o.dash ?? []).map((d) => d * pr));
    ctx.beginPath();
    const n = Math.min(o.x.length, o.y.length);
    let started = false;
    for (let i = 0; i < n; i++) {
      const yv = o.y[i]!;
      if (!Number.isFinite(yv)) {
        started = false;
        continue;
      }
      const X = u.valToPos(o.x[i]!, "x", true);
      const Y = u.valToPos(yv, o.scale, true);
      if (started) ctx.lineTo(X, Y);
      else {
        ctx.moveTo(X, Y);
        started = true;
      }
    }
    ctx.stroke();
  }
  ctx.restore();
}

function drawMarkers(u: uPlot, list: Marker[] | undefined) {
  if (!list || list.length === 0) return;
  const ctx = u.ctx;
  const { left, top, width, height } = u.bbox;
  const pr = uPlot.pxRatio;
  ctx.save();
  ctx.font = `${11 * pr}px "Inter Variable", system-ui, sans-serif`;
  ctx.lineWidth = 1 * pr;
  ctx.setLineDash([4 * pr, 3 * pr]);
  for (const m of list) {
    ctx.strokeStyle = m.color;
    ctx.fillStyle = m.color;
    if (m.x !== undefined && Number.isFinite(m.x)) {
      const X = u.valToPos(m.x, "x", true);
      if (X < left || X > left + width) continue;
      ctx.beginPath();
      ctx.moveTo(X, top);
      ctx.lineTo(X, top + height);
      ctx.stroke();
      ctx.fillText(m.label, Math.min(X + 4 * pr, left + width - ctx.measureText(m.label).width), top + 12 * pr);
    } else if (m.y !== undefined && m.scale && Number.isFinite(m.y)) {
      const Y = u.valToPos(m.y, m.scale, true);
      if (Y < top || Y > top + height) continue;
      ctx.beginPath();
      ctx.moveTo(left, Y);
      ctx.lineTo(left + width, Y);
      ctx.stroke();
      ctx.fillText(m.label, left + width - ctx.measureText(m.label).width - 4 * pr, Y - 4 * pr);
    }
  }
  ctx.restore();
}

export const UPlotChart = forwardRef<UPlotHandle, UPlotChartProps>(function UPlotChart(props, ref) {
  const { options, data, height, under, over, markers, testId, ariaLabel } = props;
  const host = useRef<HTMLDivElement>(null);
  const plot = useRef<uPlot | null>(null);
  const extras = useRef({ under, over, markers });
  extras.current = { under, over, markers };
  const redraws = useRef(0);
  const hasData = data.length > 0 && (data[0] as ArrayLike<number>).length > 0;

  useImperativeHandle(ref, () => ({
    toPng: () => plot.current?.ctx.canvas.toDataURL("image/png") ?? null,
    plot: () => plot.current,
  }));

  // (Re)create the plot when its options change; data updates go through setData below.
  useEffect(() => {
    const el = host.current;
    if (!el || !hasData) return;
    const width = Math.max(200, el.clientWidth);
    const opts: uPlot.Options = {
      ...options,
      width,
      height,
      hooks: {
        ...options.hooks,
        drawAxes: [(u) => drawOverlays(u, extras.current.under)],
        draw: [
          (u) => {
            drawOverlays(u, extras.current.over);
            drawMarkers(u, extras.current.markers);
            redraws.current += 1;
            el.dataset.redraws = String(redraws.current);
          },
        ],
      },
    };
    const u = new uPlot(opts, data, el);
    plot.current = u;
    const ro = new ResizeObserver(() => {
      const w = Math.max(200, el.clientWidth);
      if (Math.abs(w - u.width) > 1) u.setSize({ width: w, height });
    });
    ro.observe(el);
    return () => {
      ro.disconnect();
      u.destroy();
      plot.current = null;
    };
    // data is applied by the next effect; recreating on each data change would lose zoom and cost a layout.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [options, height, hasData]);

  useEffect(() => {
    const u = plot.current;
    if (!u) return;
    if (u.data !== data) u.setData(data, true);
    else u.redraw(false);
  }, [data, under, over, markers]);

  return (
    <div ref={host} role="img" aria-label={ariaLabel} data-testid={testId} className="w-full" style={hasData ? undefined : { height }}>
      {!hasData && <p className="flex h-full items-center justify-center text-[12px] text-ink-muted">Waiting for the first run…</p>}
    </div>
  );
});
