/**
 * Generic op-amp and pass-device presets with names of our own. The figures are typical of their class, chosen by
 * us for design exploration; they describe no particular product. Noise: white input voltage and current noise
 * densities (V/√Hz, A/√Hz) and their 1/f corners (Hz), also typical of each class and our own.
 */
import type { OpampParams, PassParams } from "./schema";

/** A built-in preset: the values without a team part behind them. */
export type OpampPreset = Omit<OpampParams, "part">;
export type PassPreset = Omit<PassParams, "part">;

export const OPAMP_PRESETS: readonly OpampPreset[] = [
  {
    preset: "General 1 MHz single-supply",
    Aol: 2e5, GBW: 1e6, fp2: null, Rout: 40, slewRate: 0.5e6, Vos: 0, Ib: 0,
    // Single-supply class: the output reaches ground but stays 1.2 V below the positive rail.
    swingHigh: 1.2, swingLow: 0.05, Iout: 0.025,
    vosMax: 3e-3, ibMax: 100e-9, vosDrift: 7e-6, cmLowFromVee: -0.3, cmHighFromVcc: 1.5,
    supplyMin: 3, supplyMax: 32, swingCurrent: 0.01,
    noiseVoltage: 35e-9, noiseVoltageCorner: 200, noiseCurrent: 0.4e-12, noiseCurrentCorner: 300,
  },
  {
    preset: "Precision 3 MHz rail-to-rail",
    Aol: 1e6, GBW: 3e6, fp2: 20e6, Rout: 60, slewRate: 1.5e6, Vos: 0, Ib: 0,
    swingHigh: 0.05, swingLow: 0.05, Iout: 0.04,
    vosMax: 50e-6, ibMax: 1e-9, vosDrift: 0.5e-6, cmLowFromVee: -0.1, cmHighFromVcc: -0.1,
    supplyMin: 2.7, supplyMax: 36, swingCurrent: 0.01,
    noiseVoltage: 9e-9, noiseVoltageCorner: 10, noiseCurrent: 0.2e-12, noiseCurrentCorner: 50,
  },
  {
    preset: "Fast 10 MHz dual-supply",
    Aol: 2e5, GBW: 10e6, fp2: 40e6, Rout: 30, slewRate: 20e6, Vos: 0, Ib: 0,
    swingHigh: 1.5, swingLow: 1.5, Iout: 0.03,
    vosMax: 1e-3, ibMax: 200e-9, vosDrift: 5e-6, cmLowFromVee: 2, cmHighFromVcc: 2,
    supplyMin: 10, supplyMax: 36, swingCurrent: 0.01,
    noiseVoltage: 7e-9, noiseVoltageCorner: 1e3, noiseCurrent: 1.5e-12, noiseCurrentCorner: 2e3,
  },
];

/** Fields a BJT preset does not use still carry harmless MOSFET defaults, and the other way round. */
const BJT_UNUSED = { Vth: 2, K: 1, lambda: 0, Cgs: 0, Cgd: 0 };
const MOS_UNUSED = { Is: 1e-14, betaF: 100, betaR: 1, VA: null, Cje0: 0, Cjc0: 0, tauF: 0, betaMin: 100, vSat: 0 };

export const PASS_PRESETS: readonly PassPreset[] = [
  {
    preset: "Medium power NPN 60 V", kind: "npn",
    Is: 2e-12, betaF: 60, betaR: 2, VA: 80, Cje0: 600e-12, Cjc0: 150e-12, tauF: 40e-9, betaMin: 30,
    ...BJT_UNUSED,
    vMax: 60, iMax: 4, pMax: 40, vSat: 0.5, thetaJC: 3.1, thetaJA: 62, tjMax: 150, soaCornerVoltage: 30,
  },
  {
    // Heat-sinkable low-saturation class with a high current gain at amperes: what a 5 % NPN sink needs.
    preset: "High-gain power NPN 60 V", kind: "npn",
    Is: 1e-12, betaF: 250, betaR: 4, VA: 100, Cje0: 300e-12, Cjc0: 50e-12, tauF: 1.5e-9, betaMin: 100,
    ...BJT_UNUSED,
    vMax: 60, iMax: 3, pMax: 25, vSat: 0.3, thetaJC: 5, thetaJA: 62, tjMax: 150, soaCornerVoltage: 30,
  },
  {
    preset: "Small-signal NPN 40 V", kind: "npn",
    Is: 1e-14, betaF: 200, betaR: 4, VA: 100, Cje0: 25e-12, Cjc0: 8e-12, tauF: 0.4e-9, betaMin: 100,
    ...BJT_UNUSED,
    vMax: 40, iMax: 0.2, pMax: 0.6, vSat: 0.2, thetaJC: 80, thetaJA: 200, tjMax: 150, soaCornerVoltage: null,
  },
  {
    preset: "Medium power PNP 60 V", kind: "pnp",
    Is: 2e-12, betaF: 60, betaR: 2, VA: 80, Cje0: 700e-12, Cjc0: 200e-12, tauF: 50e-9, betaMin: 30,
    ...BJT_UNUSED,
    vMax: 60, iMax: 4, pMax: 40, vSat: 0.5, thetaJC: 3.1, thetaJA: 62, tjMax: 150, soaCornerVoltage: 30,
  },
  {
    preset: "High-gain power PNP 60 V", kind: "pnp",
    Is: 1e-12, betaF: 250, betaR: 4, VA: 100, Cje0: 350e-12, Cjc0: 70e-12, tauF: 2e-9, betaMin: 100,
    ...BJT_UNUSED,
    vMax: 60, iMax: 3, pMax: 25, vSat: 0.3, thetaJC: 5, thetaJA: 62, tjMax: 150, soaCornerVoltage: 30,
  },
  {
    preset: "Logic-level N-MOSFET 60 V", kind: "nmos",
    ...MOS_UNUSED,
    Vth: 2.0, K: 4, lambda: 0.01, Cgs: 1.2e-9, Cgd: 0.2e-9,
    vMax: 60, iMax: 20, pMax: 60, thetaJC: 2.5, thetaJA: 62, tjMax: 175, soaCornerVoltage: null,
  },
  {
    preset: "Standard N-MOSFET 100 V", kind: "nmos",
    ...MOS_UNUSED,
    Vth: 3.5, K: 3, lambda: 0.005, Cgs: 1.8e-9, Cgd: 0.3e-9,
    vMax: 100, iMax: 30, pMax: 90, thetaJC: 1.6, thetaJA: 62, tjMax: 175, soaCornerVoltage: null,
  },
  {
    preset: "P-MOSFET 60 V", kind: "pmos",
    ...MOS_UNUSED,
    Vth: 2.5, K: 2.5, lambda: 0.01, Cgs: 1.5e-9, Cgd: 0.3e-9,
    vMax: 60, iMax: 12, pMax: 50, thetaJC: 3, thetaJA: 62, tjMax: 175, soaCornerVoltage: null,
  },
];

export function opampPreset(name: string): OpampParams {
  const p = OPAMP_PRESETS.find((x) => x.preset === name);
  if (!p) throw new Error(`Unknown op-amp preset "${name}"`);
  return { ...p, part: null };
}

export function passPreset(name: string): PassParams {
  const p = PASS_PRESETS.find((x) => x.preset === name);
  if (!p) throw new Error(`Unknown pass-device preset "${name}"`);
  return { ...p, part: null };
}
