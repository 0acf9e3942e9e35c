/**
 * Templates → engine netlists. One builder per template; the load, cable, supplies and stimulus are shared.
 *
 * Elements get descriptive names of our own (the netlist's `kind` already says what each is). Fixed names the runners
 * rely on (see `NAMES`): the command source "command", the load-current meter "load-meter" (a 0 V source in series
 * with the load whose current is positive in the regulated direction), the op-amp "amplifier" with its output at
 * node "oa", the pass device "pass" with its collector/drain at node "c", ground "gnd", and for loop gain the probe
 * pair "probe-series"/"probe-shunt" in the wire of the loop being broken (see CompileOptions.loop).
 *
 * Optional networks (scenario.networks, load.clamp), each only when fitted:
 *  - load snubber: "load-snubber-r" from the load's terminal the current enters (sinks: the load supply "vs"; sources:
 *    "lt") to node "lsn", "load-snubber-c" from "lsn" to the other terminal (across the load at the far end of the
 *    cable, beside "load-c");
 *  - pass snubber: "pass-snubber-r" from the collector/drain "c" to "psn", "pass-snubber-c" from "psn" to the
 *    emitter/source "e" (Darlington: across the pair);
 *  - "base-emitter-resistor" (MOSFET: "gate-source-resistor") from "b" to "e", after the drive resistor, so the
 *    current loop's break between "oa" and the drive resistor stays where it is;
 *  - "feedback-capacitor" from "e" to "inv" across the feedback resistor (the compensation capacitor is "oa"–"inv");
 *  - coil clamp: "clamp" (freewheel diode, anode at the pass-device side of the coil) and for "diode-zener" also
 *    "clamp-zener" in series (node "lz"), a diode with breakdown BV = zenerVoltage conducting in reverse.
 */
import type { AnalysisJson, NetlistElementJson, NetlistJson, Wave } from "./netlist";
import { CLAMP_DIODE, usesGateDrive } from "./networks";
import type { Scenario } from "./schema";

export type CompilePurpose = "op" | "step" | "loopgain-v" | "loopgain-i" | "closedloop" | "zout" | "dcsweep";

export interface CompileOptions {
  /** AC sweep: start and stop frequency, Hz, and points per decade */
  fStart?: number;
  fStop?: number;
  pointsPerDecade?: number;
  /** dcsweep: points */
  sweepPoints?: number;
  /** transient: suggested output step, s */
  tStep?: number;
  /** transient: largest internal step, s (default stopTime/200) */
  maxStep?: number;
  /**
   * loop gain: which loop the probe breaks. "current" (default) cuts the wire from the op-amp's output node to the
   * base/gate resistor, which only the current loop passes through (the compensation capacitor's local loop around
   * the op-amp stays closed); "local" cuts the op-amp's output pin, which every loop passes through. For the
   * improved Howland pump every loop passes through the output pin, so both name that break.
   */
  loop?: LoopName;
}

/** The loops a loop-gain probe can break (see CompileOptions.loop). */
export type LoopName = "current" | "local";

export const NAMES = {
  command: "command",
  ammeter: "load-meter",
  probeV: "probe-series",
  probeI: "probe-shunt",
  opamp: "amplifier",
  /** the source-side terminal of the load path (after the cable) */
  nodeTerminal: "lw",
  loadSupply: "load-supply",
  sense: "sense",
  /** the pass device (the output transistor of a Darlington pair) and the Darlington's driver */
  pass: "pass",
  driver: "driver",
  /** the base/gate resistor from the op-amp's output */
  driveResistor: "drive-resistor",
  /** ground, as every netlist we generate writes it (the engine also reads "0") */
  ground: "gnd",
  nodeOpampOut: "oa",
  nodeOpampPin: "oa_i",
  /** the base/gate resistor's op-amp-side end when the current loop is probed */
  nodeDrive: "oa_r",
  nodePass: "c",
  nodeCommand: "cmd",
} as const;


