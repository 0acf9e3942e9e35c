import { describe, expect, it } from "vitest";
import { valveCoilDemo } from "@/lib/design/demos";
import { explainFigures, loadTankNote } from "@/lib/design/explain";
import { defaultScenario } from "@/lib/design/templates";
import { runSmallSignalStep, runStep } from "@/lib/design/run";
import { judgedOvershootPct, judgedSettling, overshootVerdict } from "@/lib/design/verdicts";
import { checkChoice, compensate } from "@/lib/design/compensate";
import { nearestE } from "@/lib/design/eseries";
import type { Scenario } from "@/lib/design/schema";
import { idealTransconductance } from "@/lib/design/compile";
import { POLICIES, runScenario } from "@/lib/design/scenario-run";

/** "Why the figures disagree" states what the records show, and stays silent when the figures tell one story. */
function run(cc: number, s: Scenario = valveCoilDemo()) {
  s.parts.compCapacitor = cc;
  const r = runScenario(s, { ...POLICIES.review, budgetMs: 30_000 });
  const st = r.step!;
  const step = { time: st.time, vOpampOut: st.series.vOpampOut, vPass: st.series.vPass, metrics: st.metrics, small: st.small };
  return { s, r, step, notes: explainFigures(s, r.loop, r.loop!.loops.local, step) };
}

