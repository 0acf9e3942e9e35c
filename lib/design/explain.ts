/**
 * "Why the figures disagree": plain-language notes for the places where Quell's stability and step figures could be
 * read as contradicting each other. Each note states a measured fact (the large-signal step's op-amp output reached
 * its rail, the current loop crosses 0 dB three times…), never a guess offered as an excuse.
 */
import { formatEng } from "../units/eng";
import { idealTransconductance } from "./compile";
import type { StepMetrics } from "./metrics";
import type { Scenario } from "./schema";

/** The loop figures a note reads (the workbench's loop view and the design layer's loop result both fit). */
export interface LoopFiguresLike {
  phaseMarginDeg: number | null;
  crossoverHz: number | null;
  crossovers: number[];
}

export interface StepLike {
  time: ArrayLike<number>;
  vOpampOut: ArrayLike<number>;
  vPass: ArrayLike<number>;
  metrics: StepMetrics;
  small: { metrics: StepMetrics; grows: boolean } | null;
}

/** A ring this many times above the current loop's highest crossover is not the loop's own. */
const ABOVE_CROSSOVER = 3;

/**
 * A coil's ringing against the capacitance at its terminals, read off the linearised step: when that step rings well
 * above the current loop's crossover, the loop is not what rings. The pass device delivers the current the loop sets,
 * and the coil's current rings against the capacitance across it (the cable's, any added, and the pass device's
 * output capacitance) after every fast change of it. The capacitance is the one the measured frequency implies with
 * the coil's inductance, C = 1/((2πf)²·L); √(L/C) is the tank's characteristic impedance, the usual starting point
 * for the resistor of a series R–C across the load (common practice).
 */
export function loadTankNote(s: Scenario, loop: LoopFiguresLike | null, step: StepLike | null): string | null {
  const small = step?.small;
  if (!small || small.grows || s.load.kind !== "coil" || s.load.inductance <= 0) return null;
  const f = small.metrics.ringing.frequencyHz;
  if (f === null || small.metrics.overshootPct <= 3) return null;
  const highest = loop && loop.crossovers.length ? Math.max(...loop.crossovers) : loop?.crossoverHz ?? null;
  if (highest !== null && f < ABOVE_CROSSOVER * highest) return null;
  const cable = s.load.cable;
  const L = s.load.inductance + cable.lPerM * cable.length;
  const C = 1 / ((2 * Math.PI * f) ** 2 * L);
  const known = cable.cPerM * cable.length + s.load.extraCapacitance;
  const parts = [
    cable.length > 0 && cable.cPerM > 0 ? `the cable's ${formatEng(cable.cPerM * cable.length, "F")}` : null,
    s.load.extraCapacitance > 0 ? `the added ${formatEng(s.load.extraCapacitance, "F")}` : null,
  ].filter(Boolean);
  // The model's clamp diode has no junction capacitance: what the cable and an added capacitor do not account for is
  // the pass device's output capacitance (its collector–base or drain–gate capacitance as the stage around it sees it).
  const where = !parts.length ? "at the pass device" : C > known * 1.05 ? `${parts.join(" and ")}, the rest at the pass device` : parts.join(" and ");
  const snubbed = s.networks.loadSnubber !== null;
  return (
    `The linearised step rings at ${formatEng(f, "Hz")}${highest !== null ? `, well above the current loop's crossover (${formatEng(highest, "Hz")})` : ""}: ` +
      `that ringing is the load's, not the loop's. The coil (${formatEng(L, "H")}) resonates with about ${formatEng(C, "F")} at its terminals ` +
      `(${where}); the loop sets the pass device's current, and the coil's current rings against that capacitance after every fast change of it. ` +
      (snubbed
        ? "The load snubber fitted does not damp it enough."
        : `A series R–C across the load damps it: a resistor near √(L/C) ≈ ${formatEng(Math.sqrt(L / C), "Ω")} with a capacitor a few times ${formatEng(C, "F")} (common practice); Compensate can search one.`)
  );
}

/** Volts within which the op-amp output counts as at its swing limit. */
const AT_LIMIT_V = 0.05;

function range(a: ArrayLike<number>, from: number): [number, number] {
  let lo = Infinity, hi = -Infinity;
  for (let i = from; i < a.length; i++) { if (a[i] < lo) lo = a[i]; if (a[i] > hi) hi = a[i]; }
  return [lo, hi];
}

