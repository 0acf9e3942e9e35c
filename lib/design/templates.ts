/**
 * The five current-source templates: what each is, which part values it shows, and a sensible starting scenario.
 * The netlists themselves are built in compile.ts.
 */
import { passPreset, opampPreset } from "./presets";
import { SCHEMA_VERSION, type Parts, type Scenario, type TemplateId } from "./schema";

export type { TemplateId } from "./schema";

/** One part-value field the workbench shows. */
export interface PartSpec {
  key: keyof Parts;
  label: string;
  unit: string;
  kind: "resistor" | "capacitor" | "other";
  /** allowed range, SI */
  min: number;
  max: number;
}

export interface TemplateInfo {
  id: TemplateId;
  title: string;
  description: string;
  passElement: "npn" | "darlington" | "nmos" | "pnp" | "pmos" | "opamp";
  parts: PartSpec[];
}

const R = (key: keyof Parts, label: string, min = 0.01, max = 10e6): PartSpec => ({ key, label, unit: "Ω", kind: "resistor", min, max });
const C = (key: keyof Parts, label: string): PartSpec => ({ key, label, unit: "F", kind: "capacitor", min: 0, max: 10e-6 });

const SINK_PARTS: PartSpec[] = [
  R("dividerTop", "Divider top", 0, 10e6),
  R("dividerBottom", "Divider bottom", 1, 10e6),
  R("baseResistor", "Base resistor", 1, 1e6),
  R("feedbackResistor", "Feedback resistor", 1, 10e6),
  C("compCapacitor", "Compensation capacitor"),
  R("senseResistor", "Sense resistor", 1e-3, 10e3),
];

export const TEMPLATES: readonly TemplateInfo[] = [
  {
    id: "sink-npn",
    title: "Low-side sink, NPN",
    description:
      "Op-amp drives an NPN through a base resistor; the sense resistor to ground sets the current; feedback resistor from the sense node and compensation capacitor from the op-amp output to the inverting input; the load sits on its own supply.",
    passElement: "npn",
    parts: SINK_PARTS,
  },
  {
    id: "sink-darlington",
    title: "Low-side sink, Darlington",
    description:
      "As the NPN sink with a Darlington pair: far less base current for amperes of load current, at the cost of a higher drop and a slower pass stage.",
    passElement: "darlington",
    parts: [...SINK_PARTS, R("darlingtonResistor", "Output B–E resistor", 1, 1e6)],
  },
  {
    id: "sink-nmos",
    title: "Low-side sink, N-MOSFET",
    description:
      "As the NPN sink with an N-channel MOSFET and a gate resistor: no base-current error; the gate capacitance and gate resistor shape the loop.",
    passElement: "nmos",
    parts: SINK_PARTS.map((p) => (p.key === "baseResistor" ? { ...p, label: "Gate resistor" } : p)),
  },
  {
    id: "source-highside",
    title: "High-side source, PNP or P-MOSFET",
    description:
      "For grounded loads: the sense resistor sits between the supply and the emitter (or source) of a PNP or P-MOSFET; the command sets the drop across it, referred to the supply rail.",
    passElement: "pnp",
    parts: SINK_PARTS,
  },
  {
    id: "howland",
    title: "Improved Howland pump",
    description:
      "Bidirectional op-amp-only source for small currents into a grounded load: I = Vcommand·R2/(R1·Rs) when R4/R3 = R2/R1.",
    passElement: "opamp",
    parts: [
      R("howlandR1", "R1 (command to +in)", 10, 10e6),
      R("howlandR2", "R2 (+in to load)", 10, 10e6),
      R("howlandR3", "R3 (−in to ground)", 10, 10e6),
      R("howlandR4", "R4 (output to −in)", 10, 10e6),
      C("compCapacitor", "Compensation capacitor"),
      R("senseResistor", "Sense resistor", 0.1, 100e3),
    ],
  },
];

export function templateInfo(id: TemplateId): TemplateInfo {
  const t = TEMPLATES.find((x) => x.id === id);
  if (!t) throw new Error(`Unknown template "${id}"`);
  return t;
}

/**
 * The reference sink the templates start from: a precision op-amp on 15 V, 0.1 % divider resistors, a 1 % sense
 * resistor of 0.1 Ω, a 24 Ω + 5 mH coil via 2 m of cable on 30 V (1.04 A full scale). Each template then makes it a
 * sound design of its own kind: every check passes out of the box (the demos fail on purpose, not the templates).
 */
