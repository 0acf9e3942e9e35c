/**
 * The scenario: what the workbench edits and the database stores — template, part values, op-amp and pass-device
 * parameters, load model, supplies, stimulus, thermal data, tolerances and study settings. SI units throughout
 * (Ω, F, H, V, A, s, °C, °C/W). Versioned: `upgradeScenario` opens every earlier version.
 */
import { z } from "zod";

/** Current schema version; bump it and add a step to `upgradeScenario` whenever the shape changes. */
export const SCHEMA_VERSION = 2 as const;

export const TEMPLATE_IDS = ["sink-npn", "sink-darlington", "sink-nmos", "source-highside", "howland"] as const;
export type TemplateId = (typeof TEMPLATE_IDS)[number];

const positive = (what: string) => z.number({ error: `${what} must be a number` }).finite().positive(`${what} must be above zero`);
const nonNegative = (what: string) =>
  z.number({ error: `${what} must be a number` }).finite().nonnegative(`${what} must not be negative`);
const finite = (what: string) => z.number({ error: `${what} must be a number` }).finite();
/** A positive number or null (null = the effect is absent). */
const optionalPositive = (what: string) => positive(what).nullable();

/** Part values of the current source. Keys a template does not use are ignored by it. */
export const partsSchema = z.object({
  /** command divider, from the command to the reference node, Ω (0 = command applied directly) */
  dividerTop: nonNegative("Divider top resistor"),
  /** command divider, reference node to ground, Ω */
  dividerBottom: positive("Divider bottom resistor"),
  /** base or gate resistor between the op-amp output and the pass device, Ω */
  baseResistor: positive("Base/gate resistor"),
  /** feedback resistor from the sense node to the inverting input, Ω */
  feedbackResistor: positive("Feedback resistor"),
  /** compensation capacitor from the op-amp output to the inverting input, F (0 = none) */
  compCapacitor: nonNegative("Compensation capacitor"),
  /** current-sense resistor, Ω */
  senseResistor: positive("Sense resistor"),
  /** Darlington only: resistor from the output transistor's base to its emitter, Ω (null = none) */
  darlingtonResistor: optionalPositive("Darlington base–emitter resistor"),
  /** Howland pump: input resistor R1 from the command to the non-inverting input, Ω */
  howlandR1: positive("Howland R1"),
  /** Howland pump: R2 from the non-inverting input to the load node, Ω */
  howlandR2: positive("Howland R2"),
  /** Howland pump: R3 from the inverting input to ground, Ω */
  howlandR3: positive("Howland R3"),
  /** Howland pump: R4 from the op-amp output to the inverting input, Ω */
  howlandR4: positive("Howland R4"),
});
export type Parts = z.infer<typeof partsSchema>;

/**
 * Which of the team's parts a scenario's op-amp or pass device came from: its id and version (null = a built-in
 * preset or values typed in). The values themselves are stored beside it, so a revision reproduces whatever becomes
 * of the part later.
 */
export const partRefSchema = z.object({
  id: z.string().uuid("part.id must be a part's id"),
  version: z.number().int("part.version must be a whole number").min(1, "part.version starts at 1"),
});
export type PartRef = z.infer<typeof partRefSchema>;

