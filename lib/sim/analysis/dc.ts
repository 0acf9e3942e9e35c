/** Operating point and DC sweep. */
import type { Circuit, DeviceInfo } from "../circuit";
import { SimError } from "../errors";
import type { DcSweepResult, OpResult } from "../results";
import { checkpoint } from "../checkpoint";
import { solveDc } from "./newton";

export function opResult(c: Circuit): OpResult {
  const nodes: Record<string, number> = {};
  c.userNodeNames.forEach((name, i) => { nodes[name] = c.x[i]; });
  const currents: Record<string, number> = {};
  const devices: Record<string, DeviceInfo> = {};
  for (const el of c.elements) {
    currents[el.name] = el.current(c);
    const info = el.info(c);
    if (info) devices[el.name] = info;
  }
  return { kind: "op", nodes, currents, devices };
}

export function runOp(c: Circuit): OpResult {
  c.x.fill(0);
  c.useWaves = false;
  c.time = 0;
  solveDc(c, "the operating point");
  return opResult(c);
}

export function runDcSweep(c: Circuit, source: string, from: number, to: number, points: number, onProgress?: (f: number) => void): DcSweepResult {
  const src = c.elements.find((e) => e.name === source);
  if (!src) throw new SimError("invalid", `Invalid analysis: field "source" names "${source}", which is not in the netlist`);
  const sweep = new Float64Array(points);
  const nodes: Record<string, Float64Array> = {};
  const currents: Record<string, Float64Array> = {};
  for (const n of c.userNodeNames) nodes[n] = new Float64Array(points);
  for (const el of c.elements) currents[el.name] = new Float64Array(points);
  c.x.fill(0);
  c.useWaves = false;
  c.time = 0;
  try {
    for (let p = 0; p < points; p++) {
      checkpoint(c);
      const v = points === 1 ? from : from + ((to - from) * p) / (points - 1);
      sweep[p] = v;
      src.setSweepValue(v);
      // continuation: starts from the previous point's solution
      solveDc(c, `${source} = ${v.toPrecision(6)} in the DC sweep`);
      for (let i = 0; i < c.userNodeNames.length; i++) nodes[c.userNodeNames[i]][p] = c.x[i];
      for (const el of c.elements) currents[el.name][p] = el.current(c);
      if (onProgress && (p & 15) === 0) onProgress(p / points);
    }
  } finally {
    src.setSweepValue(null);
  }
  return { kind: "dcsweep", sweep, nodes, currents };
}
