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

/** A sequential colour for a value in [0, 1]: a perceptually ordered ramp from deep blue through teal to yellow. */
export function ramp(t: number): string {
  const stops: [number, number, number][] = [
    [38, 24, 95], [43, 80, 140], [33, 145, 140], [94, 201, 98], [253, 231, 37],
  ];
  const x = Math.max(0, Math.min(1, t)) * (stops.length - 1);
  const i = Math.min(stops.length - 2, Math.floor(x));
  const f = x - i;
  const a = stops[i]!, b = stops[i + 1]!;
  const c = (k: 0 | 1 | 2) => Math.round(a[k] + f * (b[k] - a[k]));
  return `rgb(${c(0)},${c(1)},${c(2)})`;
}