/** What the large-signal record shows limiting the response (empty when nothing measurable did). */
export function largeSignalLimits(s: Scenario, step: StepLike): string[] {
  const out: string[] = [];
  const t = step.time;
  let i0 = 0;
  while (i0 < t.length - 1 && t[i0] < s.stimulus.stepTime) i0++;
  const [oLo, oHi] = range(step.vOpampOut, i0);
  const o = s.opamp;
  const top = s.supplies.opampPositive - (o.swingHigh ?? 0);
  const bottom = s.supplies.opampNegative + (o.swingLow ?? 0);
  if (o.swingHigh !== null && oHi >= top - AT_LIMIT_V) out.push(`the op-amp's output reached its upper swing limit (${formatEng(top, "V")})`);
  if (o.swingLow !== null && oLo <= bottom + AT_LIMIT_V) out.push(`the op-amp's output reached its lower swing limit (${formatEng(bottom, "V")})`);
  if (o.slewRate !== null) {
    let fastest = 0;
    for (let i = i0 + 1; i < t.length; i++) {
      const dt = t[i] - t[i - 1];
      if (dt > 0) fastest = Math.max(fastest, Math.abs(step.vOpampOut[i] - step.vOpampOut[i - 1]) / dt);
    }
    if (fastest >= 0.8 * o.slewRate) out.push(`the op-amp's output slewed at up to ${formatEng(fastest, "V/s")} (its limit is ${formatEng(o.slewRate, "V/s")})`);
  }
  const sink = s.template === "sink-npn" || s.template === "sink-darlington" || s.template === "sink-nmos";
  if (sink) {
    const [pLo, pHi] = range(step.vPass, i0);
    const iHigh = idealTransconductance(s) * s.stimulus.commandHigh;
    const floor = iHigh * s.parts.senseResistor + s.pass.vSat;
    if (pLo <= floor) out.push(`the pass device ran out of headroom (its ${s.pass.kind === "nmos" ? "drain" : "collector"} fell to ${formatEng(pLo, "V")})`);
    if (s.load.kind === "coil" && s.load.clamp.kind !== "none" && pHi > s.supplies.load + 0.3) out.push("the coil's clamp diode conducted");
  }
  return out;
}

/**
 * Notes for the verdict zone. `maxOvershootPct` is the scenario's overshoot target. Returns plain sentences, most
 * important first; an empty list when the figures tell one story.
 */
export function explainFigures(s: Scenario, loop: LoopFiguresLike | null, local: LoopFiguresLike | null, step: StepLike | null): string[] {
  const notes: string[] = [];
  const tank = loadTankNote(s, loop, step);
  if (loop && loop.crossovers.length > 1) {
    notes.push(
      `The current loop's gain crosses 0 dB ${loop.crossovers.length} times (at ${loop.crossovers.map((f) => formatEng(f, "Hz")).join(", ")}); ` +
        "the phase margin shown is the smallest over all of them, at the crossover named on the card.",
    );
  }
  if (local && local.phaseMarginDeg !== null && loop?.phaseMarginDeg != null && local.phaseMarginDeg < loop.phaseMarginDeg) {
    notes.push(
      `The op-amp's local loop (through the compensation capacitor, broken at the op-amp's output pin) has ${local.phaseMarginDeg.toFixed(1)}° ` +
        `at ${local.crossoverHz !== null ? formatEng(local.crossoverHz, "Hz") : "its crossover"}, less than the current loop's ${loop.phaseMarginDeg.toFixed(1)}°: it is the limiting loop.`,
    );
  }
  if (step?.small?.grows) {
    const why = largeSignalLimits(s, step);
    notes.push(
      "The linearised circuit's step grows instead of settling: the closed loop is unstable at this operating point. " +
        (why.length
          ? `The large-signal step stays bounded only because something limits it (${why.join("; ")}): on the bench this oscillates.`
          : "On the bench this oscillates."),
    );
  } else if (step?.small) {
    const big = step.metrics.overshootPct, small = step.small.metrics.overshootPct;
    if (Math.abs(big - small) > Math.max(3, 0.2 * Math.max(big, small))) {
      const why = largeSignalLimits(s, step);
      notes.push(
        `The step overshoots ${big.toFixed(1)} %, the linearised circuit's step${tank ? "" : " (what the loop's margins describe)"} ${small.toFixed(1)} %. ` +
          (why.length
            ? `The step is a large signal: ${why.join("; ")}.`
            : "Nothing hit a limit, so the difference comes from the circuit's gain changing over the step's range (the pass device's transconductance, the load's nonlinearity): try a smaller step to see the small-signal figure."),
      );
    }
  }
  if (tank) notes.push(tank);
  return notes;
}