/** Networks around the pass device and the feedback resistor (sinks and the high-side source). */
function passNetworks(b: Builder): void {
  const n = b.s.networks;
  if (n.passSnubber) {
    res(b, "pass-snubber-r", NAMES.nodePass, "psn", n.passSnubber.resistance);
    add(b, { kind: "capacitor", name: "pass-snubber-c", nodes: ["psn", "e"], value: n.passSnubber.capacitance });
  }
  if (n.baseEmitterResistor !== null) {
    res(b, usesGateDrive(b.s) ? "gate-source-resistor" : "base-emitter-resistor", "b", "e", n.baseEmitterResistor);
  }
  if (n.feedbackCapacitor !== null) add(b, { kind: "capacitor", name: "feedback-capacitor", nodes: ["e", "inv"], value: n.feedbackCapacitor });
}


const AC_DEFAULT = { fStart: 10, fStop: 10e6, pointsPerDecade: 20 };

/** The command the small-signal analyses and the operating point are taken at, V. */
export function operatingCommand(s: Scenario): number {
  return s.stimulus.commandHigh;
}

/** Ideal transfer Iload/Vcommand, A/V: k/Rsense for the divider templates, R2/(R1·Rs) for the Howland pump. */
export function idealTransconductance(s: Scenario): number {
  const p = s.parts;
  if (s.template === "howland") return p.howlandR2 / (p.howlandR1 * p.senseResistor);
  return dividerRatio(s) / p.senseResistor;
}

/** Command divider ratio k = Rbottom/(Rtop + Rbottom). */
export function dividerRatio(s: Scenario): number {
  return s.parts.dividerBottom / (s.parts.dividerTop + s.parts.dividerBottom);
}

/** Total series resistance of the cable loop (two conductors), Ω. */
export function cableResistance(s: Scenario): number {
  const c = s.load.cable;
  return 2 * c.length * c.rPerM;
}

function isSink(s: Scenario): boolean {
  return s.template === "sink-npn" || s.template === "sink-darlington" || s.template === "sink-nmos";
}

/** Estimated DC voltage across the load network (hi − lo) at current i, V. */
export function loadDrop(s: Scenario, i: number, resistance = s.load.resistance): number {
  const L = s.load;
  const vt = thermalVoltage(s.thermal.ambient);
  switch (L.kind) {
    case "resistor":
    case "coil":
      return i * resistance;
    case "led": {
      const a = Math.abs(i);
      const vd = a > 0 ? L.ledCount * L.ledN * vt * Math.log(a / L.ledIs + 1) : 0;
      return Math.sign(i) * vd + i * resistance;
    }
    case "cell":
      // A sink discharges the cell (it drives current), a source charges it (it opposes current).
      return isSink(s) ? -L.cellVoltage + i * resistance : L.cellVoltage + i * resistance;
  }
}

/** kT/q at a temperature in °C, with the exact 2019 SI constants. */
export function thermalVoltage(tempC: number): number {
  return (1.380649e-23 * (tempC + 273.15)) / 1.602176634e-19;
}

interface Builder {
  els: NetlistElementJson[];
  s: Scenario;
  purpose: CompilePurpose;
  opts: CompileOptions;
}

function add(b: Builder, e: NetlistElementJson): void {
  b.els.push(e);
}

function res(b: Builder, name: string, n1: string, n2: string, value: number): void {
  add(b, { kind: "resistor", name, nodes: [n1, n2], value });
}

function pieceStep(low: number, high: number, t0: number, edge: number): Wave {
  return { shape: "piecewise", points: [[0, low], [t0, low], [t0 + edge, high]] };
}

/** Command source (with its output resistance) driving node "cmd" relative to `ref`. */
function commandSource(b: Builder, plus: string, minus: string): void {
  const { s, purpose } = b;
  const st = s.stimulus;
  const dcOp = operatingCommand(s);
  let dc = dcOp;
  let wave: Wave | undefined;
  let ac: number | undefined;
  if (purpose === "step") {
    if (st.kind === "command-step") {
      dc = st.commandLow;
      wave = pieceStep(st.commandLow, st.commandHigh, st.stepTime, st.edgeTime);
    } else if (st.kind === "command-ramp") {
      dc = st.commandLow;
      wave = pieceStep(st.commandLow, st.commandHigh, st.stepTime, st.rampTime);
    }
  }
  if (purpose === "closedloop") ac = 1;
  const out = st.sourceResistance > 0 ? "cmd_s" : plus;
  const src: NetlistElementJson = { kind: "vsource", name: NAMES.command, nodes: [out, minus], dc };
  if (wave) src.wave = wave;
  if (ac !== undefined) src.ac = ac;
  add(b, src);
  if (st.sourceResistance > 0) res(b, "command-source-r", out, plus, st.sourceResistance);
}