/** Op-amp macro-model parameters (the engine's names) plus what the checks need. */
export const opampSchema = z.object({
  preset: z.string().max(80),
  /** the team's part these values came from (null = a built-in preset or typed in) */
  part: partRefSchema.nullable().default(null),
  /** DC open-loop gain, V/V */
  Aol: positive("Open-loop gain"),
  /** gain–bandwidth product, Hz */
  GBW: positive("Gain–bandwidth"),
  /** second pole, Hz (null = none) */
  fp2: optionalPositive("Second pole"),
  /** open-loop output resistance, Ω */
  Rout: nonNegative("Output resistance"),
  /** slew rate, V/s (null = unlimited) */
  slewRate: optionalPositive("Slew rate"),
  /** input offset voltage used in simulation, V */
  Vos: finite("Offset voltage"),
  /** input bias current used in simulation, A */
  Ib: finite("Bias current"),
  /** how close the output swings to the positive rail, V (null = no limit) */
  swingHigh: nonNegative("Swing to the positive rail").nullable(),
  /** how close the output swings to the negative rail, V (null = no limit) */
  swingLow: nonNegative("Swing to the negative rail").nullable(),
  /** output current limit, A (null = none) */
  Iout: optionalPositive("Output current limit"),
  /** worst-case offset voltage for the accuracy budget, V */
  vosMax: nonNegative("Maximum offset voltage"),
  /** worst-case bias current for the accuracy budget, A */
  ibMax: nonNegative("Maximum bias current"),
  /** offset drift, V/°C */
  vosDrift: nonNegative("Offset drift"),
  /** input common-mode range: lowest input relative to the negative rail, V (negative = below the rail) */
  cmLowFromVee: finite("Common-mode range, low end"),
  /** input common-mode range: highest input relative to the positive rail, V (positive = below the rail) */
  cmHighFromVcc: finite("Common-mode range, high end"),
  /** datasheet supply range, total (V+ − V−), V (null = not given) */
  supplyMin: optionalPositive("Lowest supply"),
  supplyMax: optionalPositive("Highest supply"),
  /** the output current the swing figures hold at, A (null = not given) */
  swingCurrent: optionalPositive("Output current of the swing figures"),
  /** noise (optional; lib/design/noise.ts fills the generic values): white input voltage noise, V/√Hz, and its 1/f corner, Hz */
  noiseVoltage: nonNegative("Voltage noise").optional(),
  noiseVoltageCorner: nonNegative("Voltage-noise corner").optional(),
  /** white input current noise at each input, A/√Hz, and its 1/f corner, Hz */
  noiseCurrent: nonNegative("Current noise").optional(),
  noiseCurrentCorner: nonNegative("Current-noise corner").optional(),
});
export type OpampParams = z.infer<typeof opampSchema>;

export const PASS_KINDS = ["npn", "pnp", "nmos", "pmos"] as const;

/** Pass-device parameters: BJT (Ebers–Moll) and MOSFET (square law) fields plus ratings for the checks. */
export const passSchema = z.object({
  preset: z.string().max(80),
  /** the team's part these values came from (null = a built-in preset or typed in) */
  part: partRefSchema.nullable().default(null),
  kind: z.enum(PASS_KINDS, { error: "Pass device kind must be npn, pnp, nmos or pmos" }),
  Is: positive("Saturation current Is"),
  betaF: positive("Forward beta"),
  betaR: positive("Reverse beta"),
  VA: optionalPositive("Early voltage"),
  Cje0: nonNegative("Cje0"),
  Cjc0: nonNegative("Cjc0"),
  tauF: nonNegative("Forward transit time"),
  /** smallest beta over production spread and temperature (for the accuracy budget) */
  betaMin: positive("Minimum beta"),
  Vth: positive("Threshold voltage"),
  /** square-law transconductance parameter, A/V² */
  K: positive("Transconductance parameter K"),
  lambda: nonNegative("Channel-length modulation"),
  Cgs: nonNegative("Cgs"),
  Cgd: nonNegative("Cgd"),
  /** ratings */
  vMax: positive("Maximum VCE/VDS"),
  iMax: positive("Maximum collector/drain current"),
  /** rated dissipation at a 25 °C case, W */
  pMax: positive("Rated dissipation"),
  /** collector–emitter saturation voltage, V (BJT) */
  vSat: nonNegative("Saturation voltage"),
  /** thermal resistance junction to case, °C/W */
  thetaJC: nonNegative("θjc"),
  /** thermal resistance junction to ambient of the bare package (no heatsink), °C/W */
  thetaJA: positive("θja"),
  /** maximum junction temperature, °C */
  tjMax: positive("Maximum junction temperature"),
  /**
   * SOA corner, V: above it the datasheet's second-breakdown line limits the power below the rated one (taken as
   * P ∝ 1/V, i.e. I ∝ V⁻²); null = not given (the power line alone)
   */
  soaCornerVoltage: optionalPositive("SOA corner voltage"),
});
export type PassParams = z.infer<typeof passSchema>;

