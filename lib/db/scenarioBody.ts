import { DomainError } from "./errors";

/** Largest scenario body accepted, bytes of JSON. */
export const MAX_SCENARIO_BYTES = 256 * 1024;

/**
 * Checks a scenario body before it becomes a revision: a JSON object of at most 256 KiB.
 * (The design layer's full scenario schema is applied here once lib/design exports it.)
 */
export function checkScenarioBody(body: unknown): Record<string, unknown> {
  if (body === null || typeof body !== "object" || Array.isArray(body)) {
    throw new DomainError(400, "body: a scenario must be a JSON object.");
  }
  const size = Buffer.byteLength(JSON.stringify(body), "utf8");
  if (size > MAX_SCENARIO_BYTES) throw new DomainError(413, `body: the scenario is ${size} bytes, over the ${MAX_SCENARIO_BYTES}-byte limit.`);
  return body as Record<string, unknown>;
}

/** A starting body for a template when nothing else is given. */
export function starterBody(template: string): Record<string, unknown> {
  return { schemaVersion: 0, template };
}

/** Template identifiers offered when creating a scenario. */
export const TEMPLATE_CHOICES: readonly { id: string; title: string }[] = [
  { id: "sink-npn", title: "Low-side sink, NPN" },
  { id: "sink-darlington", title: "Low-side sink, Darlington" },
  { id: "sink-nmos", title: "Low-side sink, N-MOSFET" },
  { id: "source-highside", title: "High-side source" },
  { id: "howland", title: "Howland pump" },
];

export const SCENARIO_STATUSES = ["draft", "review", "final"] as const;
export type ScenarioStatus = (typeof SCENARIO_STATUSES)[number];