describe("explainFigures", () => {
  it("a large step limited by the supply headroom: the note compares both overshoots and names the limit the record shows", () => {
    const { s, step, notes } = run(47e-12);
    expect(notes).toHaveLength(1);
    expect(notes[0]).toContain(`${step.metrics.overshootPct.toFixed(1)} %`);
    expect(notes[0]).toContain(`${step.small!.metrics.overshootPct.toFixed(1)} %`);
    // The collector really fell below I·Rsense + Vsat during the step (the saturation floor of a low-side sink).
    let lowest = Infinity;
    for (let i = 0; i < step.vPass.length; i++) if (step.time[i] > s.stimulus.stepTime) lowest = Math.min(lowest, step.vPass[i]);
    expect(lowest).toBeLessThan(idealTransconductance(s) * s.stimulus.commandHigh * s.parts.senseResistor + s.pass.vSat);
    expect(notes[0]).toContain("ran out of headroom");
  });

  it("says nothing when the small- and large-signal steps agree and one crossover carries the margin", () => {
    const { step, notes } = run(2.2e-9);
    expect(Math.abs(step.metrics.overshootPct - step.small!.metrics.overshootPct)).toBeLessThan(3);
    expect(notes).toEqual([]);
  });

  it("names every 0 dB crossing when there are several, and a local loop with less margin than the current loop", () => {
    const s = valveCoilDemo();
    const notes = explainFigures(
      s,
      { phaseMarginDeg: 40, crossoverHz: 5e3, crossovers: [1e3, 5e3, 2e4] },
      { phaseMarginDeg: 25, crossoverHz: 8e5, crossovers: [8e5] },
      null,
    );
    expect(notes[0]).toContain("crosses 0 dB 3 times");
    expect(notes[1]).toContain("local loop");
    expect(notes[1]).toContain("25.0°");
  });

  describe("a coil ringing against the capacitance at its terminals is named as the load's, not the loop's", () => {
    // The NPN template with a 10 Ω sense resistor (9.8 mA full scale): a 5 mH coil at the end of 2 m of cable.
    const tenOhm = () => {
      const s = defaultScenario("sink-npn");
      s.parts.senseResistor = 10;
      return s;
    };
    /** The capacitance the linearised step's ring implies with the coil's inductance: C = 1/((2πf)²·L). */
    const implied = (s: Scenario) => {
      const small = runSmallSignalStep(s)!;
      const f = small.metrics.ringing.frequencyHz!;
      const L = s.load.inductance + s.load.cable.lPerM * s.load.cable.length;
      return { small, f, L, C: 1 / ((2 * Math.PI * f) ** 2 * L) };
    };

    it("rings far above the loop's crossover, and the note says whose ringing it is", () => {
      const s = tenOhm();
      const { r, step, notes } = run(s.parts.compCapacitor, s);
      expect(step.small!.metrics.overshootPct).toBeGreaterThan(10);
      expect(step.small!.metrics.ringing.frequencyHz!).toBeGreaterThan(3 * Math.max(...r.loop!.crossovers));
      const note = notes.find((n) => n.includes("the load's, not the loop's"));
      expect(note).toBeDefined();
      expect(note).toContain("the cable's 200 pF");
      expect(note).toContain("Compensate can search one");
    });

    it("the implied capacitance holds the cable's: removing 2 m of 100 pF/m cable takes 200 pF off it (parallel capacitances add)", () => {
      // A parallel L–C tank rings at f = 1/(2π√(LC)) (any circuit-theory text); the cable's capacitance is in
      // parallel with the rest at the coil's terminals, so it adds. The cable's own inductance (1 µH) is 0.02 % of L.
      const withCable = implied(tenOhm());
      const bare = tenOhm();
      bare.load.cable.length = 0;
      const without = implied(bare);
      expect(withCable.C - without.C).toBeGreaterThan(200e-12 * 0.97);
      expect(withCable.C - without.C).toBeLessThan(200e-12 * 1.03);
      // With the coil and the cable alone the tank would ring at 159 kHz; the pass device's capacitance pulls it lower.
      expect(withCable.f).toBeLessThan(1 / (2 * Math.PI * Math.sqrt(5e-3 * 200e-12)));
    });

    it("the series R–C the note suggests (R ≈ √(L/C), C a few times the tank's) damps it, and the note goes", () => {
      const s = tenOhm();
      const { L, C } = implied(s);
      s.networks.loadSnubber = { resistance: nearestE(Math.sqrt(L / C), "E12"), capacitance: nearestE(4 * C, "E12") };
      const { step, notes } = run(s.parts.compCapacitor, s);
      expect(step.small!.metrics.overshootPct).toBeLessThan(1);
      expect(notes.some((n) => n.includes("the load's, not the loop's"))).toBe(false);
    });

    it("the overshoot is judged on the worse step: the card fails on the ring the full step hides, and Compensate judges alike", () => {
      const s = tenOhm();
      s.load.resistanceMin = s.load.resistanceMax = s.load.resistance; // one load corner keeps the search short
      const full = runStep(s).metrics.overshootPct;
      const small = runSmallSignalStep(s)!;
      const target = s.studies.compensate.maxOvershootPct;
      expect(overshootVerdict(full, target)).toBe("pass"); // the clamp holds the full step
      const judged = judgedOvershootPct(full, small);
      expect(judged).toBe(small.metrics.overshootPct);
      expect(overshootVerdict(judged, target)).toBe("fail");
      const settings = { ...s.studies.compensate, tuneLoadSnubber: true };
      const check = checkChoice(s, { compCapacitor: s.parts.compCapacitor, baseResistor: s.parts.baseResistor }, settings);
      expect(check.worstOvershootPct).toBeCloseTo(judged, 6);
      expect(check.meetsTargets).toBe(false);
      // No compensation capacitor damps the load's own ring; the load snubber search finds an R–C near the note's
      // suggestion (R within a factor of two of √(L/C), C between the tank's and ten times it), and it meets the target.
      const plain = compensate(s, { ...settings, tuneLoadSnubber: false });
      expect(plain.chosen).toBeNull();
      expect(plain.message).toContain("ask for a load snubber too");
      const r = compensate(s, settings);
      expect(r.chosen === null || r.chosen.worstOvershootPct <= target).toBe(true);
      const snub = r.loadSnubber!.chosen!;
      const { L, C } = implied(s);
      expect(snub.resistance / Math.sqrt(L / C)).toBeGreaterThan(0.5);
      expect(snub.resistance / Math.sqrt(L / C)).toBeLessThan(2);
      expect(snub.capacitance).toBeGreaterThanOrEqual(C);
      expect(snub.capacitance).toBeLessThanOrEqual(10 * C);
      expect(snub.check?.meetsTargets).toBe(true);
    }, 60_000);

    it("settling is judged on the slower step too: the ring's decay, which a second-order envelope predicts", () => {
      const s = tenOhm();
      const full = runStep(s).metrics;
      const small = runSmallSignalStep(s)!;
      const judged = judgedSettling(full, small);
      expect(judged.small).toBe(true);
      expect(judged.settlingTime1pct).toBe(small.metrics.settlingTime1pct);
      expect(judged.settlingTime1pct!).toBeGreaterThan(full.settlingTime1pct!);
      // An underdamped second-order response decays inside the envelope OS·e^(−ζω_n·t) after its peak (any control
      // text, e.g. Ogata): it is inside ±1 % from about t_p + ln(OS / 1 %)/(ζω_n), here with ζ and f from the ringing fit.
      const { dampingRatio: z, frequencyHz: f } = small.metrics.ringing;
      const wn = (2 * Math.PI * f!) / Math.sqrt(1 - z! ** 2);
      const envelope = small.metrics.peakTime! + Math.log(small.metrics.overshootPct / 1) / (z! * wn);
      expect(judged.settlingTime1pct! / envelope).toBeGreaterThan(0.85);
      expect(judged.settlingTime1pct! / envelope).toBeLessThan(1.15);
    });

    it("says nothing of a resistive load, a step that grows, or a ring near the loop's crossover", () => {
      const s = tenOhm();
      const { metrics } = runSmallSignalStep(s)!;
      const step = { time: [0], vOpampOut: [0], vPass: [0], metrics, small: { metrics, grows: false } };
      const loop = { phaseMarginDeg: 60, crossoverHz: 5e3, crossovers: [5e3] };
      expect(loadTankNote(s, loop, step)).not.toBeNull();
      expect(loadTankNote({ ...s, load: { ...s.load, kind: "resistor" } }, loop, step)).toBeNull();
      expect(loadTankNote(s, loop, { ...step, small: { ...step.small, grows: true } })).toBeNull();
      expect(loadTankNote(s, { ...loop, crossoverHz: 50e3, crossovers: [50e3] }, step)).toBeNull();
    });
  });
});
