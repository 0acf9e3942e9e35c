/** What the library filters by, read from a scenario body through the design layer. */
import { tryUpgradeScenario } from "@/lib/design/upgrade";
import { TEMPLATES } from "@/lib/design/templates";
import { idealTransconductance } from "@/lib/design/compile";

/** Facets of a scenario body the library filters by. Tolerates bodies from before the design schema. */
export function scenarioFacets(body: unknown, fallbackTemplate: string): {
  template: string; passElement: string; loadType: string; currentMin: number | null; currentMax: number | null;
} {
  const parsed = tryUpgradeScenario(body);
  if (!parsed.ok) {
    const b = (body ?? {}) as Record<string, any>;
    const template = typeof b.template === "string" ? b.template : fallbackTemplate;
    const info = TEMPLATES.find((t) => t.id === template);
    return { template, passElement: info?.passElement ?? "", loadType: typeof b.load?.kind === "string" ? b.load.kind : "", currentMin: null, currentMax: null };
  }
  const s = parsed.scenario;
  const info = TEMPLATES.find((t) => t.id === s.template);
  let passElement: string = info?.passElement ?? s.pass.kind;
  if (s.template === "source-highside") passElement = s.pass.kind;
  // The range the design serves: 0 to full scale (the Howland pump drives both ways: −full scale to full scale).
  const fullScale = Math.abs(idealTransconductance(s) * s.stimulus.commandFullScale);
  return {
    template: s.template,
    passElement,
    loadType: s.load.cable.length > 0 ? `${s.load.kind}+cable` : s.load.kind,
    currentMin: s.template === "howland" ? -fullScale : 0,
    currentMax: fullScale,
  };
}
