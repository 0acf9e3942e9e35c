/**
 * The demo team's scenarios: invented for the demo (our own designs, not reference data), complete scenarios of the
 * current schema.
 */
import { opampPreset, passPreset } from "./presets";
import type { Scenario, TemplateId } from "./schema";
import { defaultScenario } from "./templates";

export interface DemoScenario {
  key: string;
  title: string;
  template: TemplateId;
  note: string;
  body: Scenario;
}

/** 0–5 V DAC → 0–750 mA into a 24 V proportional-valve coil (18 Ω, 40 mH) at the end of 4 m of two-wire cable. */
export function valveCoilDemo(): Scenario {
  const s = defaultScenario("sink-npn");
  s.parts = {
    ...s.parts,
    // k = 1k/(5.62k + 1k) = 0.151; 5 V → 0.755 V across 1 Ω → 755 mA.
    dividerTop: 5.62e3,
    dividerBottom: 1e3,
    baseResistor: 220,
    feedbackResistor: 10e3,
    // A small compensation capacitor: the loop rings with the coil and cable — the thing to tune.
    compCapacitor: 47e-12,
    senseResistor: 1,
  };
  s.opamp = opampPreset("General 1 MHz single-supply");
  s.pass = passPreset("Medium power NPN 60 V");
  s.supplies = { load: 24, opampPositive: 12, opampNegative: 0 };
  s.load = {
    ...s.load,
    kind: "coil",
    resistance: 18,
    // Copper winding from a cold start (−20 °C) to hot (+90 °C).
    resistanceMin: 15,
    resistanceMax: 24,
    inductance: 40e-3,
    clamp: { kind: "diode", zenerVoltage: 24 },
    extraCapacitance: 0,
    cable: { length: 4, rPerM: 0.025, lPerM: 0.6e-6, cPerM: 80e-12, sections: 2 },
    stepResistance: 18,
  };
  s.stimulus = {
    ...s.stimulus,
    kind: "command-step",
    commandLow: 3,
    commandHigh: 3.3,
    commandFullScale: 5,
    stepTime: 0.1e-3,
    edgeTime: 0.2e-6,
    stopTime: 3e-3,
    sourceResistance: 10,
    sourceCurrentLimit: 5e-3,
  };
  s.thermal = { ambient: 50, thetaCS: 0.5, thetaSA: 3, senseRating: 3, senseThetaA: 40 };
  // 0.1 % divider, 0.5 % sense; the NPN's base current (β ≥ 30) dominates the budget, so 6 % is the target.
  s.tolerances = { ...s.tolerances, resistor: 0.001, sense: 0.005, resistorTempco: 25e-6, accuracyTarget: 0.06 };
  s.studies.sweep = { path: "parts.compCapacitor", from: 47e-12, to: 10e-9, points: 7, scale: "log", values: [] };
  s.studies.map.x = { path: "parts.compCapacitor", from: 47e-12, to: 10e-9, points: 16, scale: "log", values: [] };
  s.studies.map.y = { path: "load.cable.length", from: 0.5, to: 30, points: 16, scale: "log", values: [] };
  return s;
}

/** 0–3.3 V → 0–1.5 A through ten white LEDs in series on a 48 V rail. */
export function growLightDemo(): Scenario {
  const s = defaultScenario("sink-nmos");
  s.parts = {
    ...s.parts,
    // k = 1k/(10k + 1k); 3.3 V → 0.3 V across 0.2 Ω → 1.5 A.
    dividerTop: 10e3,
    dividerBottom: 1e3,
    baseResistor: 100,
    feedbackResistor: 10e3,
    compCapacitor: 2.2e-9,
    senseResistor: 0.2,
  };
  s.opamp = opampPreset("General 1 MHz single-supply");
  s.pass = passPreset("Standard N-MOSFET 100 V");
  s.supplies = { load: 48, opampPositive: 12, opampNegative: 0 };
  s.load = {
    ...s.load,
    kind: "led",
    ledCount: 10,
    // One white LED: about 3.0 V at 1.5 A (Is and n ours, fitted to that point).
    ledIs: 5e-20,
    ledN: 2.6,
    // Ballast resistor in series with the string, taking some of the heat off the MOSFET.
    resistance: 6.8,
    resistanceMin: 6.8,
    resistanceMax: 6.8,
    inductance: 0,
    clamp: { kind: "none", zenerVoltage: 24 },
    extraCapacitance: 0,
    cable: { length: 1.5, rPerM: 0.0175, lPerM: 0.6e-6, cPerM: 60e-12, sections: 1 },
    stepResistance: 100,
  };
  s.stimulus = {
    ...s.stimulus,
    kind: "command-step",
    commandLow: 0.33,
    commandHigh: 3.3,
    commandFullScale: 3.3,
    stepTime: 50e-6,
    edgeTime: 0.5e-6,
    stopTime: 0.5e-3,
    sourceResistance: 0,
    sourceCurrentLimit: 2e-3,
  };
  s.thermal = { ambient: 45, thetaCS: 0.3, thetaSA: 2.5, senseRating: 2, senseThetaA: 50 };
  s.tolerances = { ...s.tolerances, resistor: 0.005, accuracyTarget: 0.05 };
  s.studies.sweep = { path: "parts.compCapacitor", from: 220e-12, to: 22e-9, points: 7, scale: "log", values: [] };
  s.studies.map.y = { path: "load.cable.length", from: 0.5, to: 10, points: 16, scale: "log", values: [] };
  return s;
}

