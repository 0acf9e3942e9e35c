/**
 * Running a scenario through the engine and reducing the raw results: operating point, step response, loop gain,
 * closed-loop transconductance, output impedance and DC transfer. Every function takes the engine's options
 * (time budget, shouldStop, onProgress) and throws the engine's SimError when a run fails.
 */
import { compile, simulate, type AcResult, type DcSweepResult, type Netlist, type OpResult, type SimOptions, type TranResult } from "../sim";
import { NAMES, compileNetlistJson, idealTransconductance, operatingCommand, type CompileOptions, type CompilePurpose } from "./compile";
import { bandwidth3dB, loopMetrics, stepMetrics, unwrapDeg, type LoopMetrics, type StepMetrics } from "./metrics";
import type { Scenario } from "./schema";
import { fullScaleCurrent } from "./checks";

export type { SimOptions } from "../sim";

/** Compile a scenario to an engine netlist (the engine validates it again when it runs). */
export function compileNetlist(s: Scenario, purpose: CompilePurpose, opts: CompileOptions = {}): Netlist {
  const n: Netlist = compileNetlistJson(s, purpose, opts);
  return n;
}

function expect<K extends "op" | "ac" | "tran" | "dcsweep">(r: { kind: string }, kind: K): void {
  if (r.kind !== kind) throw new Error(`Expected a ${kind} result, got ${r.kind}`);
}

export interface OperatingPointSummary {
  /** regulated load current, A, and the ideal Vcommand·k/Rsense */
  iLoad: number;
  iIdeal: number;
  /** (iLoad − iIdeal) as % of full scale */
  errorPctFs: number;
  vOpampOut: number;
  /** collector/drain node voltage, V */
  vPass: number;
  /** pass-device dissipation and region (null for the Howland pump) */
  passPower: number | null;
  passRegion: string | null;
  opampLimiting: boolean;
  /** current drawn from the command source, A */
  commandCurrent: number;
}

function passDevice(s: Scenario): string | null {
  if (s.template === "howland") return null;
  if (s.template === "sink-darlington") return "Q2";
  if (s.template === "sink-nmos" || (s.template === "source-highside" && s.pass.kind === "pmos")) return "M1";
  return "Q1";
}

export function summarizeOp(s: Scenario, op: OpResult): OperatingPointSummary {
  const iLoad = op.currents[NAMES.ammeter] ?? NaN;
  const iIdeal = idealTransconductance(s) * operatingCommand(s);
  const dev = passDevice(s);
  const info = dev ? (op.devices[dev] as { power?: number; region?: string } | undefined) : undefined;
  let passPower = info?.power ?? null;
  if (s.template === "sink-darlington" && passPower !== null) {
    const q1 = op.devices.Q1 as { power?: number } | undefined;
    passPower += q1?.power ?? 0;
  }
  const u = op.devices[NAMES.opamp] as { limiting?: boolean } | undefined;
  return {
    iLoad,
    iIdeal,
    errorPctFs: ((iLoad - iIdeal) / fullScaleCurrent(s)) * 100,
    vOpampOut: op.nodes[NAMES.nodeOpampOut] ?? NaN,
    vPass: op.nodes[NAMES.nodePass] ?? NaN,
    passPower,
    passRegion: info?.region ?? null,
    opampLimiting: Boolean(u?.limiting),
    commandCurrent: Math.abs(op.currents[NAMES.command] ?? NaN),
  };
}

/** Operating point at the stimulus' final command (load step off). */
export function runOperatingPoint(s: Scenario, options: SimOptions = {}): { op: OpResult; summary: OperatingPointSummary } {
  const r = simulate(compileNetlist(s, "op"), options);
  expect(r, "op");
  const op = r as OpResult;
  return { op, summary: summarizeOp(s, op) };
}

export interface StepResult {
  time: Float64Array;
  series: { iLoad: Float64Array; vCommand: Float64Array; vOpampOut: Float64Array; vPass: Float64Array };
  metrics: StepMetrics;
  stats: TranResult["stats"];
}

/** The command as the user thinks of it: v(cmd), or for the rail-referred high-side command v(vs) − v(cmd). */
function commandSeries(s: Scenario, r: TranResult): Float64Array {
  const cmd = r.nodes[NAMES.nodeCommand];
  if (s.template !== "source-highside") return cmd;
  const vs = r.nodes.vs;
  const out = new Float64Array(cmd.length);
  for (let i = 0; i < cmd.length; i++) out[i] = vs[i] - cmd[i];
  return out;
}

