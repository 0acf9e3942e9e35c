/**
 * Running a scenario through the engine and reducing the raw results: operating point, step response, loop gain,
 * closed-loop transconductance, output impedance and DC transfer. Every function takes the engine's options
 * (time budget, shouldStop, onProgress) and throws the engine's SimError when a run fails.
 */
import { compile, simulate, type AcResult, type DcSweepResult, type Netlist, type OpResult, type SimOptions, type TranResult } from "../sim";
import {
  NAMES, compileNetlistJson, idealTransconductance, operatingCommand, probeNode, type CompileOptions, type CompilePurpose, type LoopName,
} from "./compile";
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
  return s.template === "howland" ? null : NAMES.pass;
}

export function summarizeOp(s: Scenario, op: OpResult): OperatingPointSummary {
  const iLoad = op.currents[NAMES.ammeter] ?? NaN;
  const iIdeal = idealTransconductance(s) * operatingCommand(s);
  const dev = passDevice(s);
  const info = dev ? (op.devices[dev] as { power?: number; region?: string } | undefined) : undefined;
  let passPower = info?.power ?? null;
  if (s.template === "sink-darlington" && passPower !== null) {
    const driver = op.devices[NAMES.driver] as { power?: number } | undefined;
    passPower += driver?.power ?? 0;
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

/** Samples per ringing period the step's peak is resolved with (a peak between samples is then within ~0.2 %). */
const PEAK_SAMPLES_PER_PERIOD = 60;

function stepSeries(s: Scenario, tr: TranResult): StepResult["series"] {
  return {
    iLoad: tr.currents[NAMES.ammeter], vCommand: commandSeries(s, tr), vOpampOut: tr.nodes[NAMES.nodeOpampOut], vPass: tr.nodes[NAMES.nodePass],
  };
}

function metricsOf(s: Scenario, time: Float64Array, iLoad: Float64Array): StepMetrics {
  const st = s.stimulus;
  // Every stimulus ends at the high command: the ideal final current is the same for all of them.
  const target = idealTransconductance(s) * st.commandHigh;
  const disturbance = st.kind === "load-step" || st.kind === "supply-step";
  return stepMetrics(time, iLoad, st.stepTime, { target, disturbance });
}

/**
 * The record's steps follow the truncation-error control, which may leave a ringing peak only a few samples per
 * period: the sampled maximum then sits below the true peak and a parabola through it can overshoot it. Where the
 * samples around the peak are coarser than 1/PEAK_SAMPLES_PER_PERIOD of the ringing period (taken from the ringing
 * estimate, else as twice the peak time), the window from the step to one period past the peak is simulated again
 * with the step limited to that fraction (the circuit is time-invariant and starts from its operating point, so the
 * step is moved close to t = 0 to save the quiet lead-in), and those samples replace the coarse ones.
 */
function refinePeak(s: Scenario, tr: TranResult, m: StepMetrics, options: SimOptions): { time: Float64Array; series: StepResult["series"] } | null {
  if (m.peakTime === null || m.peakTime <= 0) return null;
  const st = s.stimulus;
  const period = m.ringing.frequencyHz ? 1 / m.ringing.frequencyHz : 2 * m.peakTime;
  const tPeak = st.stepTime + m.peakTime;
  const t = tr.time;
  let ip = 0;
  while (ip < t.length - 1 && t[ip] < tPeak) ip++;
  const spacing = Math.max(t[Math.min(ip + 1, t.length - 1)] - t[ip], t[ip] - t[Math.max(ip - 1, 0)]);
  const fine = period / PEAK_SAMPLES_PER_PERIOD;
  if (!(spacing > 1.5 * fine)) return null;
  const lead = Math.min(st.stepTime, Math.max(10 * st.edgeTime, period / 4));
  const shift = st.stepTime - lead;
  const end = Math.min(st.stopTime, tPeak + period) - shift;
  const w: Scenario = { ...s, stimulus: { ...st, stepTime: lead, stopTime: end } };
  const r = simulate(compileNetlist(w, "step", { maxStep: fine, tStep: fine }), options);
  expect(r, "tran");
  const fineTr = r as TranResult;
  const fineSeries = stepSeries(w, fineTr);
  // Splice: coarse samples before the step and after the window, the fine ones (shifted back) in between.
  const tFrom = st.stepTime, tTo = end + shift;
  let a = 0;
  while (a < t.length && t[a] < tFrom) a++;
  let b = a;
  while (b < t.length && t[b] <= tTo) b++;
  let f0 = 0;
  while (f0 < fineTr.time.length && fineTr.time[f0] + shift < tFrom) f0++;
  const nf = fineTr.time.length - f0;
  const n = a + nf + (t.length - b);
  const time = new Float64Array(n);
  const splice = (coarse: Float64Array, fineCol: Float64Array, out: Float64Array, offset: number) => {
    out.set(coarse.subarray(0, a), 0);
    for (let k = 0; k < nf; k++) out[a + k] = fineCol[f0 + k] + offset;
    out.set(coarse.subarray(b), a + nf);
  };
  splice(t, fineTr.time, time, shift);
  const coarse = stepSeries(s, tr);
  const series = {} as StepResult["series"];
  for (const key of Object.keys(coarse) as (keyof StepResult["series"])[]) {
    series[key] = new Float64Array(n);
    splice(coarse[key], fineSeries[key], series[key], 0);
  }
  return { time, series };
}

/**
 * Transient of the scenario's stimulus; metrics of the load current around the step, with the peak resolved to a
 * fraction of the ringing period (see refinePeak).
 */
export function runStep(s: Scenario, options: SimOptions = {}): StepResult {
  const r = simulate(compileNetlist(s, "step"), options);
  expect(r, "tran");
  const tr = r as TranResult;
  let time = tr.time;
  let series = stepSeries(s, tr);
  let metrics = metricsOf(s, time, series.iLoad);
  const refined = refinePeak(s, tr, metrics, options);
  if (refined) {
    time = refined.time;
    series = refined.series;
    metrics = metricsOf(s, time, series.iLoad);
  }
  return { time, series, metrics, stats: tr.stats };
}

/** One loop's gain T(jω) and its margins. */
export interface LoopResult extends LoopMetrics {
  /** which loop the probe broke (see CompileOptions.loop) */
  loop: LoopName;
  freq: Float64Array;
  /** T(jω), real and imaginary parts */
  re: Float64Array;
  im: Float64Array;
}

/**
 * The loop gain result: the top-level figures are the current loop's (the loop that sets the load current's step
 * response); `loops.local` is the op-amp's local loop (compensation capacitor, output pin break), null for the
 * improved Howland pump (whose loops all pass through the output pin, so its one break is the current loop) or when
 * it was not asked for.
 */
export interface LoopGainResult extends LoopResult {
  loops: { current: LoopResult; local: LoopResult | null };
}

/**
 * Loop gain by the two-injection method (Tian et al., IEEE Trans. CAS-I 48(9), 2001; derivation in
 * docs/references.md §4.2). Probe: a series voltage source in the broken wire, v(driven) = v(driver) + Vi, and a
 * current source into the driven side. Run 1 (Vi = 1): v1 = v(driven). Run 2 (Ii = 1): i2 = the current through the
 * series source from the driver to the driven side, which is minus the engine's current (the engine counts it from
 * nodes[0] = driven). Then T = −(v1 + i2)/(1 + v1 + i2).
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
function loopGainRuns(s: Scenario, options: SimOptions, compileOpts: CompileOptions, loop: LoopName): { op: OpResult; a: AcResult; b: AcResult } {
  const c = compile(compileNetlist(s, "loopgain-v", { ...compileOpts, loop }));
  const { op, results } = c.runAcMulti(
    [{ [NAMES.probeV]: { ac: 1 }, [NAMES.probeI]: { ac: 0 } }, { [NAMES.probeV]: { ac: 0 }, [NAMES.probeI]: { ac: 1 } }],
    options,
  );
  return { op, a: results[0], b: results[1] };
}

function loopGainFrom(s: Scenario, loop: LoopName, a: AcResult, b: AcResult): LoopResult {
  const n = a.freq.length;
  const v1 = a.nodes[probeNode(s, loop)];
  const ip = b.currents[NAMES.probeV];
  const re = new Float64Array(n), im = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    const [tr, ti] = tianLoopGain(v1.re[k], v1.im[k], -ip.re[k], -ip.im[k]);
    re[k] = tr;
    im[k] = ti;
  }
  return { loop, freq: a.freq, re, im, ...loopMetrics(a.freq, re, im) };
}

/** Whether a template has a local op-amp loop distinct from the current loop. */
export function hasLocalLoop(s: Scenario): boolean {
  return s.template !== "howland";
}

function combine(current: LoopResult, local: LoopResult | null): LoopGainResult {
  return { ...current, loops: { current, local } };
}

/**
 * Loop gain of the current loop (the headline) and, when `withLocal` (default), of the op-amp's local loop too.
 * Studies that judge only the current loop pass `withLocal = false`.
 */
export function runLoopGain(s: Scenario, options: SimOptions = {}, compileOpts: CompileOptions = {}, withLocal = true): LoopGainResult {
  const { a, b } = loopGainRuns(s, options, compileOpts, "current");
  const current = loopGainFrom(s, "current", a, b);
  let local: LoopResult | null = null;
  if (withLocal && hasLocalLoop(s)) {
    const l = loopGainRuns(s, options, compileOpts, "local");
    local = loopGainFrom(s, "local", l.a, l.b);
  }
  return combine(current, local);
}

/**
 * Operating point and the current loop's gain from one compile and one OP solve (what a Spread run needs). The OP is
 * taken on the probe netlist, whose probes carry nothing at DC; the summary reads the same nodes and devices as
 * runOperatingPoint.
 */
export function runOperatingPointAndLoopGain(s: Scenario, options: SimOptions = {}, compileOpts: CompileOptions = {}): {
  op: OpResult; summary: OperatingPointSummary; loop: LoopGainResult;
} {
  const { op, a, b } = loopGainRuns(s, options, compileOpts, "current");
  return { op, summary: summarizeOp(s, op), loop: combine(loopGainFrom(s, "current", a, b), null) };
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

/**
 * Closed-loop transconductance Iload/Vcommand(f), dB re 1 A/V; its −3 dB bandwidth and its peaking (the highest
 * point above the low-frequency gain, dB, 0 when the response never rises above it).
 */
export function runClosedLoop(s: Scenario, options: SimOptions = {}, compileOpts: CompileOptions = {}): {
  freq: Float64Array; magDb: Float64Array; phaseDeg: Float64Array; bandwidthHz: number | null; peakingDb: number; peakingHz: number | null;
} {
  const r = simulate(compileNetlist(s, "closedloop", compileOpts), options);
  expect(r, "ac");
  const ac = r as AcResult;
  const i = ac.currents[NAMES.ammeter];
  const { mag, phaseDeg } = magPhase(i.re, i.im, true);
  let top = 0;
  for (let k = 1; k < mag.length; k++) if (mag[k] > mag[top]) top = k;
  const peakingDb = Math.max(0, mag[top] - mag[0]);
  return { freq: ac.freq, magDb: mag, phaseDeg, bandwidthHz: bandwidth3dB(ac.freq, mag), peakingDb, peakingHz: peakingDb > 0 ? ac.freq[top] : null };
}

/** Steps of the small-signal step's record (fixed step, trapezoidal; see the engine's runLinearStep). */
const SMALL_SIGNAL_STEPS = 6000;

export interface SmallSignalStep {
  /** time from the start of the record (the step at the stimulus' step time), s */
  time: Float64Array;
  /** load current: the large-signal record's initial value plus the linear response to the command's change, A */
  iLoad: Float64Array;
  metrics: StepMetrics;
  /**
   * The linearised circuit's response grows instead of settling (its closed loop is unstable): the swing over the
   * record's last tenth exceeds 1.5 times the swing over its first half. The record is then cut where the response
   * first leaves four times the step, and its overshoot is no figure to quote.
   */
  grows: boolean;
}

/**
 * The small-signal step: the circuit linearised at the operating point (the final command, as for the loop gain and
 * the closed loop) driven by the stimulus' command change through the same edge. Its overshoot and ringing are the
 * ones the current loop's margins predict; where the large-signal step differs, slewing, swing or current limits or
 * a clamp are at work. `initial` places it on the large-signal record's pre-step current (default: the ideal
 * current at the low command). Null for stimuli that do not move the command (load, supply steps).
 */
export function runSmallSignalStep(s: Scenario, options: SimOptions = {}, initial?: number): SmallSignalStep | null {
  const st = s.stimulus;
  if (st.kind !== "command-step" && st.kind !== "command-ramp") return null;
  const dv = st.commandHigh - st.commandLow;
  if (dv === 0) return null;
  const span = st.stopTime - st.stepTime;
  const edge = st.kind === "command-ramp" ? st.rampTime : st.edgeTime;
  const c = compile(compileNetlist(s, "closedloop"));
  const r = c.runLinearStep(NAMES.command, span, SMALL_SIGNAL_STEPS, edge, options);
  const di = r.currents[NAMES.ammeter];
  const i0 = initial ?? idealTransconductance(s) * st.commandLow;
  const n = r.time.length + 1;
  const time = new Float64Array(n), iLoad = new Float64Array(n);
  // one point at t = 0 before the step, then the response from the step time on
  time[0] = 0;
  iLoad[0] = i0;
  for (let k = 0; k < r.time.length; k++) {
    time[k + 1] = st.stepTime + r.time[k];
    iLoad[k + 1] = i0 + dv * di[k];
  }
  const grows = swing(di, Math.floor(0.9 * di.length), di.length) > 1.5 * swing(di, 0, Math.floor(di.length / 2));
  if (grows) {
    const bound = 4 * Math.abs(idealTransconductance(s) * dv);
    let end = 1;
    while (end < n && Math.abs(iLoad[end] - i0) <= bound) end++;
    end = Math.min(n, Math.max(end + 1, 3)); // keep the first sample beyond the bound: the trace visibly leaves
    const t = time.slice(0, end), i = iLoad.slice(0, end);
    return { time: t, iLoad: i, metrics: stepMetrics(t, i, st.stepTime, { initial: i0 }), grows };
  }
  return { time, iLoad, metrics: stepMetrics(time, iLoad, st.stepTime, { initial: i0 }), grows };
}

/** Peak-to-peak of x over [from, to). */
function swing(x: Float64Array, from: number, to: number): number {
  let lo = Infinity, hi = -Infinity;
  for (let k = from; k < to; k++) { if (x[k] < lo) lo = x[k]; if (x[k] > hi) hi = x[k]; }
  return hi > lo ? hi - lo : 0;
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
