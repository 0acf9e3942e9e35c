import { NAMES } from "@/lib/design/compile";
import { describe, expect, it } from "vitest";
import { parseNetlist } from "@/lib/sim";
import {
  TEMPLATES, accuracyBudget, compileNetlist, defaultScenario, demoScenarios, fullScaleCurrent, idealTransconductance, passPreset, runOperatingPoint,
  type Scenario, type TemplateId,
} from "@/lib/design";

describe("templates compile to netlists the engine accepts", () => {
  const purposes = ["op", "step", "loopgain-v", "loopgain-i", "closedloop", "zout", "dcsweep"] as const;
  it.each(TEMPLATES.map((t) => t.id))("%s: every purpose validates", (id) => {
    const s = defaultScenario(id);
    for (const p of purposes) expect(() => parseNetlist(compileNetlist(s, p))).not.toThrow();
  });
  it("every demo compiles for every purpose", () => {
    for (const d of demoScenarios()) for (const p of purposes) expect(() => parseNetlist(compileNetlist(d.body, p))).not.toThrow();
  });
});

/** The operating-point current against the textbook transfer, as a fraction of full scale. */
function dcError(s: Scenario): number {
  const { summary } = runOperatingPoint(s);
  expect(summary.opampLimiting).toBe(false);
  return (summary.iLoad - idealTransconductance(s) * s.stimulus.commandHigh) / fullScaleCurrent(s);
}

// Reference: the textbook transfer I = Vcommand·k/Rsense (Howland: Vcommand·R2/(R1·Rs)); the simulated current must
// lie within the worst-case DC budget the checks predict (offset, bias, tolerances at nominal are zero here, so
// what remains is the base-current error, finite gain and drift-free terms: well inside the budget).
describe("each template's DC current matches Vcommand·k/Rsense within the predicted budget", () => {
  it.each(["sink-npn", "sink-darlington", "sink-nmos", "source-highside", "howland"] as TemplateId[])("%s", (id) => {
    const s = defaultScenario(id);
    const err = dcError(s);
    expect(Math.abs(err)).toBeLessThanOrEqual(accuracyBudget(s).worstCase);
  });
  it("source-highside with a P-MOSFET", () => {
    const s = defaultScenario("source-highside");
    s.pass = passPreset("P-MOSFET 60 V");
    expect(Math.abs(dcError(s))).toBeLessThanOrEqual(accuracyBudget(s).worstCase);
  });
  it.each(demoScenarios().map((d) => [d.key, d.body] as const))("the %s demo", (_key, s) => {
    expect(Math.abs(dcError(s))).toBeLessThanOrEqual(accuracyBudget(s).worstCase);
  });
});

// Reference: the emitter carries Ie = Ic + Ib = Ic·(β+1)/β, so the load (collector) gets Ie·β/(β+1): the error is
// −1/(β+1) of the regulated current (Sedra & Smith, BJT current relations).
describe("base-current error ≈ 1/(β+1)", () => {
  it.each([20, 60, 200])("βF = %d", (beta) => {
    const s = defaultScenario("sink-npn");
    s.pass = { ...s.pass, betaF: beta, VA: null };
    s.load.cable.length = 0;
    const { op } = runOperatingPoint(s);
    const iLoad = op.currents[NAMES.ammeter];
    const iEmitter = op.currents[NAMES.sense];
    expect(1 - iLoad / iEmitter).toBeCloseTo(1 / (beta + 1), 6);
  });
  it("a MOSFET has no such error: the drain current equals the sense current", () => {
    const s = defaultScenario("sink-nmos");
    s.load.cable.length = 0;
    const { op } = runOperatingPoint(s);
    expect(op.currents[NAMES.ammeter] / op.currents[NAMES.sense]).toBeCloseTo(1, 9);
  });
});
