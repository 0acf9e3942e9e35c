import { DomainError } from "@/lib/errors";
import { upgradeScenario } from "./upgrade";
import { TEMPLATES, defaultScenario } from "./templates";
import { ScenarioError, TEMPLATE_IDS, type Scenario, type TemplateId } from "./schema";

/** Largest scenario body accepted, bytes of JSON. */
export const MAX_SCENARIO_BYTES = 256 * 1024;

/**
 * Checks a scenario body before it becomes a revision: at most 256 KiB of JSON, then the design layer's
 * scenario schema (older versions are upgraded first). Returns the scenario as it will be stored.
 */
export function checkScenarioBody(body: unknown): Scenario {
  if (body === null || typeof body !== "object" || Array.isArray(body)) {
    throw new DomainError(400, "body: a scenario must be a JSON object.");
  }
  // A server action's argument is decoded by React, which can produce cycles, BigInts and the like: not JSON data.
  let json: string;
  try {
    json = JSON.stringify(body);
  } catch {
    throw new DomainError(400, "body: a scenario must be plain JSON data (no cycles, no big integers).");
  }
  const size = Buffer.byteLength(json, "utf8");
  if (size > MAX_SCENARIO_BYTES) throw new DomainError(413, `body: the scenario is ${size} bytes, over the ${MAX_SCENARIO_BYTES}-byte limit.`);
  try {
    return upgradeScenario(body);
  } catch (e) {
    if (e instanceof ScenarioError) throw new DomainError(400, `body: ${e.message}`);
    throw e;
  }
}

export function isTemplateId(t: string): t is TemplateId {
  return (TEMPLATE_IDS as readonly string[]).includes(t);
}

/** The template's starting scenario (from the design layer). */
export function starterBody(template: string): Scenario {
  if (!isTemplateId(template)) throw new DomainError(400, `template: must be one of ${TEMPLATE_IDS.join(", ")}.`);
  return defaultScenario(template);
}

/** Templates offered when creating a scenario. */
export const TEMPLATE_CHOICES: readonly { id: string; title: string }[] = TEMPLATES.map((t) => ({ id: t.id, title: t.title }));
