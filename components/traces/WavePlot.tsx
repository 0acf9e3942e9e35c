/**
 * A waveform plot drawn as SVG from columnar arrays: prints sharply (the review page is a document) and needs no
 * canvas. Each series is reduced to min/max per pixel column, so a 250 000-sample capture draws a few hundred points.
 */
import { formatEng } from "@/lib/units/eng";

export interface WaveSeries {
  label: string;
  time: Float64Array;
  values: Float64Array;
  color: string;
  dashed?: boolean;
}

export interface WavePlotProps {
  series: WaveSeries[];
  yUnit: string;
  /** Shown time range, s; defaults to the union of the series. */
  xRange?: [number, number];
  width?: number;
  height?: number;
  title?: string;
  testId?: string;
  /** Vertical marker lines, in x units. */
  markers?: { t: number; label: string }[];
  /** Logarithmic x axis (frequency plots); x values must be positive. */
  logX?: boolean;
  /** Unit of the x axis (default "s"). */
  xUnit?: string;
}

const PAD = { left: 58, right: 28, top: 10, bottom: 30 };

/** Min/max per pixel column: the polyline keeps every peak a full-resolution drawing would show. */
function decimate(time: Float64Array, values: Float64Array, x0: number, x1: number, columns: number): [number, number][] {
  const out: [number, number][] = [];
  const span = x1 - x0;
  if (!(span > 0)) return out;
  let col = -1;
  let lo = Infinity, hi = -Infinity, loT = 0, hiT = 0;
  const flush = () => {
    if (col < 0) return;
    if (loT <= hiT) { out.push([loT, lo]); if (hiT !== loT) out.push([hiT, hi]); }
    else { out.push([hiT, hi]); out.push([loT, lo]); }
  };
  for (let i = 0; i < time.length; i++) {
    const t = time[i];
    if (t < x0 || t > x1) continue;
    const c = Math.floor(((t - x0) / span) * columns);
    if (c !== col) { flush(); col = c; lo = Infinity; hi = -Infinity; }
    const v = values[i];
    if (v < lo) { lo = v; loT = t; }
    if (v > hi) { hi = v; hiT = t; }
  }
  flush();
  return out;
}

function niceTicks(lo: number, hi: number, count: number): number[] {
  const span = hi - lo;
  if (!(span > 0)) return [lo];
  const raw = span / count;
  const mag = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 5, 10].map((m) => m * mag).find((s) => s >= raw) ?? 10 * mag;
  const ticks: number[] = [];
  for (let v = Math.ceil(lo / step) * step; v <= hi + step * 1e-9; v += step) ticks.push(Math.abs(v) < step * 1e-9 ? 0 : v);
  return ticks;
}

export function WavePlot({ series, yUnit, xRange, width = 640, height = 220, title, testId, markers = [], logX = false, xUnit = "s" }: WavePlotProps) {
  // A log axis is a linear axis in log10(x): transform once, label in x.
  const live = series
    .filter((s) => s.time.length > 1)
    .map((s) => (logX ? { ...s, time: Float64Array.from(s.time, (x) => Math.log10(x)) } : s));
  let x0 = Infinity, x1 = -Infinity;
  if (xRange) [x0, x1] = logX ? [Math.log10(xRange[0]), Math.log10(xRange[1])] : xRange;
  else for (const s of live) { x0 = Math.min(x0, s.time[0]); x1 = Math.max(x1, s.time[s.time.length - 1]); }
  const innerW = width - PAD.left - PAD.right;
  const innerH = height - PAD.top - PAD.bottom;
  const lines = live.map((s) => ({ s, pts: decimate(s.time, s.values, x0, x1, Math.max(50, Math.round(innerW))) }));
  let y0 = Infinity, y1 = -Infinity;
  for (const l of lines) for (const [, v] of l.pts) { if (v < y0) y0 = v; if (v > y1) y1 = v; }
  if (!Number.isFinite(y0)) { y0 = 0; y1 = 1; }
  if (y1 - y0 < 1e-12) { y0 -= 0.5; y1 += 0.5; }
  const margin = 0.06 * (y1 - y0);
  y0 -= margin; y1 += margin;
  const X = (t: number) => PAD.left + ((t - x0) / (x1 - x0)) * innerW;
  const Y = (v: number) => PAD.top + (1 - (v - y0) / (y1 - y0)) * innerH;
  const xt = !(Number.isFinite(x0) && x1 > x0) ? [] : logX ? niceTicks(Math.ceil(x0), Math.floor(x1), Math.min(8, Math.floor(x1) - Math.ceil(x0))).filter((d) => Number.isInteger(d)) : niceTicks(x0, x1, 6);
  const yt = niceTicks(y0, y1, 5);
  return (
    <figure className="wave-plot" data-testid={testId}>
      {title && <figcaption className="mb-1 text-sm font-medium text-ink">{title}</figcaption>}
      <svg viewBox={`0 0 ${width} ${height}`} width="100%" role="img" aria-label={title ?? "Waveforms"} className="block max-w-full bg-white">
        <rect x={PAD.left} y={PAD.top} width={innerW} height={innerH} fill="white" stroke="#E2DED5" />
        {xt.map((t) => (
          <g key={`x${t}`}>
            <line x1={X(t)} x2={X(t)} y1={PAD.top} y2={PAD.top + innerH} stroke="#EEEBE4" />
            <text x={X(t)} y={height - 12} fontSize={10} textAnchor="middle" fill="#5B6472" className="num">{formatEng(logX ? 10 ** t : t, xUnit, 3)}</text>
          </g>
        ))}
        {yt.map((v) => (
          <g key={`y${v}`}>
            <line x1={PAD.left} x2={PAD.left + innerW} y1={Y(v)} y2={Y(v)} stroke="#EEEBE4" />
            <text x={PAD.left - 4} y={Y(v) + 3} fontSize={10} textAnchor="end" fill="#5B6472" className="num">{formatEng(v, yUnit, 3)}</text>
          </g>
        ))}
        {markers.map((m) => (
          <g key={`m${m.label}`}>
            <line x1={X(logX ? Math.log10(m.t) : m.t)} x2={X(logX ? Math.log10(m.t) : m.t)} y1={PAD.top} y2={PAD.top + innerH} stroke="#5B6472" strokeDasharray="2 3" />
            <text x={X(logX ? Math.log10(m.t) : m.t) + 3} y={PAD.top + 10} fontSize={9} fill="#5B6472">{m.label}</text>
          </g>
        ))}
        {lines.map(({ s, pts }) => (
          <polyline
            key={s.label}
            fill="none"
            stroke={s.color}
            strokeWidth={1.5}
            strokeDasharray={s.dashed ? "5 4" : undefined}
            points={pts.map(([t, v]) => `${X(t).toFixed(1)},${Y(v).toFixed(1)}`).join(" ")}
          />
        ))}
      </svg>
      <ul className="mt-1 flex flex-wrap gap-4 text-xs text-ink-muted">
        {live.map((s) => (
          <li key={s.label} className="flex items-center gap-1">
            <svg width="18" height="6" aria-hidden><line x1="0" x2="18" y1="3" y2="3" stroke={s.color} strokeWidth="2" strokeDasharray={s.dashed ? "5 3" : undefined} /></svg>
            {s.label}
          </li>
        ))}
      </ul>
    </figure>
  );
}