export const LOAD_KINDS = ["resistor", "coil", "led", "cell"] as const;

export const cableSchema = z.object({
  /** cable length, m (0 = no cable) */
  length: nonNegative("Cable length"),
  /** resistance of one conductor per metre, Ω/m (the loop has two conductors) */
  rPerM: nonNegative("Cable resistance per metre"),
  /** loop inductance per metre, H/m */
  lPerM: nonNegative("Cable inductance per metre"),
  /** capacitance between the conductors per metre, F/m */
  cPerM: nonNegative("Cable capacitance per metre"),
  /** lumped sections */
  sections: z.number().int("Cable sections must be a whole number").min(1, "At least one cable section").max(10, "At most 10 cable sections"),
});

export const CLAMP_KINDS = ["none", "diode", "diode-zener"] as const;

export const clampSchema = z.object({
  kind: z.enum(CLAMP_KINDS, { error: "Clamp must be none, diode or diode-zener" }),
  /** the Zener's breakdown voltage, V (used by "diode-zener") */
  zenerVoltage: positive("Zener voltage"),
});
export type ClampParams = z.infer<typeof clampSchema>;

export const loadSchema = z.object({
  kind: z.enum(LOAD_KINDS, { error: "Load kind must be resistor, coil, led or cell" }),
  /** load resistance (resistor, coil winding, LED-string series resistor, cell internal resistance), Ω */
  resistance: nonNegative("Load resistance"),
  /** lightest and heaviest load resistance the design must serve, Ω (for headroom and dissipation) */
  resistanceMin: nonNegative("Minimum load resistance"),
  resistanceMax: nonNegative("Maximum load resistance"),
  /** coil inductance, H */
  inductance: nonNegative("Coil inductance"),
  /** clamp across the coil: none, a freewheel diode (slow decay), or a diode plus a Zener (fast decay at a set voltage) */
  clamp: clampSchema,
  /** LEDs in the string */
  ledCount: z.number().int("LED count must be a whole number").min(1, "At least one LED").max(100, "At most 100 LEDs"),
  /** one LED: saturation current, A, and emission coefficient */
  ledIs: positive("LED saturation current"),
  ledN: positive("LED emission coefficient"),
  /** the load is a laser emitter (raises a caution) */
  laserEmitter: z.boolean(),
  /** cell or supply under test: open-circuit voltage, V, and the range it spans during the test */
  cellVoltage: nonNegative("Cell voltage"),
  cellVoltageMin: nonNegative("Lowest cell voltage"),
  cellVoltageMax: nonNegative("Highest cell voltage"),
  /** the cell is a lithium cell (raises a caution) */
  lithium: z.boolean(),
  /** extra capacitance across the load terminals, F */
  extraCapacitance: nonNegative("Extra load capacitance"),
  cable: cableSchema,
  /** load step: a resistor switched in parallel with the load */
  stepResistance: positive("Load-step resistor"),
});
export type LoadParams = z.infer<typeof loadSchema>;

/** A series R–C snubber. */
export const snubberSchema = z.object({
  /** Ω */
  resistance: positive("Snubber resistance"),
  /** F */
  capacitance: positive("Snubber capacitance"),
});
export type Snubber = z.infer<typeof snubberSchema>;

/** Optional networks the engineer adds to a template's circuit; null = not fitted (the default). */
export const networksSchema = z.object({
  /** series R–C across the load's terminals at the far end of the cable */
  loadSnubber: snubberSchema.nullable(),
  /** series R–C across the pass device's collector–emitter (drain–source) */
  passSnubber: snubberSchema.nullable(),
  /** resistor from the pass device's base to emitter (gate to source), Ω */
  baseEmitterResistor: optionalPositive("Base–emitter resistor"),
  /** capacitor across the feedback resistor (sense node to inverting input), F */
  feedbackCapacitor: optionalPositive("Feedback-resistor capacitor"),
});
export type Networks = z.infer<typeof networksSchema>;

export const suppliesSchema = z.object({
  /** load supply, V (for a cell under test, a supply in series with the cell; usually 0) */
  load: nonNegative("Load supply"),
  /** op-amp positive rail, V */
  opampPositive: positive("Op-amp positive supply"),
  /** op-amp negative rail, V (0 = single supply) */
  opampNegative: z.number().finite().nonpositive("Op-amp negative supply must be 0 or below"),
});

