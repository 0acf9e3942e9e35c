/** Result shapes of the four analyses (columnar Float64Arrays, ready to transfer to the main thread and plot). */
import type { DeviceInfo } from "./circuit";

export type { DeviceInfo };

export interface OpResult {
  kind: "op";
  /** V at each user node (ground excluded, internal nodes hidden) */
  nodes: Record<string, number>;
  /** A through each element (positive from nodes[0] through the element to nodes[1]; BJT: collector current;
   *  MOSFET: drain current; op-amp: output current out of the op-amp) */
  currents: Record<string, number>;
  devices: Record<string, DeviceInfo>;
}
export interface DcSweepResult {
  kind: "dcsweep";
  /** swept source value at each point (V or A) */
  sweep: Float64Array;
  nodes: Record<string, Float64Array>;
  currents: Record<string, Float64Array>;
}
export interface ComplexColumn { re: Float64Array; im: Float64Array }
export interface AcResult {
  kind: "ac";
  /** Hz, log-spaced */
  freq: Float64Array;
  nodes: Record<string, ComplexColumn>;
  currents: Record<string, ComplexColumn>;
}
export interface TranResult {
  kind: "tran";
  /** s, the accepted time points (every breakpoint included exactly) */
  time: Float64Array;
  nodes: Record<string, Float64Array>;
  currents: Record<string, Float64Array>;
  stats: { accepted: number; rejected: number; newtonIterations: number };
}
export interface NoiseResult {
  kind: "noise";
  /** "V" for a node output (densities in V/√Hz), "A" for a vsource current (A/√Hz) */
  outputUnit: "V" | "A";
  /** Hz, log-spaced */
  freq: Float64Array;
  /** output noise density, V/√Hz or A/√Hz */
  outputDensity: Float64Array;
  /** output density divided by |transfer from the named input|, in the input's unit per √Hz; null without an input */
  inputReferredDensity: Float64Array | null;
  /** element name → its share of the output density (root of the sum of its sources' densities²), per frequency */
  contributions: Record<string, Float64Array>;
  /** element name → its RMS contribution over the band (the squares add up to integrated.rms²) */
  contributionRms: Record<string, number>;
  /** output RMS noise over [fStart, fStop] (the analysis' first and last frequency) */
  integrated: { rms: number; fStart: number; fStop: number };
}
export type SimResult = OpResult | DcSweepResult | AcResult | TranResult | NoiseResult;

const arr = (a: Float64Array) => Array.from(a);
const cols = (r: Record<string, Float64Array>) => Object.fromEntries(Object.entries(r).map(([k, v]) => [k, arr(v)]));
const ccols = (r: Record<string, ComplexColumn>) =>
  Object.fromEntries(Object.entries(r).map(([k, v]) => [k, { re: arr(v.re), im: arr(v.im) }]));

/** Plain-JSON form (arrays instead of Float64Arrays) for the CLI and storage. */
export function resultToJSON(r: SimResult): unknown {
  switch (r.kind) {
    case "op": return r;
    case "dcsweep": return { kind: r.kind, sweep: arr(r.sweep), nodes: cols(r.nodes), currents: cols(r.currents) };
    case "ac": return { kind: r.kind, freq: arr(r.freq), nodes: ccols(r.nodes), currents: ccols(r.currents) };
    case "tran": return { kind: r.kind, time: arr(r.time), nodes: cols(r.nodes), currents: cols(r.currents), stats: r.stats };
    case "noise": return {
      kind: r.kind, outputUnit: r.outputUnit, freq: arr(r.freq), outputDensity: arr(r.outputDensity),
      inputReferredDensity: r.inputReferredDensity === null ? null : arr(r.inputReferredDensity),
      contributions: cols(r.contributions), contributionRms: r.contributionRms, integrated: r.integrated,
    };
  }
}
