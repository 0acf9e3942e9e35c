"use client";
/**
 * A thin React wrapper over uPlot. The main series get the worker's Float64Array columns as they are (uPlot
 * decimates per pixel itself). Traces on other x grids — the previous run's ghost, sweep curves — are drawn by a
 * hook straight from their own arrays, so nothing is re-aligned on the main thread.
 *
 * Interaction, the same on every plot: drag a box to zoom (both axes), Shift-drag to pan, double-click to reset;
 * a click places cursor A, the next cursor B (then A again), each drawn as a line with its readout under the plot and
 * the differences between them (Δt, ΔI, Δf, ΔdB, Δphase as the plot's axes are).
 */
import { forwardRef, useEffect, useImperativeHandle, useRef, useState } from "react";
import { formatEng } from "@/lib/units/eng";
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

/** What the two cursors read: the x axis and the series (by index in the data) with their units. */
export interface CursorReadout {
  x: { name: string; unit: string };
  series: { index: number; name: string; unit: string; /** "dB" and "°" are printed plainly, others in engineering notation */ plain?: boolean }[];
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
  /** the two cursors' readout; without it the cursors still draw but nothing is read out */
  readout?: CursorReadout;
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

/**
 * What the markers and the cursors share: the context saved, the label font and a 1 px line in canvas pixels (uPlot
 * draws at the device pixel ratio), the plot area; restored after `draw`.
 */
function withAnnotationInk(u: uPlot, draw: (ctx: CanvasRenderingContext2D, pr: number, box: uPlot.BBox) => void) {
  const ctx = u.ctx;
  const pr = uPlot.pxRatio;
  ctx.save();
  ctx.font = `${11 * pr}px "Inter Variable", system-ui, sans-serif`;
  ctx.lineWidth = 1 * pr;
  // Annotations belong to the plot area: labels are placed inside it, and the clip catches what would still stray.
  const { left, top, width, height } = u.bbox;
  ctx.beginPath();
  ctx.rect(left, top, width, height);
  ctx.clip();
  try {
    draw(ctx, pr, u.bbox);
  } finally {
    ctx.restore();
  }
}

function drawMarkers(u: uPlot, list: Marker[] | undefined) {
  if (!list || list.length === 0) return;
  withAnnotationInk(u, (ctx, pr, { left, top, width, height }) => {
    ctx.setLineDash([4 * pr, 3 * pr]);
    for (const m of list) {
      ctx.strokeStyle = m.color;
      ctx.fillStyle = m.color;
      if (m.x !== undefined && m.y !== undefined && m.scale && Number.isFinite(m.x) && Number.isFinite(m.y)) {
        // a point: a small ring with its label beside it
        const X = u.valToPos(m.x, "x", true), Y = u.valToPos(m.y, m.scale, true);
        if (X < left || X > left + width || Y < top || Y > top + height) continue;
        ctx.setLineDash([]);
        ctx.beginPath();
        ctx.arc(X, Y, 3.5 * pr, 0, 2 * Math.PI);
        ctx.stroke();
        const w = ctx.measureText(m.label).width;
        ctx.fillText(m.label, X + 6 * pr + w > left + width ? X - 6 * pr - w : X + 6 * pr, Math.min(Math.max(Y + 4 * pr, top + 11 * pr), top + height - 3 * pr));
        ctx.setLineDash([4 * pr, 3 * pr]);
      } else if (m.x !== undefined && Number.isFinite(m.x)) {
        const X = u.valToPos(m.x, "x", true);
        if (X < left || X > left + width) continue;
        ctx.beginPath();
        ctx.moveTo(X, top);
        ctx.lineTo(X, top + height);
        ctx.stroke();
        ctx.fillText(m.label, Math.max(left + 2 * pr, Math.min(X + 4 * pr, left + width - ctx.measureText(m.label).width)), top + 12 * pr);
      } else if (m.y !== undefined && m.scale && Number.isFinite(m.y)) {
        const Y = u.valToPos(m.y, m.scale, true);
        if (Y < top || Y > top + height) continue;
        ctx.beginPath();
        ctx.moveTo(left, Y);
        ctx.lineTo(left + width, Y);
        ctx.stroke();
        // above the line, or below it where the line runs along the top
        ctx.fillText(m.label, left + width - ctx.measureText(m.label).width - 4 * pr, Y - 4 * pr - 11 * pr < top ? Y + 13 * pr : Y - 4 * pr);
      }
    }
  });
}

/** Cursor A and B lines, in ink at low weight, labelled at the top. */
function drawCursors(u: uPlot, cursors: (number | null)[]) {
  withAnnotationInk(u, (ctx, pr, { left, top, width, height }) => {
    ctx.strokeStyle = "#1C2430";
    ctx.fillStyle = "#1C2430";
    cursors.forEach((x, i) => {
      if (x === null || !Number.isFinite(x)) return;
      const X = u.valToPos(x, "x", true);
      if (X < left || X > left + width) return;
      ctx.setLineDash(i === 0 ? [] : [6 * pr, 3 * pr]);
      ctx.beginPath();
      ctx.moveTo(X, top);
      ctx.lineTo(X, top + height);
      ctx.stroke();
      ctx.fillText(i === 0 ? "A" : "B", X + 3 * pr, top + height - 4 * pr);
    });
  });
}

/** Index of the sample nearest to x in an ascending column. */
function nearestIndex(xs: ArrayLike<number>, x: number): number {
  let lo = 0, hi = xs.length - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (xs[mid]! < x) lo = mid;
    else hi = mid;
  }
  return Math.abs(xs[lo]! - x) <= Math.abs(xs[hi]! - x) ? lo : hi;
}