export const STIMULUS_KINDS = ["command-step", "command-ramp", "load-step", "supply-step", "power-up"] as const;

export const stimulusSchema = z.object({
  kind: z.enum(STIMULUS_KINDS, { error: "Stimulus must be command-step, command-ramp, load-step, supply-step or power-up" }),
  /** command before and after the step (or ramp), V */
  commandLow: finite("Command low"),
  commandHigh: finite("Command high"),
  /** full-scale command, V (what the accuracy budget and DC transfer refer to) */
  commandFullScale: positive("Full-scale command"),
  /** when the step (or ramp, load step, supply step) happens, s */
  stepTime: nonNegative("Step time"),
  /** ramp duration, s */
  rampTime: positive("Ramp time"),
  /** edge time of steps, s */
  edgeTime: positive("Edge time"),
  /** supply step: the load supply jumps by this much, V */
  supplyStep: finite("Supply step"),
  /** simulated time, s */
  stopTime: positive("Stop time"),
  /** command source: output resistance, Ω, and the current it can deliver, A */
  sourceResistance: nonNegative("Command source resistance"),
  sourceCurrentLimit: positive("Command source current limit"),
});
export type Stimulus = z.infer<typeof stimulusSchema>;

export const thermalSchema = z.object({
  /** ambient temperature, °C */
  ambient: z.number().finite().min(-55, "Ambient below −55 °C").max(150, "Ambient above 150 °C"),
  /** case to heatsink, °C/W */
  thetaCS: nonNegative("θcs"),
  /** heatsink to ambient, °C/W (null = no heatsink: the bare package's θja applies) */
  thetaSA: nonNegative("θsa").nullable(),
  /** sense resistor: power rating, W, and thermal resistance to ambient, °C/W */
  senseRating: positive("Sense-resistor power rating"),
  senseThetaA: nonNegative("Sense-resistor thermal resistance"),
});

export const tolerancesSchema = z.object({
  /** divider and feedback resistors, fraction (0.01 = 1 %) */
  resistor: nonNegative("Resistor tolerance").max(0.5, "Resistor tolerance above 50 %"),
  /** sense resistor, fraction */
  sense: nonNegative("Sense tolerance").max(0.5, "Sense tolerance above 50 %"),
  /** capacitors, fraction */
  capacitor: nonNegative("Capacitor tolerance").max(0.5, "Capacitor tolerance above 50 %"),
  /** resistor temperature coefficient, 1/°C (100e-6 = 100 ppm/°C) */
  resistorTempco: nonNegative("Resistor tempco"),
  /** temperature excursion from 25 °C used for drift, °C */
  temperatureSpan: nonNegative("Temperature span"),
  /** DC accuracy the design must meet, fraction of full scale (0.01 = 1 %) */
  accuracyTarget: positive("Accuracy target").max(1, "Accuracy target above 100 %"),
  /** Monte Carlo distribution: uniform within ± tolerance, or normal with the tolerance at 3σ */
  distribution: z.enum(["uniform", "normal"], { error: "Distribution must be uniform or normal" }),
  /** load-current noise the design must stay under, A RMS over the noise band (studies.noise); absent = no target */
  noiseTarget: positive("Noise target").optional(),
});
export type Tolerances = z.infer<typeof tolerancesSchema>;

const axisSchema = z.object({
  /** parameter path, e.g. "parts.compCapacitor" */
  path: z.string().min(1, "Choose a parameter"),
  from: finite("Sweep start"),
  to: finite("Sweep end"),
  points: z.number().int().min(1, "At least one point").max(400, "At most 400 points"),
  scale: z.enum(["linear", "log", "list"]),
  values: z.array(finite("Sweep value")).max(400),
});
export type SweepAxis = z.infer<typeof axisSchema>;