function supplySource(b: Builder, name: string, node: string, value: number, steps: boolean): void {
  const { s, purpose } = b;
  const st = s.stimulus;
  const src: NetlistElementJson = { kind: "vsource", name, nodes: [node, NAMES.ground], dc: value };
  if (purpose === "step" && st.kind === "power-up") {
    src.dc = 0;
    src.wave = pieceStep(0, value, st.stepTime, Math.max(st.edgeTime, st.rampTime));
  } else if (purpose === "step" && steps && st.kind === "supply-step") {
    src.wave = pieceStep(value, value + st.supplyStep, st.stepTime, st.edgeTime);
  }
  add(b, src);
}

/** Op-amp with its supplies; its output pin is "oa_i" when probed, else "oa". */
function opamp(b: Builder, inp: string, inn: string): void {
  const { s, purpose } = b;
  const o = s.opamp;
  supplySource(b, "amp-supply-pos", "vcc", s.supplies.opampPositive, false);
  let vee: string = NAMES.ground;
  if (s.supplies.opampNegative < 0) {
    supplySource(b, "amp-supply-neg", "vee", s.supplies.opampNegative, false);
    vee = "vee";
  }
  const probed = probedLoop(b) === "local";
  const pin = probed ? NAMES.nodeOpampPin : NAMES.nodeOpampOut;
  add(b, {
    kind: "opamp",
    name: NAMES.opamp,
    nodes: [inp, inn, pin, "vcc", vee],
    model: {
      Aol: o.Aol, GBW: o.GBW, fp2: o.fp2, Rout: o.Rout, slewRate: o.slewRate, Vos: o.Vos, Ib: o.Ib,
      swingHigh: o.swingHigh, swingLow: o.swingLow, Iout: o.Iout,
    },
  });
  if (probed) probe(b, NAMES.nodeOpampPin, NAMES.nodeOpampOut);
}

/** Which loop this netlist probes (null: no probe). The Howland pump's loops all pass through the output pin. */
function probedLoop(b: Builder): LoopName | null {
  if (b.purpose !== "loopgain-v" && b.purpose !== "loopgain-i") return null;
  if (b.s.template === "howland") return "local";
  return b.opts.loop ?? "current";
}

/**
 * Two-injection probe in the wire from `driver` to `driven`: a series voltage source, v(driven) = v(driver) + Vi,
 * and a shunt current source injecting into `driven`.
 */
function probe(b: Builder, driver: string, driven: string): void {
  add(b, { kind: "vsource", name: NAMES.probeV, nodes: [driven, driver], dc: 0, ac: b.purpose === "loopgain-v" ? 1 : 0 });
  add(b, { kind: "isource", name: NAMES.probeI, nodes: [NAMES.ground, driven], dc: 0, ac: b.purpose === "loopgain-i" ? 1 : 0 });
}

/** Node where the probe's injections are read: the driven side of the break. */
export function probeNode(s: Scenario, loop: LoopName): string {
  return s.template !== "howland" && loop === "current" ? NAMES.nodeDrive : NAMES.nodeOpampOut;
}

/** The base/gate resistor from the op-amp's output; with the current loop probed, the probe sits in front of it. */
function driveResistor(b: Builder): void {
  let from: string = NAMES.nodeOpampOut;
  if (probedLoop(b) === "current") {
    probe(b, NAMES.nodeOpampOut, NAMES.nodeDrive);
    from = NAMES.nodeDrive;
  }
  res(b, NAMES.driveResistor, from, "b", b.s.parts.baseResistor);
}