function fmt(v: number | null | undefined, unit: string, plain?: boolean): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return "—";
  return plain ? `${v.toFixed(1)} ${unit}`.replace(" °", "°") : formatEng(v, unit);
}

function Readout({ u, cursors, readout, testId }: { u: uPlot | null; cursors: (number | null)[]; readout: CursorReadout; testId?: string }) {
  if (!u || (cursors[0] === null && cursors[1] === null)) {
    return <p className="px-1 pt-1 text-[11px] text-ink-muted" data-testid={testId ? `${testId}-cursors` : undefined}>Drag to zoom · Shift-drag to pan · double-click to reset · click to place cursors A and B</p>;
  }
  const xs = u.data[0] as ArrayLike<number>;
  const at = (x: number | null) => (x === null ? null : nearestIndex(xs, x));
  const ia = at(cursors[0]!), ib = at(cursors[1]!);
  const val = (i: number | null, k: number) => (i === null ? null : ((u.data[k] as ArrayLike<number | null>)[i] ?? null));
  const row = (name: string, i: number | null) => (
    <span>
      <strong>{name}</strong> {readout.x.name} = {fmt(i === null ? null : xs[i], readout.x.unit)}
      {readout.series.map((s) => <span key={s.index}> · {s.name} {fmt(val(i, s.index), s.unit, s.plain)}</span>)}
    </span>
  );
  return (
    <div className="num flex flex-wrap gap-x-4 px-1 pt-1 text-[11px] text-ink" data-testid={testId ? `${testId}-cursors` : undefined} aria-live="polite">
      {ia !== null && row("A", ia)}
      {ib !== null && row("B", ib)}
      {ia !== null && ib !== null && (
        <span data-testid={testId ? `${testId}-delta` : undefined}>
          <strong>B − A</strong> Δ{readout.x.name} = {fmt(xs[ib]! - xs[ia]!, readout.x.unit)}
          {readout.series.map((s) => {
            const a = val(ia, s.index), b = val(ib, s.index);
            return <span key={s.index}> · Δ{s.name} {fmt(a === null || b === null ? null : b - a, s.unit, s.plain)}</span>;
          })}
        </span>
      )}
    </div>
  );
}