/** 0–10 V → 0–3 A electronic load discharging one lithium cell (4.2 V to 3.0 V) through 1 m of leads. */
export function cellTestDemo(): Scenario {
  const s = defaultScenario("sink-nmos");
  s.parts = {
    ...s.parts,
    // k = 1k/(32.4k + 1k) = 0.02994; 10 V → 0.2994 V across 0.1 Ω → 2.994 A.
    dividerTop: 32.4e3,
    dividerBottom: 1e3,
    // 220 Ω with the gate capacitance damps the resonance of the leads' inductance (47 Ω leaves 13° of margin).
    baseResistor: 220,
    feedbackResistor: 4.7e3,
    compCapacitor: 4.7e-9,
    senseResistor: 0.1,
  };
  s.opamp = opampPreset("Precision 3 MHz rail-to-rail");
  s.pass = passPreset("Logic-level N-MOSFET 60 V");
  // The cell is the source of the load current; no other supply in its loop.
  s.supplies = { load: 0, opampPositive: 12, opampNegative: 0 };
  s.load = {
    ...s.load,
    kind: "cell",
    cellVoltage: 3.7,
    cellVoltageMin: 3.0,
    cellVoltageMax: 4.2,
    lithium: true,
    // Internal resistance of the cell, Ω.
    resistance: 0.05,
    resistanceMin: 0.03,
    resistanceMax: 0.08,
    inductance: 0,
    clamp: { kind: "none", zenerVoltage: 24 },
    extraCapacitance: 0,
    // 1 m of 1.5 mm² leads: both conductors in the loop.
    cable: { length: 1, rPerM: 0.012, lPerM: 0.8e-6, cPerM: 50e-12, sections: 1 },
    stepResistance: 10,
  };
  s.stimulus = {
    ...s.stimulus,
    kind: "command-step",
    commandLow: 1,
    commandHigh: 10,
    commandFullScale: 10,
    stepTime: 20e-6,
    edgeTime: 0.2e-6,
    stopTime: 0.3e-3,
    sourceResistance: 0,
    sourceCurrentLimit: 1e-3,
  };
  s.thermal = { ambient: 30, thetaCS: 0.3, thetaSA: 3, senseRating: 3, senseThetaA: 40 };
  s.tolerances = { ...s.tolerances, resistor: 0.001, sense: 0.002, resistorTempco: 25e-6, accuracyTarget: 0.01 };
  s.studies.sweep = { path: "parts.compCapacitor", from: 470e-12, to: 47e-9, points: 7, scale: "log", values: [] };
  s.studies.map.y = { path: "load.cable.length", from: 0.2, to: 5, points: 16, scale: "log", values: [] };
  return s;
}

export function demoScenarios(): DemoScenario[] {
  return [
    {
      key: "valve-coil",
      title: "Valve coil driver",
      template: "sink-npn",
      note: "0–5 V DAC command, 0–750 mA into a 24 V proportional-valve coil (≈18 Ω, 40 mH) at the end of 4 m of two-wire cable.",
      body: valveCoilDemo(),
    },
    {
      key: "grow-light",
      title: "Grow-light channel",
      template: "sink-nmos",
      note: "0–3.3 V commands 0–1.5 A through a string of ten white LEDs on a 48 V rail.",
      body: growLightDemo(),
    },
    {
      key: "cell-test",
      title: "Cell-test load",
      template: "sink-nmos",
      note: "0–10 V commands a 0–3 A electronic load discharging one lithium cell (4.2 V to 3.0 V) through 1 m of leads.",
      body: cellTestDemo(),
    },
  ];
}