type ModelOf<K extends NetlistElementJson["kind"]> = NonNullable<Extract<NetlistElementJson, { kind: K }> extends { model?: infer M } ? M : never>;

function bjtModel(s: Scenario, scale = 1): ModelOf<"bjt"> {
  const p = s.pass;
  return {
    Is: p.Is * scale, betaF: p.betaF, betaR: p.betaR, VA: p.VA,
    Cje0: p.Cje0 * scale, Cjc0: p.Cjc0 * scale, tauF: p.tauF,
  };
}

function mosModel(s: Scenario): ModelOf<"mosfet"> {
  const p = s.pass;
  return { Vth: p.Vth, K: p.K, lambda: p.lambda, Cgs: p.Cgs, Cgd: p.Cgd };
}

/**
 * The load path from the pass-device terminal "c" through the cable, the ammeter and the load to the far side.
 * `sink`: current flows from the load supply through the load into "c"; otherwise out of "c" into the load.
 */
function loadPath(b: Builder, sink: boolean, farNode: string): void {
  const { s, purpose } = b;
  const L = s.load;
  const cab = L.cable;
  // Cable: `sections` lumped R–L sections, shunt C at each section's pass-side end to the far conductor.
  let near: string = NAMES.nodePass;
  if (cab.length > 0) {
    const n = cab.sections;
    const rSec = cableResistance(s) / n;
    const lSec = (cab.length * cab.lPerM) / n;
    const cSec = (cab.length * cab.cPerM) / n;
    for (let k = 0; k < n; k++) {
      const a = k === 0 ? NAMES.nodePass : `cab${k}`;
      const mid = `cabm${k}`;
      const z = k === n - 1 ? "lw" : `cab${k + 1}`;
      if (lSec > 0) {
        res(b, `cable-r${k}`, a, mid, Math.max(rSec, 1e-6));
        add(b, { kind: "inductor", name: `cable-l${k}`, nodes: [mid, z], value: lSec });
      } else {
        res(b, `cable-r${k}`, a, z, Math.max(rSec, 1e-6));
      }
      if (cSec > 0) add(b, { kind: "capacitor", name: `cable-c${k}`, nodes: [a, farNode], value: cSec });
    }
    near = "lw";
  }
  // Ammeter: positive in the regulated direction. For the output impedance it also carries the 1 V AC test
  // signal in series with the load, so the operating point is the normal one (see runOutputImpedance).
  const ammeter: NetlistElementJson = { kind: "vsource", name: NAMES.ammeter, nodes: sink ? ["lt", near] : [near, "lt"], dc: 0 };
  if (purpose === "zout") ammeter.ac = 1;
  add(b, ammeter);
  const hi = sink ? farNode : "lt";
  const lo = sink ? "lt" : farNode;
  const rLoad = Math.max(L.resistance, 1e-6);
  switch (L.kind) {
    case "resistor":
      res(b, "load-r", hi, lo, rLoad);
      break;
    case "coil":
      res(b, "load-r", hi, "lc", rLoad);
      if (L.inductance > 0) add(b, { kind: "inductor", name: "load-l", nodes: ["lc", lo], value: L.inductance });
      else res(b, "load-link", "lc", lo, 1e-6);
      if (L.clamp.kind === "diode") add(b, { kind: "diode", name: "clamp", nodes: [lo, hi], model: CLAMP_DIODE });
      if (L.clamp.kind === "diode-zener") {
        add(b, { kind: "diode", name: "clamp", nodes: [lo, "lz"], model: CLAMP_DIODE });
        add(b, { kind: "diode", name: "clamp-zener", nodes: [hi, "lz"], model: { ...CLAMP_DIODE, BV: L.clamp.zenerVoltage } });
      }
      break;
    case "led":
      // N identical diodes in series carry the same current, so V = N·n·Vt·ln(I/Is + 1): exactly one diode with
      // emission coefficient N·n. One element instead of N keeps the matrix small.
      add(b, { kind: "diode", name: "led-string", nodes: [hi, "ld"], model: { Is: L.ledIs, n: L.ledN * L.ledCount } });
      res(b, "load-r", "ld", lo, rLoad);
      break;
    case "cell":
      // A sink discharges the cell: its + terminal faces the sink. A source charges it: + faces the source.
      if (sink) add(b, { kind: "vsource", name: "cell", nodes: ["lcell", hi], dc: L.cellVoltage });
      else add(b, { kind: "vsource", name: "cell", nodes: ["lcell", lo], dc: L.cellVoltage });
      if (sink) res(b, "load-r", "lcell", lo, rLoad);
      else res(b, "load-r", hi, "lcell", rLoad);
      break;
  }
  if (L.extraCapacitance > 0) add(b, { kind: "capacitor", name: "load-c", nodes: [hi, lo], value: L.extraCapacitance });
  const snub = s.networks.loadSnubber;
  if (snub) {
    res(b, "load-snubber-r", hi, "lsn", snub.resistance);
    add(b, { kind: "capacitor", name: "load-snubber-c", nodes: ["lsn", lo], value: snub.capacitance });
  }
  if (s.stimulus.kind === "load-step") {
    const t0 = purpose === "step" ? s.stimulus.stepTime : Number.MAX_SAFE_INTEGER;
    res(b, "step-r", hi, "ls", s.load.stepResistance);
    add(b, {
      kind: "switch", name: "step-switch", nodes: ["ls", lo], ron: 1e-3, roff: 1e9,
      schedule: purpose === "step" ? [[0, "off"], [t0, "on"]] : [[0, "off"]],
      transition: s.stimulus.edgeTime,
    });
  }
}

