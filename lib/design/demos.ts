/**
 * The demo team's scenarios (invented for the demo; not reference data).
 * Minimal records until the design layer's scenario schema lands.
 */
export interface DemoScenario {
  key: string;
  title: string;
  template: string;
  note: string;
  body: Record<string, unknown>;
}

export function demoScenarios(): DemoScenario[] {
  return [
    {
      key: "valve-coil",
      title: "Valve coil driver",
      template: "sink-npn",
      note: "0–5 V DAC command, 0–750 mA into a 24 V proportional-valve coil (≈18 Ω, 40 mH) at the end of 4 m of two-wire cable.",
      body: { schemaVersion: 0, template: "sink-npn" },
    },
    {
      key: "grow-light",
      title: "Grow-light channel",
      template: "sink-nmos",
      note: "0–3.3 V commands 0–1.5 A through a string of ten white LEDs on a 48 V rail.",
      body: { schemaVersion: 0, template: "sink-nmos" },
    },
    {
      key: "cell-test",
      title: "Cell-test load",
      template: "sink-nmos",
      note: "0–10 V commands a 0–3 A electronic load discharging one lithium cell (4.2 V to 3.0 V) through 1 m of leads.",
      body: { schemaVersion: 0, template: "sink-nmos" },
    },
  ];
}
