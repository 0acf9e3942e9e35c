/**
 * Opening stored scenarios of any version. Version 0 (the seed's minimal records: `{ schemaVersion: 0, template }`)
 * becomes the template's starting scenario. Version 1 → 2: the boolean `load.clampDiode` becomes
 * `load.clamp: { kind: "diode" | "none", zenerVoltage }`, and `networks` arrives with every network off. For the current version, fields added after a scenario was saved are
 * filled from the template's defaults before validation, so a stored scenario keeps opening as the schema grows.
 */
import { SCHEMA_VERSION, ScenarioError, TEMPLATE_IDS, describeIssues, scenarioSchema, type Scenario, type TemplateId } from "./schema";
import { defaultScenario } from "./templates";

function isObject(x: unknown): x is Record<string, unknown> {
  return typeof x === "object" && x !== null && !Array.isArray(x);
}

/** Fill what `value` lacks from `defaults` (objects merged key by key; arrays and scalars taken whole). */
function fillMissing(defaults: unknown, value: unknown): unknown {
  if (value === undefined) return defaults;
  if (isObject(defaults) && isObject(value)) {
    const out: Record<string, unknown> = { ...value };
    for (const [k, d] of Object.entries(defaults)) out[k] = fillMissing(d, value[k]);
    return out;
  }
  return value;
}

function templateOf(json: Record<string, unknown>): TemplateId {
  const t = json.template;
  if (typeof t !== "string" || !(TEMPLATE_IDS as readonly string[]).includes(t)) {
    throw new ScenarioError(`template: must be one of ${TEMPLATE_IDS.join(", ")} (got ${JSON.stringify(t)})`);
  }
  return t as TemplateId;
}

/**
 * Version 1 → 2: `load.clampDiode` becomes `load.clamp`; `networks` starts with every network off (filled later); the
 * op-amp's supply range and swing current and the pass device's SOA corner start unknown (null).
 */
function upgradeV1(json: Record<string, unknown>, template: TemplateId): Record<string, unknown> {
  const out: Record<string, unknown> = { ...json, schemaVersion: 2 };
  if (isObject(json.load)) {
    const { clampDiode, ...rest } = json.load;
    if (clampDiode !== undefined && typeof clampDiode !== "boolean") {
      throw new ScenarioError(`load.clampDiode: must be true or false (got ${JSON.stringify(clampDiode)})`);
    }
    const zenerVoltage = defaultScenario(template).load.clamp.zenerVoltage;
    out.load = clampDiode === undefined ? rest : { ...rest, clamp: { kind: clampDiode ? "diode" : "none", zenerVoltage } };
  }
  // Datasheet figures new in version 2: unknown for a version-1 part (never the template preset's figures).
  if (isObject(json.opamp)) out.opamp = { supplyMin: null, supplyMax: null, swingCurrent: null, ...json.opamp };
  if (isObject(json.pass)) out.pass = { soaCornerVoltage: null, ...json.pass };
  return out;
}

/** Validate (and upgrade when older) a stored or uploaded scenario; throws ScenarioError naming the field. */
export function upgradeScenario(json: unknown): Scenario {
  if (!isObject(json)) throw new ScenarioError("scenario: must be a JSON object");
  const version = json.schemaVersion ?? 0;
  if (typeof version !== "number" || !Number.isInteger(version) || version < 0) {
    throw new ScenarioError(`schemaVersion: must be a whole number (got ${JSON.stringify(version)})`);
  }
  if (version > SCHEMA_VERSION) {
    throw new ScenarioError(`schemaVersion: ${version} is newer than this version of Quell understands (${SCHEMA_VERSION})`);
  }
  const template = templateOf(json);
  let body: unknown;
  if (version === 0) {
    body = defaultScenario(template);
  } else {
    const current = version === 1 ? upgradeV1(json, template) : json;
    body = fillMissing(defaultScenario(template), current);
  }
  const parsed = scenarioSchema.safeParse(body);
  if (!parsed.success) throw new ScenarioError(describeIssues(parsed.error));
  return parsed.data;
}

/** Like upgradeScenario but returns the error text instead of throwing (for forms and API answers). */
export function tryUpgradeScenario(json: unknown): { ok: true; scenario: Scenario } | { ok: false; error: string } {
  try {
    return { ok: true, scenario: upgradeScenario(json) };
  } catch (e) {
    return { ok: false, error: e instanceof Error ? e.message : String(e) };
  }
}