/** Low-side sinks (NPN, Darlington, N-MOSFET). */
function buildSink(b: Builder): void {
  const { s } = b;
  const p = s.parts;
  commandSource(b, NAMES.nodeCommand, NAMES.ground);
  const ref = p.dividerTop > 0 ? "ref" : NAMES.nodeCommand;
  if (p.dividerTop > 0) res(b, "divider-top", NAMES.nodeCommand, "ref", p.dividerTop);
  res(b, "divider-bottom", ref, NAMES.ground, p.dividerBottom);
  opamp(b, ref, "inv");
  driveResistor(b);
  if (p.compCapacitor > 0) add(b, { kind: "capacitor", name: "comp-capacitor", nodes: [NAMES.nodeOpampOut, "inv"], value: p.compCapacitor });
  res(b, "feedback-resistor", "e", "inv", p.feedbackResistor);
  res(b, NAMES.sense, "e", NAMES.ground, p.senseResistor);
  if (s.template === "sink-nmos") {
    add(b, { kind: "mosfet", name: NAMES.pass, nodes: [NAMES.nodePass, "b", "e"], polarity: "n", model: mosModel(s) });
  } else if (s.template === "sink-darlington") {
    // Driver transistor: a tenth of the output device's area (common practice for Darlington pairs).
    add(b, { kind: "bjt", name: NAMES.driver, nodes: [NAMES.nodePass, "b", "bm"], polarity: "npn", model: bjtModel(s, 0.1) });
    add(b, { kind: "bjt", name: NAMES.pass, nodes: [NAMES.nodePass, "bm", "e"], polarity: "npn", model: bjtModel(s) });
    if (p.darlingtonResistor !== null) res(b, "darlington-resistor", "bm", "e", p.darlingtonResistor);
  } else {
    add(b, { kind: "bjt", name: NAMES.pass, nodes: [NAMES.nodePass, "b", "e"], polarity: "npn", model: bjtModel(s) });
  }
  passNetworks(b);
  supplySource(b, NAMES.loadSupply, "vs", s.supplies.load, true);
  loadPath(b, true, "vs");
}

