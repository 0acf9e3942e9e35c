/** Okabe–Ito colour-blind-safe palette (Okabe & Ito, 2008), in the order traces take them. */
export const OKABE_ITO = ["#0072B2", "#D55E00", "#009E73", "#CC79A7", "#E69F00", "#56B4E9", "#F0E442", "#000000"] as const;

/** Opacity of the previous run's ghost trace (design language: about 35 %). */
export const GHOST_ALPHA = 0.35;
export const GHOST_DASH = [5, 4];

export const AXIS = {
  stroke: "#5B6472",
  grid: { stroke: "#ECE9E2", width: 1 },
  ticks: { stroke: "#E2DED5", width: 1 },
  font: '11px "Inter Variable", system-ui, sans-serif',
  labelFont: '11px "Inter Variable", system-ui, sans-serif',
};

/**
 * Quell's sequential scale for maps (design language): paper to ink through the signal teal,
 * #F7F5F0 → #CFE8E4 → #5FB3A8 → #0F766E → #0B3B3A, interpolated linearly in sRGB between the stops.
 */
export const MAP_STOPS = ["#F7F5F0", "#CFE8E4", "#5FB3A8", "#0F766E", "#0B3B3A"] as const;

const STOP_RGB: [number, number, number][] = MAP_STOPS.map((h) => [parseInt(h.slice(1, 3), 16), parseInt(h.slice(3, 5), 16), parseInt(h.slice(5, 7), 16)]);

/** The map colour of a value in [0, 1] on Quell's sequential scale (0 = paper, 1 = deep teal). */
export function ramp(t: number): string {
  const x = Math.max(0, Math.min(1, Number.isFinite(t) ? t : 0)) * (STOP_RGB.length - 1);
  const i = Math.min(STOP_RGB.length - 2, Math.floor(x));
  const f = x - i;
  const a = STOP_RGB[i]!, b = STOP_RGB[i + 1]!;
  const c = (k: 0 | 1 | 2) => Math.round(a[k] + f * (b[k] - a[k]));
  return `rgb(${c(0)},${c(1)},${c(2)})`;
}
