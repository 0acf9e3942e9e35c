"use client";
/**
 * A 2D map drawn on a canvas: one cell per grid point, coloured on a sequential ramp between the finite minimum and
 * maximum; cells not yet computed are left pale, failed cells are crossed. Hovering reads a cell out.
 */
import { forwardRef, useEffect, useImperativeHandle, useState } from "react";
import { formatEng } from "@/lib/units/eng";
import { ramp } from "./palette";
import { useHiDpiCanvas } from "./useHiDpiCanvas";

export interface HeatmapProps {
  xValues: ArrayLike<number>;
  yValues: ArrayLike<number>;
  /** row-major: values[iy·nx + ix]; NaN = not computed yet */
  values: ArrayLike<number>;
  /** indices of cells whose run failed */
  failed?: ReadonlySet<number>;
  xLabel: string;
  yLabel: string;
  xUnit: string;
  yUnit: string;
  metricLabel: string;
  metricUnit: string;
  height?: number;
}

const PAD = { left: 64, right: 78, top: 10, bottom: 40 };
/** The colour bar: its gap from the cells and its width, CSS px (it runs the cells' height, in the right margin). */
const BAR = { gap: 14, width: 12 };

export const Heatmap = forwardRef<{ toPng(): string | null }, HeatmapProps>(function Heatmap(props, ref) {
  const { xValues, yValues, values, failed, xLabel, yLabel, xUnit, yUnit, metricLabel, metricUnit, height = 300 } = props;
  const [width, setWidth] = useState(600);
  const [hover, setHover] = useState<string | null>(null);
  const canvas = useHiDpiCanvas((ctx) => {
    const nx = xValues.length, ny = yValues.length;
    if (nx === 0 || ny === 0) return;
    let lo = Infinity, hi = -Infinity;
    for (let i = 0; i < values.length; i++) {
      const v = values[i]!;
      if (Number.isFinite(v)) {
        if (v < lo) lo = v;
        if (v > hi) hi = v;
      }
    }
    const w = width - PAD.left - PAD.right, h = height - PAD.top - PAD.bottom;
    const cw = w / nx, ch = h / ny;
    for (let iy = 0; iy < ny; iy++) {
      for (let ix = 0; ix < nx; ix++) {
        const k = iy * nx + ix;
        const v = values[k]!;
        const x = PAD.left + ix * cw, y = PAD.top + (ny - 1 - iy) * ch;
        if (Number.isFinite(v)) {
          ctx.fillStyle = ramp(hi > lo ? (v - lo) / (hi - lo) : 0.5);
          ctx.fillRect(x, y, cw + 0.5, ch + 0.5);
        } else {
          ctx.fillStyle = "#F1EEE8";
          ctx.fillRect(x, y, cw + 0.5, ch + 0.5);
          if (failed?.has(k)) {
            ctx.strokeStyle = "#B91C1C";
            ctx.beginPath();
            ctx.moveTo(x + 2, y + 2); ctx.lineTo(x + cw - 2, y + ch - 2);
            ctx.moveTo(x + cw - 2, y + 2); ctx.lineTo(x + 2, y + ch - 2);
            ctx.stroke();
          }
        }
      }
    }
    ctx.strokeStyle = "#E2DED5";
    ctx.strokeRect(PAD.left, PAD.top, w, h);
    ctx.fillStyle = "#5B6472";
    ctx.font = '11px "Inter Variable", system-ui, sans-serif';
    ctx.textAlign = "center";
    const xt = Math.max(1, Math.ceil(nx / 6));
    for (let ix = 0; ix < nx; ix += xt) ctx.fillText(formatEng(xValues[ix]!, xUnit), PAD.left + (ix + 0.5) * cw, PAD.top + h + 14);
    ctx.fillText(xLabel, PAD.left + w / 2, height - 6);
    ctx.textAlign = "right";
    const yt = Math.max(1, Math.ceil(ny / 6));
    for (let iy = 0; iy < ny; iy += yt) ctx.fillText(formatEng(yValues[iy]!, yUnit), PAD.left - 4, PAD.top + (ny - 1 - iy + 0.5) * ch + 4);
    ctx.save();
    ctx.translate(12, PAD.top + h / 2);
    ctx.rotate(-Math.PI / 2);
    ctx.textAlign = "center";
    ctx.fillText(yLabel, 0, 0);
    ctx.restore();
    // colour bar
    if (Number.isFinite(lo)) {
      const bx = width - PAD.right + BAR.gap;
      for (let i = 0; i < h; i++) {
        ctx.fillStyle = ramp(1 - i / h);
        ctx.fillRect(bx, PAD.top + i, BAR.width, 1.5);
      }
      ctx.textAlign = "left";
      ctx.fillStyle = "#1C2430";
      ctx.fillText(formatEng(hi, metricUnit), bx + BAR.width + 3, PAD.top + 9);
      ctx.fillText(formatEng(lo, metricUnit), bx + BAR.width + 3, PAD.top + h);
    }
  }, [xValues, yValues, values, failed, width, height, xLabel, yLabel, xUnit, yUnit, metricUnit], { width, height });
  useImperativeHandle(ref, () => ({ toPng: () => canvas.current?.toDataURL("image/png") ?? null }));

  useEffect(() => {
    const el = canvas.current?.parentElement;
    if (!el) return;
    const ro = new ResizeObserver(() => setWidth(Math.max(300, el.clientWidth)));
    ro.observe(el);
    return () => ro.disconnect();
  }, [canvas]);

  const onMove = (e: React.MouseEvent<HTMLCanvasElement>) => {
    const r = e.currentTarget.getBoundingClientRect();
    const nx = xValues.length, ny = yValues.length;
    const w = width - PAD.left - PAD.right, h = height - PAD.top - PAD.bottom;
    const ix = Math.floor(((e.clientX - r.left - PAD.left) / w) * nx);
    const iy = ny - 1 - Math.floor(((e.clientY - r.top - PAD.top) / h) * ny);
    if (ix < 0 || iy < 0 || ix >= nx || iy >= ny) return setHover(null);
    const v = values[iy * nx + ix]!;
    setHover(`${xLabel} ${formatEng(xValues[ix]!, xUnit)}, ${yLabel} ${formatEng(yValues[iy]!, yUnit)}: ${metricLabel} ${Number.isFinite(v) ? formatEng(v, metricUnit) : "—"}`);
  };

  const plotW = width - PAD.left - PAD.right, plotH = height - PAD.top - PAD.bottom;
  return (
    <div className="w-full">
      <canvas
        ref={canvas}
        style={{ width: "100%", height }}
        role="img"
        aria-label={`Map of ${metricLabel} over ${xLabel} and ${yLabel}`}
        data-testid="map-canvas"
        // the grid ("nx ny") and where its cells and the colour bar lie, CSS px ("left top width height"): what a
        // reader of the painted pixels needs
        data-grid={`${xValues.length} ${yValues.length}`}
        data-cells-box={`${PAD.left} ${PAD.top} ${plotW} ${plotH}`}
        data-scale-box={`${width - PAD.right + BAR.gap} ${PAD.top} ${BAR.width} ${plotH}`}
        onMouseMove={onMove}
        onMouseLeave={() => setHover(null)}
      />
      <p className="num h-4 text-[11px] text-ink-muted">{hover ?? ""}</p>
    </div>
  );
});
