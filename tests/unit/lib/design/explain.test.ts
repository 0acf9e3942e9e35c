import { describe, expect, it } from "vitest";
import { valveCoilDemo } from "@/lib/design/demos";
import { explainFigures } from "@/lib/design/explain";
import { idealTransconductance } from "@/lib/design/compile";
import { POLICIES, runScenario } from "@/lib/design/scenario-run";

/** "Why the figures disagree" states what the records show, and stays silent when the figures tell one story. */
function run(cc: number) {
  const s = valveCoilDemo();
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
});