export const studiesSchema = z.object({
  sweep: axisSchema,
  map: z.object({
    x: axisSchema,
    y: axisSchema,
    metric: z.enum(["phaseMarginDeg", "overshootPct", "judgedOvershootPct", "settlingTime1pct", "noiseRms"]),
  }),
  spread: z.object({
    runs: z.number().int().min(1, "At least one run").max(100000, "At most 100 000 runs"),
    seed: z.number().int(),
  }),
  compensate: z.object({
    targetPhaseMarginDeg: z.number().min(0).max(90),
    maxOvershootPct: z.number().min(0).max(100),
    series: z.enum(["E6", "E12", "E24", "E48", "E96", "E192"]),
    tuneBaseResistor: z.boolean(),
    /** also search the load snubber (E-series R–C across the load), the cheapest set that meets the targets */
    tuneLoadSnubber: z.boolean(),
  }),
  /** the Noise study (optional; defaults in lib/design/noise.ts): lowest frequency and the integration band, Hz */
  noise: z.object({
    fMin: positive("Lowest noise frequency").optional(),
    bandLow: positive("Noise band start").optional(),
    bandHigh: positive("Noise band end").optional(),
  }).optional(),
});

export const scenarioSchema = z.object({
  schemaVersion: z.literal(SCHEMA_VERSION, { error: `schemaVersion must be ${SCHEMA_VERSION}` }),
  template: z.enum(TEMPLATE_IDS, { error: `template must be one of ${TEMPLATE_IDS.join(", ")}` }),
  parts: partsSchema,
  opamp: opampSchema,
  pass: passSchema,
  load: loadSchema,
  networks: networksSchema,
  supplies: suppliesSchema,
  stimulus: stimulusSchema,
  thermal: thermalSchema,
  tolerances: tolerancesSchema,
  studies: studiesSchema,
}).superRefine((s, ctx) => {
  // Cross-field rules, each reported on the field to change.
  const need: Record<string, readonly string[]> = {
    "sink-npn": ["npn"], "sink-darlington": ["npn"], "sink-nmos": ["nmos"], "source-highside": ["pnp", "pmos"],
  };
  const kinds = need[s.template];
  if (kinds && !kinds.includes(s.pass.kind)) {
    ctx.addIssue({ code: "custom", path: ["pass", "kind"], message: `The ${s.template} template needs a ${kinds.join(" or ")} pass device (got ${s.pass.kind})` });
  }
  if (s.load.resistanceMin > s.load.resistanceMax) {
    ctx.addIssue({ code: "custom", path: ["load", "resistanceMin"], message: "Minimum load resistance is above the maximum" });
  }
  if (s.load.cellVoltageMin > s.load.cellVoltageMax) {
    ctx.addIssue({ code: "custom", path: ["load", "cellVoltageMin"], message: "Lowest cell voltage is above the highest" });
  }
  if (s.stimulus.stepTime >= s.stimulus.stopTime) {
    ctx.addIssue({ code: "custom", path: ["stimulus", "stepTime"], message: "The step must happen before the stop time" });
  }
  if (s.template === "howland" && (s.networks.passSnubber || s.networks.baseEmitterResistor !== null || s.networks.feedbackCapacitor !== null)) {
    ctx.addIssue({ code: "custom", path: ["networks"], message: "The Howland pump has no pass device or feedback resistor: only the load snubber applies" });
  }
  if (s.opamp.supplyMin !== null && s.opamp.supplyMax !== null && s.opamp.supplyMin > s.opamp.supplyMax) {
    ctx.addIssue({ code: "custom", path: ["opamp", "supplyMin"], message: "Lowest supply is above the highest" });
  }
  if (s.pass.betaMin > s.pass.betaF) {
    ctx.addIssue({ code: "custom", path: ["pass", "betaMin"], message: "Minimum beta is above the typical beta" });
  }
});
export type Scenario = z.infer<typeof scenarioSchema>;

/** A readable message naming the first bad fields: "parts.senseResistor: Sense resistor must be above zero". */
export function describeIssues(error: z.ZodError): string {
  return error.issues
    .slice(0, 5)
    .map((i) => `${i.path.length ? i.path.join(".") : "scenario"}: ${i.message}`)
    .join("; ");
}

export class ScenarioError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "ScenarioError";
  }
}