/** High-side source: sense resistor from the supply to the emitter/source of a PNP or P-MOSFET. */
function buildHighSide(b: Builder): void {
  const { s } = b;
  const p = s.parts;
  supplySource(b, NAMES.loadSupply, "vs", s.supplies.load, true);
  // The command is referred to the supply rail (as a level shifter would present it): cmd = vs − Vcommand.
  commandSource(b, "vs", NAMES.nodeCommand);
  const ref = "ref";
  res(b, "divider-bottom", "vs", ref, p.dividerBottom);
  res(b, "divider-top", ref, NAMES.nodeCommand, Math.max(p.dividerTop, 1e-3));
  opamp(b, ref, "inv");
  driveResistor(b);
  if (p.compCapacitor > 0) add(b, { kind: "capacitor", name: "comp-capacitor", nodes: [NAMES.nodeOpampOut, "inv"], value: p.compCapacitor });
  res(b, "feedback-resistor", "e", "inv", p.feedbackResistor);
  res(b, NAMES.sense, "vs", "e", p.senseResistor);
  if (s.pass.kind === "pmos") {
    add(b, { kind: "mosfet", name: NAMES.pass, nodes: [NAMES.nodePass, "b", "e"], polarity: "p", model: mosModel(s) });
  } else {
    add(b, { kind: "bjt", name: NAMES.pass, nodes: [NAMES.nodePass, "b", "e"], polarity: "pnp", model: bjtModel(s) });
  }
  passNetworks(b);
  loadPath(b, false, NAMES.ground);
}

/** Improved Howland pump: R1 command→P, R2 P→load node, R3 N→ground, R4 (∥ Ccomp) output→N, Rs output→load node. */
function buildHowland(b: Builder): void {
  const { s } = b;
  const p = s.parts;
  commandSource(b, NAMES.nodeCommand, NAMES.ground);
  res(b, "howland-r1", NAMES.nodeCommand, "p", p.howlandR1);
  res(b, "howland-r2", "p", NAMES.nodePass, p.howlandR2);
  res(b, "howland-r3", "n", NAMES.ground, p.howlandR3);
  res(b, "howland-r4", NAMES.nodeOpampOut, "n", p.howlandR4);
  if (p.compCapacitor > 0) add(b, { kind: "capacitor", name: "comp-capacitor", nodes: [NAMES.nodeOpampOut, "n"], value: p.compCapacitor });
  opamp(b, "p", "n");
  res(b, NAMES.sense, NAMES.nodeOpampOut, NAMES.nodePass, p.senseResistor);
  supplySource(b, NAMES.loadSupply, "vs", s.supplies.load, true);
  loadPath(b, false, "vs");
}

function analysisFor(s: Scenario, purpose: CompilePurpose, opts: CompileOptions): AnalysisJson {
  switch (purpose) {
    case "op":
      return { kind: "op" };
    case "dcsweep": {
      const fs = s.stimulus.commandFullScale;
      return { kind: "dcsweep", source: NAMES.command, from: s.template === "howland" ? -fs : 0, to: fs, points: opts.sweepPoints ?? 41 };
    }
    case "step": {
      const t = s.stimulus.stopTime;
      // At most tStop/200 per step: enough points for the plot; the truncation-error control refines edges and ringing
      // (against tStop/500 on the templates and demos: rise, overshoot and ±1 % settling within 0.5 %, ±0.1 %
      // settling within 5 %, at about half the steps).
      return { kind: "tran", tStop: t, tStep: opts.tStep ?? t / 2000, maxStep: opts.maxStep ?? t / 200, start: "op" };
    }
    default: {
      const fStop = opts.fStop ?? Math.max(AC_DEFAULT.fStop, 10 * s.opamp.GBW);
      return {
        kind: "ac",
        fStart: opts.fStart ?? AC_DEFAULT.fStart,
        fStop,
        pointsPerDecade: opts.pointsPerDecade ?? AC_DEFAULT.pointsPerDecade,
      };
    }
  }
}

/** Compile a scenario to the engine's netlist JSON for one purpose. */
export function compileNetlistJson(s: Scenario, purpose: CompilePurpose, opts: CompileOptions = {}): NetlistJson {
  const b: Builder = { els: [], s, purpose, opts };
  if (s.template === "howland") buildHowland(b);
  else if (s.template === "source-highside") buildHighSide(b);
  else buildSink(b);
  return { temperature: s.thermal.ambient, elements: b.els, analysis: analysisFor(s, purpose, opts) };
}
