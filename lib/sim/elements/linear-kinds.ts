/** Netlist schemas and topology rules of the linear kinds (kind.ts), beside their elements in linear.ts. */
import { z } from "zod";
import { finite, name, noiseless, nonNegative, positive, two, waveSchema, type Wave } from "../fields";
import { defineKind } from "../kind";
import { Capacitor, Inductor, ISource, Resistor, Switch, Vccs, Vcvs, VSource } from "./linear";

/** A piecewise wave's times must not go back. */
function checkWave(wave: Wave | null): string | null {
  if (wave?.shape !== "piecewise") return null;
  const p = wave.points;
  for (let i = 1; i < p.length; i++) {
    if (p[i][0] < p[i - 1][0]) return `field "wave.points" times must be non-decreasing (point ${i})`;
  }
  return null;
}

export const resistorKind = defineKind("resistor", z.object({ kind: z.literal("resistor"), name, nodes: two, value: positive(), noiseless }), {
  create: (e) => new Resistor(e.name, e.nodes, e.value),
  dcPaths: (e) => [[e.nodes[0], e.nodes[1]]],
});

export const capacitorKind = defineKind("capacitor", z.object({
  kind: z.literal("capacitor"), name, nodes: two, value: nonNegative(),
  /** initial volts, used when the transient starts from initial conditions */
  ic: finite().default(0),
}), {
  create: (e) => new Capacitor(e.name, e.nodes, e.value, e.ic),
  dcPaths: () => [],
});

export const inductorKind = defineKind("inductor", z.object({
  kind: z.literal("inductor"), name, nodes: two, value: positive(),
  /** initial amps, used when the transient starts from initial conditions */
  ic: finite().default(0),
}), {
  create: (e) => new Inductor(e.name, e.nodes, e.value, e.ic),
  dcPaths: (e) => [[e.nodes[0], e.nodes[1]]],
  voltageBranches: (e) => [[e.nodes[0], e.nodes[1]]],
});

export const vsourceKind = defineKind("vsource", z.object({
  kind: z.literal("vsource"), name, nodes: two, dc: finite().default(0), ac: finite().default(0),
  /** AC phase in degrees (addition to the contract; default 0) */
  acPhase: finite().default(0),
  wave: waveSchema.nullable().default(null),
}), {
  create: (e) => new VSource(e.name, e.nodes, e.dc, e.ac, e.acPhase, e.wave),
  dcPaths: (e) => [[e.nodes[0], e.nodes[1]]],
  voltageBranches: (e) => [[e.nodes[0], e.nodes[1]]],
  check: (e) => checkWave(e.wave),
  sweepable: true,
});

export const isourceKind = defineKind("isource", z.object({
  kind: z.literal("isource"), name, nodes: two, dc: finite().default(0), ac: finite().default(0),
  acPhase: finite().default(0),
  wave: waveSchema.nullable().default(null),
}), {
  create: (e) => new ISource(e.name, e.nodes, e.dc, e.ac, e.acPhase, e.wave),
  dcPaths: () => [],
  check: (e) => checkWave(e.wave),
  sweepable: true,
});

export const vcvsKind = defineKind("vcvs", z.object({ kind: z.literal("vcvs"), name, nodes: two, control: two, gain: finite() }), {
  create: (e) => new Vcvs(e.name, e.nodes, e.control, e.gain),
  dcPaths: (e) => [[e.nodes[0], e.nodes[1]]],
  voltageBranches: (e) => [[e.nodes[0], e.nodes[1]]],
  terminals: (e) => [...e.nodes, ...e.control],
});

export const vccsKind = defineKind("vccs", z.object({ kind: z.literal("vccs"), name, nodes: two, control: two, gm: finite() }), {
  create: (e) => new Vccs(e.name, e.nodes, e.control, e.gm),
  dcPaths: () => [],
  terminals: (e) => [...e.nodes, ...e.control],
});

export const switchKind = defineKind("switch", z.object({
  kind: z.literal("switch"), name, nodes: two, ron: positive().default(0.01), roff: positive().default(1e9),
  /** [time s, "on" | "off"]; the state before the first entry is "off" */
  schedule: z.array(z.tuple([nonNegative(), z.enum(["on", "off"])])).default([]),
  /** s for a change of state (log-interpolated resistance); 0 is treated as 1 ns */
  transition: nonNegative().default(1e-6),
}), {
  create: (e) => new Switch(e.name, e.nodes, e.ron, e.roff, e.schedule, e.transition),
  dcPaths: (e) => [[e.nodes[0], e.nodes[1]]],
  check: (e) => {
    for (let i = 1; i < e.schedule.length; i++) {
      if (e.schedule[i][0] < e.schedule[i - 1][0]) return `field "schedule" times must be non-decreasing (entry ${i})`;
    }
    return null;
  },
});