function referenceSink(): Scenario {
  return {
    schemaVersion: SCHEMA_VERSION,
    template: "sink-npn",
    parts: {
      dividerTop: 47e3,
      dividerBottom: 1e3,
      baseResistor: 220,
      feedbackResistor: 10e3,
      compCapacitor: 2.2e-9,
      senseResistor: 0.1,
      darlingtonResistor: 1e3,
      howlandR1: 10e3,
      howlandR2: 10e3,
      howlandR3: 10e3,
      howlandR4: 10e3,
    },
    // A 3 mV general-purpose offset alone is 3 % of the 104 mV across the sense resistor: a 5 % budget needs precision.
    opamp: opampPreset("Precision 3 MHz rail-to-rail"),
    pass: passPreset("Medium power NPN 60 V"),
    load: {
      kind: "coil",
      resistance: 24,
      // The coil's winding from cold to hot; a shorted load is a fault, not a load to design for.
      resistanceMin: 20,
      resistanceMax: 26,
      inductance: 5e-3,
      clamp: { kind: "diode", zenerVoltage: 24 },
      ledCount: 1,
      ledIs: 5e-20,
      ledN: 2.5,
      laserEmitter: false,
      cellVoltage: 0,
      cellVoltageMin: 0,
      cellVoltageMax: 0,
      lithium: false,
      extraCapacitance: 0,
      cable: { length: 2, rPerM: 0.0175, lPerM: 0.5e-6, cPerM: 100e-12, sections: 2 },
      stepResistance: 24,
    },
    networks: { loadSnubber: null, passSnubber: null, baseEmitterResistor: null, feedbackCapacitor: null },
    supplies: { load: 30, opampPositive: 15, opampNegative: 0 },
    stimulus: {
      kind: "command-step",
      // From 10 % of full scale: the pass device is already conducting, so the step shows the loop (what the margins
      // describe), not the op-amp winding up from zero until the transistor turns on.
      commandLow: 0.5,
      commandHigh: 5,
      commandFullScale: 5,
      stepTime: 0.2e-3,
      rampTime: 0.5e-3,
      edgeTime: 1e-6,
      supplyStep: -5,
      stopTime: 10e-3,
      sourceResistance: 0,
      sourceCurrentLimit: 5e-3,
    },
    thermal: { ambient: 40, thetaCS: 0.5, thetaSA: 2, senseRating: 3, senseThetaA: 50 },
    tolerances: {
      // 0.1 % / 25 ppm/K thin-film divider; the sense resistor 1 %.
      resistor: 0.001,
      sense: 0.01,
      capacitor: 0.1,
      resistorTempco: 25e-6,
      temperatureSpan: 30,
      accuracyTarget: 0.05,
      distribution: "normal",
    },
    studies: {
      sweep: { path: "parts.compCapacitor", from: 100e-12, to: 22e-9, points: 7, scale: "log", values: [] },
      map: {
        x: { path: "parts.compCapacitor", from: 100e-12, to: 22e-9, points: 16, scale: "log", values: [] },
        y: { path: "load.cable.length", from: 0.5, to: 20, points: 16, scale: "log", values: [] },
        metric: "overshootPct",
      },
      spread: { runs: 200, seed: 1, },
      compensate: { targetPhaseMarginDeg: 60, maxOvershootPct: 5, series: "E12", tuneBaseResistor: false, tuneLoadSnubber: false },
    },
  };
}

/** A complete, sensible starting scenario for a template. */
export function defaultScenario(templateId: TemplateId): Scenario {
  const s = referenceSink();
  s.template = templateId;
  switch (templateId) {
    case "sink-npn":
      // β ≥ 30 would cost up to 3.2 % in base current and 35 mA of op-amp drive at 1 A: a high-gain NPN at half an
      // ampere (β ≥ 100: ≤ 1 % and 5 mA), on an 18 V coil supply that keeps the worst-case dissipation near 4 W.
      s.pass = passPreset("High-gain power NPN 60 V");
      // k = 1k/(49.9k + 1k); 5 V → 98 mV across 0.2 Ω → 0.49 A.
      s.parts.dividerTop = 49.9e3;
      s.parts.dividerBottom = 1e3;
      s.parts.senseResistor = 0.2;
      s.supplies = { ...s.supplies, load: 18 };
      s.stimulus.stopTime = 3e-3;
      break;
    case "sink-darlington":
      s.parts.baseResistor = 1e3;
      s.parts.compCapacitor = 4.7e-9;
      break;
    case "sink-nmos":
      s.pass = passPreset("Logic-level N-MOSFET 60 V");
      s.parts.baseResistor = 100;
      s.parts.compCapacitor = 4.7e-9;
      break;
    case "source-highside":
      s.pass = passPreset("High-gain power PNP 60 V");
      s.supplies = { load: 24, opampPositive: 24, opampNegative: 0 };
      s.load = { ...s.load, kind: "resistor", resistance: 10, resistanceMin: 5, resistanceMax: 10, inductance: 0, clamp: { kind: "none", zenerVoltage: 24 } };
      // k = 1k/(49.9k + 1k); 5 V → 98 mV across 0.2 Ω → 0.49 A.
      s.parts.dividerTop = 49.9e3;
      s.parts.dividerBottom = 1e3;
      s.parts.baseResistor = 470;
      s.parts.compCapacitor = 2.2e-9;
      s.parts.senseResistor = 0.2;
      break;
    case "howland":
      s.opamp = opampPreset("Fast 10 MHz dual-supply");
      s.supplies = { load: 0, opampPositive: 15, opampNegative: -15 };
      s.parts.senseResistor = 100;
      s.parts.compCapacitor = 22e-12;
      s.load = {
        ...s.load,
        kind: "resistor",
        resistance: 100,
        resistanceMin: 0,
        resistanceMax: 500,
        inductance: 0,
        clamp: { kind: "none", zenerVoltage: 24 },
        cable: { ...s.load.cable, length: 0 },
        stepResistance: 100,
      };
      s.stimulus = { ...s.stimulus, commandLow: 0, commandHigh: 1, commandFullScale: 1, stepTime: 20e-6, rampTime: 50e-6, stopTime: 200e-6, edgeTime: 0.1e-6 };
      s.studies.sweep = { path: "parts.compCapacitor", from: 1e-12, to: 1e-9, points: 7, scale: "log", values: [] };
      s.studies.map.x = { ...s.studies.map.x, from: 1e-12, to: 1e-9 };
      s.studies.map.y = { path: "load.resistance", from: 10, to: 500, points: 16, scale: "log", values: [] };
      break;
  }
  return s;
}
