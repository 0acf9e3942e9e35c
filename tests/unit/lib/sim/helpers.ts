/** Shared test helpers for the engine tests. */
import { simulate, type Netlist, type SimResult, type TranResult, type AcResult, type OpResult, type DcSweepResult } from "@/lib/sim";

export function runTran(n: Netlist): TranResult {
  const r: SimResult = simulate(n);
  if (r.kind !== "tran") throw new Error(`expected tran, got ${r.kind}`);
  return r;
}
export function runAc(n: Netlist): AcResult {
  const r = simulate(n);
  if (r.kind !== "ac") throw new Error(`expected ac, got ${r.kind}`);
  return r;
}
export function runOp(n: Netlist): OpResult {
  const r = simulate(n);
  if (r.kind !== "op") throw new Error(`expected op, got ${r.kind}`);
  return r;
}
export function runSweep(n: Netlist): DcSweepResult {
  const r = simulate(n);
  if (r.kind !== "dcsweep") throw new Error(`expected dcsweep, got ${r.kind}`);
  return r;
}

/** Value of a column at an exact time point of the result (the time must be one of the accepted points). */
export function at(r: TranResult, col: Float64Array, t: number): number {
  let best = 0;
  for (let i = 1; i < r.time.length; i++) if (Math.abs(r.time[i] - t) < Math.abs(r.time[best] - t)) best = i;
  if (Math.abs(r.time[best] - t) > 1e-15 * Math.max(1, t) + 1e-18) throw new Error(`time ${t} is not an accepted point (nearest ${r.time[best]})`);
  return col[best];
}

/**
 * A zero-valued PWL source on its own node whose corners force the transient to land exactly on the given times
 * (breakpoints), so closed forms can be compared at those instants without interpolation.
 */
export function markers(times: number[]): Netlist["elements"] {
  return [
    { kind: "vsource", name: "Vmark", nodes: ["mark", "0"], wave: { shape: "piecewise", points: times.map((t) => [t, 0] as [number, number]) } },
    { kind: "resistor", name: "Rmark", nodes: ["mark", "0"], value: 1 },
  ];
}

/** Thermal voltage kT/q at 300 K with the 2019 SI constants (docs/references.md §1.2: 25.852000 mV). */
export const VT300 = (1.380649e-23 * 300) / 1.602176634e-19;
/** °C for 300 K */
export const T300C = 300 - 273.15;
