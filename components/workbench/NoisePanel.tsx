"use client";
/**
 * The Noise panel: the scenario's noise target (A RMS over the band), the band the noise is integrated over, and the
 * op-amp's noise figures. Every field is optional in the scenario: empty means "no target" or the generic defaults
 * (lib/design/noise.ts), which the placeholder hint names.
 */
import { DEFAULT_NOISE_STUDY, DEFAULT_OPAMP_NOISE } from "@/lib/design/noise";
import { scenarioSchema, type Scenario } from "@/lib/design/schema";
import { formatEng } from "@/lib/units/eng";
import { ValueField } from "./ValueField";
import { useWb, useWbStore } from "./context";

interface OptionalSpec {
  id: string;
  label: string;
  unit: string;
  /** what an empty field means, in words */
  empty: string;
  get: (s: Scenario) => number | undefined;
  set: (s: Scenario, v: number | undefined) => Scenario;
}

function OptionalNumber({ spec }: { spec: OptionalSpec }) {
  const store = useWbStore();
  const value = useWb((s) => spec.get(s.scenario) ?? null);
  return (
    <div>
      <ValueField
        id={spec.id}
        testId={spec.id}
        label={spec.label}
        unit={spec.unit}
        value={value}
        nullable
        compact
        validate={(v) => {
          const r = scenarioSchema.safeParse(spec.set(store.getState().scenario, v));
          return r.success ? null : r.error.issues[0]?.message ?? "not a valid value";
        }}
        onCommit={(v, coalesce) => store.getState().edit((s) => spec.set(s, v ?? undefined), coalesce ? { coalesceKey: spec.id } : undefined)}
      />
      {value === null && <p className="px-2 pb-1 text-[11px] text-ink-muted">Empty: {spec.empty}</p>}
    </div>
  );
}

const band = (s: Scenario) => s.studies.noise ?? {};
const withBand = (s: Scenario, patch: Partial<NonNullable<Scenario["studies"]["noise"]>>): Scenario => ({
  ...s, studies: { ...s.studies, noise: { ...band(s), ...patch } },
});

const SPECS: OptionalSpec[] = [
  {
    id: "field-noise-target", label: "Noise target (RMS in the band)", unit: "A", empty: "no target, no check",
    get: (s) => s.tolerances.noiseTarget, set: (s, v) => ({ ...s, tolerances: { ...s.tolerances, noiseTarget: v } }),
  },
  {
    id: "field-noise-band-low", label: "Band start", unit: "Hz", empty: `${formatEng(DEFAULT_NOISE_STUDY.bandLow, "Hz")}`,
    get: (s) => band(s).bandLow, set: (s, v) => withBand(s, { bandLow: v }),
  },
  {
    id: "field-noise-band-high", label: "Band end", unit: "Hz", empty: `${formatEng(DEFAULT_NOISE_STUDY.bandHigh, "Hz")}`,
    get: (s) => band(s).bandHigh, set: (s, v) => withBand(s, { bandHigh: v }),
  },
  {
    id: "field-opamp-noiseVoltage", label: "Op-amp voltage noise (white)", unit: "V/√Hz", empty: `${formatEng(DEFAULT_OPAMP_NOISE.noiseVoltage, "V/√Hz")}`,
    get: (s) => s.opamp.noiseVoltage, set: (s, v) => ({ ...s, opamp: { ...s.opamp, noiseVoltage: v } }),
  },
  {
    id: "field-opamp-noiseVoltageCorner", label: "Voltage-noise 1/f corner", unit: "Hz", empty: `${formatEng(DEFAULT_OPAMP_NOISE.noiseVoltageCorner, "Hz")}`,
    get: (s) => s.opamp.noiseVoltageCorner, set: (s, v) => ({ ...s, opamp: { ...s.opamp, noiseVoltageCorner: v } }),
  },
  {
    id: "field-opamp-noiseCurrent", label: "Op-amp current noise (white)", unit: "A/√Hz", empty: `${formatEng(DEFAULT_OPAMP_NOISE.noiseCurrent, "A/√Hz")}`,
    get: (s) => s.opamp.noiseCurrent, set: (s, v) => ({ ...s, opamp: { ...s.opamp, noiseCurrent: v } }),
  },
  {
    id: "field-opamp-noiseCurrentCorner", label: "Current-noise 1/f corner", unit: "Hz", empty: `${formatEng(DEFAULT_OPAMP_NOISE.noiseCurrentCorner, "Hz")}`,
    get: (s) => s.opamp.noiseCurrentCorner, set: (s, v) => ({ ...s, opamp: { ...s.opamp, noiseCurrentCorner: v } }),
  },
];

export function NoisePanel() {
  return (
    <details className="group rounded border border-hairline bg-white" id="panel-noise">
      <summary className="cursor-pointer select-none px-3 py-2 text-[13px] font-semibold text-ink hover:bg-paper">Noise</summary>
      <div className="border-t border-hairline px-1 py-1">
        {SPECS.map((spec) => <OptionalNumber key={spec.id} spec={spec} />)}
      </div>
    </details>
  );
}