/** Transient of the scenario's stimulus; metrics of the load current around the step. */
export function runStep(s: Scenario, options: SimOptions = {}): StepResult {
  const r = simulate(compileNetlist(s, "step"), options);
  expect(r, "tran");
  const tr = r as TranResult;
  const iLoad = tr.currents[NAMES.ammeter];
  const st = s.stimulus;
  // Every stimulus ends at the high command: the ideal final current is the same for all of them.
  const target = idealTransconductance(s) * st.commandHigh;
  const disturbance = st.kind === "load-step" || st.kind === "supply-step";
  const metrics = stepMetrics(tr.time, iLoad, st.stepTime, { target, disturbance });
  return {
    time: tr.time,
    series: { iLoad, vCommand: commandSeries(s, tr), vOpampOut: tr.nodes[NAMES.nodeOpampOut], vPass: tr.nodes[NAMES.nodePass] },
    metrics,
    stats: tr.stats,
  };
}

export interface LoopGainResult extends LoopMetrics {
  freq: Float64Array;
  /** T(jω), real and imaginary parts */
  re: Float64Array;
  im: Float64Array;
}

/**
 * Loop gain by the two-injection method (Tian et al. 2001; derivation in REFERENCES §4.2) at the op-amp's output
 * pin, the one wire every loop passes through. Probe: VPROBE in series (v(oa) = v(oa_i) + Vi) and IPROBE into
 * "oa". Run 1 (Vi = 1): v1 = v(oa). Run 2 (Ii = 1): i2 = current through VPROBE from oa_i to oa, which is minus
 * the engine's current (the engine counts it from nodes[0] = oa). Then T = −(v1 + i2)/(1 + v1 + i2).
 */
export function tianLoopGain(v1re: number, v1im: number, i2re: number, i2im: number): [number, number] {
  const nr = v1re + i2re, ni = v1im + i2im;
  const dr = 1 + nr, di = ni;
  const d2 = dr * dr + di * di;
  // −(n / d)
  return [-(nr * dr + ni * di) / d2, -(ni * dr - nr * di) / d2];
}

/**
 * Both Tian injections on one compiled circuit: the probe netlist is compiled once, its operating point solved once
 * (the probes are 0 V / 0 A at DC, so it is the circuit's own OP), and the two excitations — Vi = 1 (VPROBE) and
 * Ii = 1 (IPROBE) — share the linearisation and each frequency's factorisation (engine runAcMulti). Same numbers as
 * two separate AC runs of the "loopgain-v" and "loopgain-i" netlists.
 */
function loopGainRuns(s: Scenario, options: SimOptions, compileOpts: CompileOptions): { op: OpResult; a: AcResult; b: AcResult } {
  const c = compile(compileNetlist(s, "loopgain-v", compileOpts));
  const { op, results } = c.runAcMulti(
    [{ [NAMES.probeV]: { ac: 1 }, [NAMES.probeI]: { ac: 0 } }, { [NAMES.probeV]: { ac: 0 }, [NAMES.probeI]: { ac: 1 } }],
    options,
  );
  return { op, a: results[0], b: results[1] };
}

function loopGainFrom(a: AcResult, b: AcResult): LoopGainResult {
  const n = a.freq.length;
  const v1 = a.nodes[NAMES.nodeOpampOut];
  const ip = b.currents[NAMES.probeV];
  const re = new Float64Array(n), im = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    const [tr, ti] = tianLoopGain(v1.re[k], v1.im[k], -ip.re[k], -ip.im[k]);
    re[k] = tr;
    im[k] = ti;
  }
  const m = loopMetrics(a.freq, re, im);
  return {
    freq: a.freq, re, im, magDb: m.magDb, phaseDeg: m.phaseDeg,
    phaseMarginDeg: m.phaseMarginDeg, gainMarginDb: m.gainMarginDb, crossoverHz: m.crossoverHz, phaseCrossoverHz: m.phaseCrossoverHz,
    modulusMargin: m.modulusMargin, modulusMarginHz: m.modulusMarginHz,
  };
}

export function runLoopGain(s: Scenario, options: SimOptions = {}, compileOpts: CompileOptions = {}): LoopGainResult {
  const { a, b } = loopGainRuns(s, options, compileOpts);
  return loopGainFrom(a, b);
}

/**
 * Operating point and loop gain from one compile and one OP solve (what a Spread run needs). The OP is taken on the
 * probe netlist, whose probes carry nothing at DC; the summary reads the same nodes and devices as runOperatingPoint.
 */
export function runOperatingPointAndLoopGain(s: Scenario, options: SimOptions = {}, compileOpts: CompileOptions = {}): {
  op: OpResult; summary: OperatingPointSummary; loop: LoopGainResult;
} {
  const { op, a, b } = loopGainRuns(s, options, compileOpts);
  return { op, summary: summarizeOp(s, op), loop: loopGainFrom(a, b) };
}

