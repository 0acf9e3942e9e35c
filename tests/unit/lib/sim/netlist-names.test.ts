/**
 * Names of our own in the netlist (README, engine: netlist format): the piecewise-linear wave is
 * { "shape": "piecewise" }, and files written with its earlier name "pwl" still read, upgraded on parse; ground is
 * "gnd", and "0" still reads as ground.
 */
import { describe, expect, it } from "vitest";
import { readFileSync } from "node:fs";
import { parseNetlist, simulate, type Netlist } from "@/lib/sim";

const pts: [number, number][] = [[0, 0], [1e-4, 0], [2e-4, 1], [5e-4, 1]];
const rc = (shape: "piecewise" | "pwl", ground: string): Netlist => ({
  elements: [
    { kind: "vsource", name: "command", nodes: ["in", ground], wave: { shape, points: pts } },
    { kind: "resistor", name: "series", nodes: ["in", "out"], value: 1e3 },
    { kind: "capacitor", name: "hold", nodes: ["out", ground], value: 1e-8 },
  ],
  analysis: { kind: "tran", tStop: 1e-3, tStep: 1e-5 },
});

describe("netlist names", () => {
  it('a "pwl" wave is parsed as "piecewise", with the same points', () => {
    const el = parseNetlist(rc("pwl", "gnd")).elements[0];
    expect(el.kind === "vsource" && el.wave).toEqual({ shape: "piecewise", points: pts });
  });
  it('"pwl" and "piecewise", ground "0" and "gnd": the same transient, sample for sample', () => {
    const a = simulate(rc("piecewise", "gnd"));
    const b = simulate(rc("pwl", "0"));
    if (a.kind !== "tran" || b.kind !== "tran") throw new Error("expected transients");
    expect(Array.from(b.time)).toEqual(Array.from(a.time));
    expect(Array.from(b.nodes.out)).toEqual(Array.from(a.nodes.out));
    // the piecewise corner at 0.2 ms is an exact time point at the wave's value 1 V (README: corners are time points)
    expect(a.nodes.in[Array.from(a.time).indexOf(2e-4)]).toBe(1);
  });
  it("the example netlist writes ground as gnd", () => {
    const text = readFileSync("lib/sim/examples/reference-sink.json", "utf8");
    expect(text).not.toMatch(/"0"/);
    expect(parseNetlist(JSON.parse(text)).elements.some((e) => e.nodes.includes("gnd"))).toBe(true);
  });
});
