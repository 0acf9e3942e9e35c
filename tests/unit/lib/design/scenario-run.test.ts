import { describe, expect, it } from "vitest";
import { AnalysisError, POLICIES, runScenario } from "@/lib/design/scenario-run";
import { valveCoilDemo } from "@/lib/design/demos";

/** One way into the engine: the caller's policy says which analyses run and which may fail alone. */
describe("runScenario", () => {
  it("the review policy runs the operating point, the step (with its small-signal step) and the loop gain, and the checks", () => {
    const r = runScenario(valveCoilDemo(), { ...POLICIES.review, budgetMs: 30_000 });
    expect(r.op).not.toBeNull();
    expect(r.step?.small).not.toBeNull();
    expect(r.loop?.loops.local).not.toBeNull();
    expect(r.closed).toBeNull(); // not asked for
    expect(r.checks.map((c) => c.id)).toContain("accuracy");
    expect(r.failures).toEqual([]);
  });

  it("a required analysis that fails fails the run, naming it; an optional one is reported in failures", () => {
    const s = valveCoilDemo();
    // A budget the engine cannot meet makes every analysis fail the same way.
    expect(() => runScenario(s, { ...POLICIES.review, budgetMs: 0 })).toThrow(AnalysisError);
    expect(() => runScenario(s, { ...POLICIES.review, budgetMs: 0 })).toThrow(/^Operating point: /);
    const r = runScenario(s, { analyses: ["closedLoop", "outputImpedance"], required: [], checks: true, budgetMs: 0 });
    expect(r.failures.map((f) => f.analysis)).toEqual(["Closed loop", "Output impedance"]);
    expect(r.checks.length).toBeGreaterThan(0); // the checks still run (without an operating point)
  });

  it("a cancellation passes through untouched, whatever the policy", () => {
    const run = () => runScenario(valveCoilDemo(), { analyses: ["step"], required: [], checks: false, budgetMs: 30_000, shouldStop: () => true });
    expect(run).toThrow(/cancelled/i);
  });
});
