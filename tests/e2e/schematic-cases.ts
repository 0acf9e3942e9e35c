/**
 * The scenarios the schematic-label check draws: every template as it starts, every template with all its optional
 * networks, and the other load kinds and clamps.
 */
import { TEMPLATES, defaultScenario, passPreset } from "@/lib/design";
import type { Scenario, TemplateId } from "@/lib/design/schema";

/** Every optional network fitted, with a coil load behind a diode + Zener clamp (values are common practice). */
function everyNetwork(template: TemplateId, edit: (s: Scenario) => void = () => undefined): Scenario {
  const s = defaultScenario(template);
  s.load = { ...s.load, kind: "coil", resistance: 20, resistanceMin: 18, resistanceMax: 24, inductance: 10e-3, clamp: { kind: "diode-zener", zenerVoltage: 18 } };
  s.networks = {
    loadSnubber: { resistance: 47, capacitance: 100e-9 },
    passSnubber: template === "howland" ? null : { resistance: 100, capacitance: 10e-9 },
    baseEmitterResistor: template === "howland" ? null : 10e3,
    feedbackCapacitor: template === "howland" ? null : 1e-9,
  };
  edit(s);
  return s;
}

function withLoad(template: TemplateId, load: Partial<Scenario["load"]>): Scenario {
  const s = defaultScenario(template);
  s.load = { ...s.load, ...load };
  return s;
}

/**
 * Every template as it starts; every template with all its optional networks and a coil with a diode + Zener clamp;
 * the other load kinds and clamps; the high-side source with a P-MOSFET.
 */
export const SCHEMATIC_CASES: { name: string; scenario: Scenario }[] = [
  ...TEMPLATES.map((t) => ({ name: t.id, scenario: defaultScenario(t.id) })),
  ...TEMPLATES.map((t) => ({ name: `${t.id}, every network, coil with diode + Zener clamp`, scenario: everyNetwork(t.id) })),
  {
    name: "source-highside, P-MOSFET, every network, coil with diode + Zener clamp",
    scenario: everyNetwork("source-highside", (s) => {
      s.pass = passPreset("P-MOSFET 60 V");
    }),
  },
  { name: "sink-npn, coil with diode clamp", scenario: withLoad("sink-npn", { kind: "coil", resistance: 20, inductance: 10e-3, clamp: { kind: "diode", zenerVoltage: 24 } }) },
  { name: "sink-nmos, LED string", scenario: withLoad("sink-nmos", { kind: "led", ledCount: 12, resistance: 4.7 }) },
  { name: "sink-darlington, cell under test", scenario: withLoad("sink-darlington", { kind: "cell", cellVoltage: 3.7, cellVoltageMin: 3, cellVoltageMax: 4.2, resistance: 0.05, resistanceMin: 0.05, resistanceMax: 0.05 }) },
  { name: "source-highside, LED string", scenario: withLoad("source-highside", { kind: "led", ledCount: 6, resistance: 10 }) },
  { name: "source-highside, cell under test", scenario: withLoad("source-highside", { kind: "cell", cellVoltage: 3.7, cellVoltageMin: 3, cellVoltageMax: 4.2, resistance: 0.05, resistanceMin: 0.05, resistanceMax: 0.05 }) },
  { name: "howland, LED string", scenario: withLoad("howland", { kind: "led", ledCount: 2, resistance: 10 }) },
  { name: "howland, cell under test", scenario: withLoad("howland", { kind: "cell", cellVoltage: 1.2, cellVoltageMin: 1, cellVoltageMax: 1.4, resistance: 0.1, resistanceMin: 0.1, resistanceMax: 0.1 }) },
];
