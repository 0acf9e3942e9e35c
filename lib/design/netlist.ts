/**
 * The engine's netlist contract as plain JSON types (see the engine's README section): what the templates emit.
 * The engine validates it again with its own zod schema (`parseNetlist`).
 */
export type Wave =
  | { shape: "pulse"; low: number; high: number; delay: number; rise: number; fall: number; width: number; period: number }
  | { shape: "sine"; offset: number; amplitude: number; freq: number; delay: number }
  | { shape: "pwl"; points: [number, number][] };

type Two = [string, string];

export type NetlistElementJson =
  | { kind: "resistor" | "capacitor" | "inductor"; name: string; nodes: Two; value: number; ic?: number }
  | { kind: "vsource" | "isource"; name: string; nodes: Two; dc: number; ac?: number; wave?: Wave }
  | { kind: "vcvs"; name: string; nodes: Two; control: Two; gain: number }
  | { kind: "vccs"; name: string; nodes: Two; control: Two; gm: number }
  | { kind: "switch"; name: string; nodes: Two; ron: number; roff: number; schedule: [number, "on" | "off"][]; transition?: number }
  | { kind: "diode"; name: string; nodes: Two; model: Record<string, number | null> }
  | { kind: "bjt"; name: string; nodes: [string, string, string]; polarity: "npn" | "pnp"; model: Record<string, number | null> }
  | { kind: "mosfet"; name: string; nodes: [string, string, string]; polarity: "n" | "p"; model: Record<string, number | null> }
  | { kind: "opamp"; name: string; nodes: [string, string, string, string, string]; model: Record<string, number | null> };

export type AnalysisJson =
  | { kind: "op" }
  | { kind: "dcsweep"; source: string; from: number; to: number; points: number }
  | { kind: "ac"; fStart: number; fStop: number; pointsPerDecade: number }
  | { kind: "tran"; tStop: number; tStep: number; maxStep: number | null; start: "op" | "ic" };

export interface NetlistJson {
  temperature?: number;
  elements: NetlistElementJson[];
  analysis: AnalysisJson;
  /** solver tolerances (the engine's addition to the contract) */
  options?: { reltol?: number; vntol?: number; abstol?: number };
}