export const UPlotChart = forwardRef<UPlotHandle, UPlotChartProps>(function UPlotChart(props, ref) {
  const { options, data, height, under, over, markers, testId, ariaLabel, readout } = props;
  const host = useRef<HTMLDivElement>(null);
  const plot = useRef<uPlot | null>(null);
  const [cursors, setCursors] = useState<(number | null)[]>([null, null]);
  const cursorRef = useRef(cursors);
  cursorRef.current = cursors;
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
    const xLog = options.scales?.x?.distr === 3;
    const opts: uPlot.Options = {
      ...options,
      width,
      height,
      cursor: {
        ...options.cursor,
        drag: { x: true, y: true, uni: 30, setScale: true },
        bind: {
          // Shift-drag pans (below) instead of drawing a zoom box; double-click resets (below) every scale.
          mousedown: (_u, _t, handler) => (e: MouseEvent) => (e.shiftKey ? null : handler(e)),
          dblclick: () => () => null,
        },
      },
      hooks: {
        ...options.hooks,
        drawAxes: [(u) => drawOverlays(u, extras.current.under)],
        draw: [
          (u) => {
            drawOverlays(u, extras.current.over);
            drawMarkers(u, extras.current.markers);
            drawCursors(u, cursorRef.current);
            redraws.current += 1;
            el.dataset.redraws = String(redraws.current);
          },
        ],
        setScale: [
          (u, key) => {
            if (key !== "x") return;
            el.dataset.xMin = String(u.scales.x!.min);
            el.dataset.xMax = String(u.scales.x!.max);
          },
        ],
      },
    };
    const u = new uPlot(opts, data, el);
    plot.current = u;
    const over = u.over;
    let down: { x: number; y: number; shift: boolean; min: number; max: number; ranges: Record<string, [number, number]> } | null = null;
    const onDown = (e: MouseEvent) => {
      if (e.button !== 0) return;
      const ranges: Record<string, [number, number]> = {};
      for (const k of Object.keys(u.scales)) {
        const sc = u.scales[k]!;
        if (k !== "x" && sc.min != null && sc.max != null) ranges[k] = [sc.min, sc.max];
      }
      down = { x: e.clientX, y: e.clientY, shift: e.shiftKey, min: u.scales.x!.min!, max: u.scales.x!.max!, ranges };
      if (e.shiftKey) e.preventDefault();
    };
    const onMove = (e: MouseEvent) => {
      if (!down || !down.shift) return;
      const w = u.over.clientWidth || 1, h = u.over.clientHeight || 1;
      const fx = (e.clientX - down.x) / w, fy = (e.clientY - down.y) / h;
      if (xLog) {
        const a = Math.log10(down.min), b = Math.log10(down.max), d = (b - a) * fx;
        u.batch(() => {
          u.setScale("x", { min: 10 ** (a - d), max: 10 ** (b - d) });
          for (const [k, [lo, hi]] of Object.entries(down!.ranges)) u.setScale(k, { min: lo + (hi - lo) * fy, max: hi + (hi - lo) * fy });
        });
      } else {
        const d = (down.max - down.min) * fx;
        u.batch(() => {
          u.setScale("x", { min: down!.min - d, max: down!.max - d });
          for (const [k, [lo, hi]] of Object.entries(down!.ranges)) u.setScale(k, { min: lo + (hi - lo) * fy, max: hi + (hi - lo) * fy });
        });
      }
    };
    const onUp = (e: MouseEvent) => {
      if (!down) return;
      const moved = Math.hypot(e.clientX - down.x, e.clientY - down.y);
      const wasShift = down.shift;
      down = null;
      if (wasShift || moved > 3) return;
      // A click: cursor A, then B, then A again.
      const rect = over.getBoundingClientRect();
      const x = u.posToVal(e.clientX - rect.left, "x");
      setCursors((c) => (c[0] === null ? [x, null] : c[1] === null ? [c[0], x] : [x, null]));
    };
    const onDbl = () => {
      // Plots that share a cursor (a Bode plot's magnitude and phase) zoom together, so they reset together.
      const key = options.cursor?.sync?.key;
      const group = key ? uPlot.sync(key).plots : [u];
      for (const p of group.includes(u) ? group : [...group, u]) p.setData(p.data, true);
      setCursors([null, null]);
    };
    over.addEventListener("mousedown", onDown);
    window.addEventListener("mousemove", onMove);
    window.addEventListener("mouseup", onUp);
    over.addEventListener("dblclick", onDbl);
    const ro = new ResizeObserver(() => {
      const w = Math.max(200, el.clientWidth);
      if (Math.abs(w - u.width) > 1) u.setSize({ width: w, height });
    });
    ro.observe(el);
    return () => {
      over.removeEventListener("mousedown", onDown);
      window.removeEventListener("mousemove", onMove);
      window.removeEventListener("mouseup", onUp);
      over.removeEventListener("dblclick", onDbl);
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

  useEffect(() => {
    plot.current?.redraw(false);
  }, [cursors]);

  return (
    <div className="min-w-0">
      <div ref={host} role="img" aria-label={ariaLabel} data-testid={testId} className="w-full overflow-hidden" style={hasData ? undefined : { height }}>
        {!hasData && <p className="flex h-full items-center justify-center text-[12px] text-ink-muted">Waiting for the first run…</p>}
      </div>
      {hasData && readout && <Readout u={plot.current} cursors={cursors} readout={readout} testId={testId} />}
    </div>
  );
});