function magPhase(re: Float64Array, im: Float64Array, db: boolean): { mag: Float64Array; phaseDeg: Float64Array } {
  const n = re.length;
  const mag = new Float64Array(n), ph = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    const m = Math.hypot(re[k], im[k]);
    mag[k] = db ? 20 * Math.log10(m) : m;
    ph[k] = (Math.atan2(im[k], re[k]) * 180) / Math.PI;
  }
  return { mag, phaseDeg: unwrapDeg(ph) };
}

/** Closed-loop transconductance Iload/Vcommand(f), dB re 1 A/V, and its −3 dB bandwidth. */
export function runClosedLoop(s: Scenario, options: SimOptions = {}, compileOpts: CompileOptions = {}): {
  freq: Float64Array; magDb: Float64Array; phaseDeg: Float64Array; bandwidthHz: number | null;
} {
  const r = simulate(compileNetlist(s, "closedloop", compileOpts), options);
  expect(r, "ac");
  const ac = r as AcResult;
  const i = ac.currents[NAMES.ammeter];
  const { mag, phaseDeg } = magPhase(i.re, i.im, true);
  return { freq: ac.freq, magDb: mag, phaseDeg, bandwidthHz: bandwidth3dB(ac.freq, mag) };
}

/**
 * Output impedance seen by the load, |Z|(f) in Ω. A 1 V AC source in series with the load (the ammeter) splits
 * between the load and the source; the source side's terminal voltage over the current through it is Zout:
 * sink Z = v(terminal)/I, source Z = −v(terminal)/I (the far side of the load is AC ground). The operating point is
 * the normal one, so no bias has to be guessed.
 */
export function runOutputImpedance(s: Scenario, options: SimOptions = {}, compileOpts: CompileOptions = {}): {
  freq: Float64Array; magOhm: Float64Array; phaseDeg: Float64Array;
} {
  const r = simulate(compileNetlist(s, "zout", compileOpts), options);
  expect(r, "ac");
  const ac = r as AcResult;
  const i = ac.currents[NAMES.ammeter];
  const v = ac.nodes[s.load.cable.length > 0 ? NAMES.nodeTerminal : NAMES.nodePass];
  const sign = s.template === "sink-npn" || s.template === "sink-darlington" || s.template === "sink-nmos" ? 1 : -1;
  const n = i.re.length;
  const zr = new Float64Array(n), zi = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    const d = i.re[k] * i.re[k] + i.im[k] * i.im[k];
    // v / i
    zr[k] = (sign * (v.re[k] * i.re[k] + v.im[k] * i.im[k])) / d;
    zi[k] = (sign * (v.im[k] * i.re[k] - v.re[k] * i.im[k])) / d;
  }
  const { mag, phaseDeg } = magPhase(zr, zi, false);
  return { freq: ac.freq, magOhm: mag, phaseDeg };
}

/** DC transfer over the command range: load current, linearity error against the best straight line, command current. */
export function runDcTransfer(s: Scenario, options: SimOptions = {}, points = 41): {
  command: Float64Array; iLoad: Float64Array; commandCurrent: Float64Array;
  /** largest deviation from the least-squares line, % of full scale (over the part of the range above 5 % FS) */
  linearityErrorPctFs: number;
  /** slope of that line against the ideal transconductance, % */
  gainErrorPct: number;
} {
  const r = simulate(compileNetlist(s, "dcsweep", { sweepPoints: points }), options);
  expect(r, "dcsweep");
  const d = r as DcSweepResult;
  const x = d.sweep;
  const y = d.currents[NAMES.ammeter];
  const ic = d.currents[NAMES.command];
  const fs = s.stimulus.commandFullScale;
  // Fit only where the source is regulating: |command| above 5 % of full scale.
  let n = 0, sx = 0, sy = 0, sxx = 0, sxy = 0;
  for (let k = 0; k < x.length; k++) {
    if (Math.abs(x[k]) < 0.05 * fs) continue;
    n++; sx += x[k]; sy += y[k]; sxx += x[k] * x[k]; sxy += x[k] * y[k];
  }
  const slope = (n * sxy - sx * sy) / (n * sxx - sx * sx);
  const icpt = (sy - slope * sx) / n;
  let worst = 0;
  for (let k = 0; k < x.length; k++) {
    if (Math.abs(x[k]) < 0.05 * fs) continue;
    worst = Math.max(worst, Math.abs(y[k] - (slope * x[k] + icpt)));
  }
  const commandCurrent = new Float64Array(ic.length);
  for (let k = 0; k < ic.length; k++) commandCurrent[k] = Math.abs(ic[k]);
  return {
    command: x,
    iLoad: y,
    commandCurrent,
    linearityErrorPctFs: (worst / fullScaleCurrent(s)) * 100,
    gainErrorPct: (slope / idealTransconductance(s) - 1) * 100,
  };
}
