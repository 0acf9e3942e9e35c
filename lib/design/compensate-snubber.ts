/**
 * Compensate's load-snubber search: the cheapest series R–C across the load (E-series values) that meets the
 * phase-margin and overshoot targets at every load corner, with the rest of the design as it is. Cheapest means the
 * smallest capacitor (a smaller capacitor is smaller and cheaper at a given voltage, and its resistor dissipates
 * C·ΔV²·f less); for each capacitor, every resistor that meets the margin is stepped and the lowest overshoot kept.
 */
import { isSimError } from "../sim";
import { formatEng } from "../units/eng";
import { checkChoice, loadCorners, probeAndBisect, type CompensateCheck, type CompensateSettings } from "./compensate";
import { eValuesBetween } from "./eseries";
import { runLoopGain } from "./run";
import type { Scenario, Snubber } from "./schema";
import { checkStop, engineOptions, worstStepOverCorners, type StudyOptions } from "./study-common";

/**
 * Capacitors tried, F: 100 pF to 10 µF in the study's series (at most E12: finer steps buy nothing here). The low
 * end reaches a coil of millihenries ringing against a few hundred picofarads (a tank of kilohms), the high end a
 * coil's low-impedance resonance with a long cable.
 */
export function snubberCapacitors(settings: CompensateSettings): number[] {
  const series = settings.series === "E6" ? "E6" : "E12";
  return eValuesBetween(100e-12, 10e-6, series);
}

/**
 * Resistors tried for each capacitor, Ω: 1, 2.2 and 4.7 per decade from 1 Ω to 10 kΩ (E3, a coarse first pass), up
 * to the characteristic impedance √(L/C) of a tank of kilohms.
 */
export const SNUBBER_RESISTORS: readonly number[] = eValuesBetween(1, 1e4, "E6").filter((_, i) => i % 2 === 0);

/** One capacitor the search visited: the best resistor for it and what it gave. */
export interface SnubberTry {
  capacitance: number;
  resistance: number;
  /** that set's worst-corner margin, degrees (NaN when none ran; when none met the target, the best of them) */
  minPhaseMarginDeg: number;
  /** worst-corner overshoot of that set, % (null when its margin missed the target, so it was not stepped) */
  worstOvershootPct: number | null;
  worstSettlingTime1pct: number | null;
  meets: boolean;
}

export interface SnubberTuneResult {
  chosen: (Snubber & { minPhaseMarginDeg: number; worstOvershootPct: number; worstSettlingTime1pct: number; check: CompensateCheck | null }) | null;
  /** every capacitor visited, ascending */
  tried: SnubberTry[];
  message: string;
}

const withSnubber = (s: Scenario, snubber: Snubber): Scenario => ({ ...s, networks: { ...s.networks, loadSnubber: snubber } });

/** Search the load snubber (see the module comment); probes about eight capacitors, then bisects. */
export function compensateLoadSnubber(s: Scenario, settings: CompensateSettings, opts: StudyOptions = {}): SnubberTuneResult {
  const caps = snubberCapacitors(settings);
  const corners = loadCorners(s);
  const visited = new Map<number, SnubberTry>();
  const minPm = (snubber: Snubber): number => {
    let pm = Infinity;
    for (const corner of corners) {
      try {
        pm = Math.min(pm, runLoopGain(withSnubber(corner, snubber), engineOptions(opts), { pointsPerDecade: 10 }, false).phaseMarginDeg ?? NaN);
      } catch (e) {
        if (!isSimError(e) || e.code === "cancelled") throw e;
        pm = NaN;
      }
    }
    return pm;
  };
  const visit = (j: number): SnubberTry => {
    const hit = visited.get(j);
    if (hit) return hit;
    checkStop(opts);
    const capacitance = caps[j];
    // Every resistor whose worst-corner margin meets the target is stepped; the lowest overshoot wins (the margin
    // alone misleads here: a large resistor lifts it while the step still rings through the coil).
    let row: SnubberTry = { capacitance, resistance: SNUBBER_RESISTORS[0], minPhaseMarginDeg: NaN, worstOvershootPct: null, worstSettlingTime1pct: null, meets: false };
    for (const resistance of SNUBBER_RESISTORS) {
      const pm = minPm({ resistance, capacitance });
      if (!Number.isFinite(pm)) continue;
      if (pm < settings.targetPhaseMarginDeg) {
        if (row.worstOvershootPct === null && !(pm <= row.minPhaseMarginDeg)) row = { ...row, resistance, minPhaseMarginDeg: pm };
        continue;
      }
      try {
        const { os, ts } = worstStepOverCorners(corners.map((corner) => withSnubber(corner, { resistance, capacitance })), opts);
        if (row.worstOvershootPct === null || os < row.worstOvershootPct) {
          row = { capacitance, resistance, minPhaseMarginDeg: pm, worstOvershootPct: os, worstSettlingTime1pct: ts, meets: os <= settings.maxOvershootPct };
        }
      } catch (e) {
        if (!isSimError(e) || e.code === "cancelled") throw e;
      }
    }
    visited.set(j, row);
    opts.onProgress?.(visited.size, caps.length);
    return row;
  };
  const j = probeAndBisect(caps.length, (k) => visit(k).meets);
  const tried = [...visited.values()].sort((a, b) => a.capacitance - b.capacitance);
  const what = `${tried.length} capacitor${tried.length === 1 ? "" : "s"} from ${formatEng(caps[0], "F")} to ${formatEng(caps[caps.length - 1], "F")}, each with ${SNUBBER_RESISTORS.length} resistors from ${formatEng(SNUBBER_RESISTORS[0], "Ω")} to ${formatEng(SNUBBER_RESISTORS[SNUBBER_RESISTORS.length - 1], "Ω")}`;
  if (j < 0) {
    return { chosen: null, tried, message: `No load snubber meets ${settings.targetPhaseMarginDeg}° and ${settings.maxOvershootPct} % at every load corner (tried ${what}).` };
  }
  const row = visited.get(j)!;
  const snubber = { resistance: row.resistance, capacitance: row.capacitance };
  let check: CompensateCheck | null = null;
  try {
    check = checkChoice(withSnubber(s, snubber), { compCapacitor: s.parts.compCapacitor, baseResistor: s.parts.baseResistor }, settings, opts);
  } catch (e) {
    if (!isSimError(e) || e.code === "cancelled") throw e;
  }
  const chosen = {
    ...snubber,
    minPhaseMarginDeg: check?.minPhaseMarginDeg ?? row.minPhaseMarginDeg,
    worstOvershootPct: check?.worstOvershootPct ?? row.worstOvershootPct!,
    worstSettlingTime1pct: check?.worstSettlingTime1pct ?? row.worstSettlingTime1pct!,
    check,
  };
  const confirm = check ? (check.meetsTargets ? " Re-run of the chosen set confirms it." : " Re-run at full resolution misses a target; treat it as a starting point.") : "";
  return {
    chosen,
    tried,
    message: `Load snubber ${formatEng(snubber.resistance, "Ω")} + ${formatEng(snubber.capacitance, "F")}, the smallest capacitor that meets the targets: phase margin ≥ ${chosen.minPhaseMarginDeg.toFixed(1)}°, overshoot ≤ ${chosen.worstOvershootPct.toFixed(2)} % over the load range (tried ${what}).${confirm}`,
  };
}
