"use client";
/**
 * The Circuit zone's forms: part values (from the template's part list), the optional networks, load and supply
 * (with the coil's clamp), stimulus, and the
 * op-amp and pass-device parameters with our generic presets. Every field edits the scenario through the store;
 * the scenario schema's own message names what is wrong with a value.
 */
import { useState } from "react";
import { scenarioSchema, CLAMP_KINDS, LOAD_KINDS, STIMULUS_KINDS, type Scenario } from "@/lib/design/schema";
import { NETWORK_DEFAULTS, NETWORK_KEYS, networkApplies, networkLabel, type NetworkKey } from "@/lib/design/networks";
import { templateInfo } from "@/lib/design/templates";
import { OPAMP_PRESETS, PASS_PRESETS } from "@/lib/design/presets";
import { E_SERIES_NAMES, type ESeriesName } from "@/lib/design/eseries";
import { getPath, setPath } from "@/lib/workbench/paths";
import { useWb, useWbStore } from "./context";
import { ValueField } from "./ValueField";
import { useTeamParts } from "./team-parts";
import { applyPart } from "@/lib/design/part-records";

/** The schema's message for `path` if the scenario with `value` there is invalid at that path. */
function schemaReason(s: Scenario, path: string, value: unknown): string | null {
  const r = scenarioSchema.safeParse(setPath(s, path, value));
  if (r.success) return null;
  const hit = r.error.issues.find((i) => i.path.join(".") === path);
  return hit ? hit.message : null;
}

export interface ParamSpec {
  path: string;
  label: string;
  unit: string;
  min?: number;
  max?: number;
  nullable?: boolean;
  integer?: boolean;
  slider?: boolean;
  /** shown = stored × scale (e.g. 100 to show a fraction in %); min and max are in shown units */
  scale?: number;
}

/** One scenario number bound to the store. `partKey` links it to the schematic's selection. */
export function ParamField({ spec, partKey, snap }: { spec: ParamSpec; partKey?: string; snap?: ESeriesName | null }) {
  const store = useWbStore();
  const raw = useWb((s) => getPath(s.scenario, spec.path));
  const selected = useWb((s) => partKey !== undefined && s.selectedPart === partKey);
  const k = spec.scale ?? 1;
  const value = typeof raw === "number" ? raw * k : null;
  const id = `field-${spec.path.replace(/\./g, "-")}`;
  return (
    <ValueField
      id={id}
      testId={id}
      label={spec.label}
      unit={spec.unit}
      value={value}
      min={spec.min}
      max={spec.max}
      nullable={spec.nullable}
      integer={spec.integer}
      slider={spec.slider}
      snap={snap}
      compact={!spec.slider}
      selected={selected}
      onFocus={() => partKey && store.getState().selectPart(partKey)}
      validate={(v) => schemaReason(store.getState().scenario, spec.path, v / k)}
      onCommit={(v, coalesce) => {
        const st = store.getState();
        st.edit((s) => setPath(s, spec.path, v === null ? null : v / k), coalesce ? { coalesceKey: spec.path } : undefined);
      }}
    />
  );
}

function Section({ title, children, id, defaultOpen = true }: { title: string; children: React.ReactNode; id: string; defaultOpen?: boolean }) {
  return (
    <details open={defaultOpen} className="group rounded border border-hairline bg-white" id={id}>
      <summary className="cursor-pointer select-none px-3 py-2 text-[13px] font-semibold text-ink hover:bg-paper">
        {title}
      </summary>
      <div className="border-t border-hairline px-1 py-1">{children}</div>
    </details>
  );
}

export function PartValues() {
  const template = useWb((s) => s.scenario.template);
  const [snap, setSnap] = useState<ESeriesName | null>(null);
  const info = templateInfo(template);
  return (
    <section aria-labelledby="parts-title" className="rounded border border-hairline bg-white">
      <div className="flex items-center justify-between gap-2 border-b border-hairline px-3 py-2">
        <h2 id="parts-title" className="text-[13px] font-semibold">Part values</h2>
        <label className="flex items-center gap-1.5 text-[12px] text-ink-muted">
          <span>Snap to</span>
          <select
            className="rounded border border-hairline bg-white px-1 py-0.5 text-[12px]"
            value={snap ?? ""}
            onChange={(e) => setSnap(e.target.value === "" ? null : (e.target.value as ESeriesName))}
            data-testid="snap-series"
          >
            <option value="">off</option>
            {E_SERIES_NAMES.map((n) => <option key={n} value={n}>{n}</option>)}
          </select>
        </label>
      </div>
      <div className="px-1 py-1" data-testid="part-list">
        {info.parts.map((p) => (
          <ParamField
            key={p.key}
            partKey={p.key}
            snap={p.kind === "other" ? null : snap}
            spec={{
              path: `parts.${p.key}`,
              label: p.label,
              unit: p.unit,
              min: p.min,
              max: p.max,
              nullable: p.key === "darlingtonResistor",
              slider: p.kind === "resistor" || p.kind === "capacitor",
            }}
          />
        ))}
      </div>
    </section>
  );
}

function Select<T extends string>({ id, label, value, options, onChange }: { id: string; label: string; value: T; options: readonly { value: T; label: string }[]; onChange: (v: T) => void }) {
  return (
    <div className="flex items-center gap-2 px-2 py-1">
      <label htmlFor={id} className="flex-1 text-[13px]">{label}</label>
      <select id={id} value={value} onChange={(e) => onChange(e.target.value as T)} className="w-40 rounded border border-hairline bg-white px-1 py-0.5 text-[13px]">
        {options.map((o) => <option key={o.value} value={o.value}>{o.label}</option>)}
      </select>
    </div>
  );
}

function Check({ id, label, path }: { id: string; label: string; path: string }) {
  const store = useWbStore();
  const on = useWb((s) => getPath(s.scenario, path) === true);
  return (
    <label htmlFor={id} className="flex items-center gap-2 px-2 py-1 text-[13px]">
      <input id={id} type="checkbox" checked={on} className="accent-signal" onChange={(e) => store.getState().edit((s) => setPath(s, path, e.target.checked))} />
      {label}
    </label>
  );
}

const CLAMP_LABEL: Record<(typeof CLAMP_KINDS)[number], string> = { none: "None", diode: "Diode (slow decay)", "diode-zener": "Diode + Zener (fast decay)" };

/** The coil's clamp: none, a freewheel diode, or a diode plus a Zener at a set voltage. */
function ClampField() {
  const store = useWbStore();
  const clamp = useWb((s) => s.scenario.load.clamp.kind);
  return (
    <>
      <Select
        id="load-clamp" label="Clamp across the coil" value={clamp}
        options={CLAMP_KINDS.map((k) => ({ value: k, label: CLAMP_LABEL[k] }))}
        onChange={(v) => store.getState().edit((s) => setPath(s, "load.clamp.kind", v))}
      />
      {clamp === "diode-zener" && <ParamField partKey="load" spec={{ path: "load.clamp.zenerVoltage", label: "Zener voltage", unit: "V", min: 0 }} />}
    </>
  );
}

/**
 * The optional networks, each off until switched on (at its starting values, NETWORK_DEFAULTS), then its values
 * edited like any part. The Howland pump takes only the load snubber.
 */
export function NetworksPanel() {
  const store = useWbStore();
  const scenario = useWb((s) => s.scenario);
  const toggle = (key: NetworkKey, on: boolean) =>
    store.getState().edit((s) => setPath(s, `networks.${key}`, on ? structuredClone(NETWORK_DEFAULTS[key]) : null));
  const keys = NETWORK_KEYS.filter((k) => networkApplies(scenario, k));
  return (
    <Section title="Networks" id="panel-networks" defaultOpen={false}>
      <div data-testid="networks-panel">
        {keys.map((key) => {
          const on = scenario.networks[key] !== null;
          const id = `network-${key}`;
          return (
            <div key={key}>
              <label htmlFor={id} className="flex items-center gap-2 px-2 py-1 text-[13px]">
                <input id={id} type="checkbox" checked={on} className="accent-signal" data-testid={id} onChange={(e) => toggle(key, e.target.checked)} />
                {networkLabel(scenario, key)}
              </label>
              {on && (key === "loadSnubber" || key === "passSnubber") && (
                <>
                  <ParamField partKey={key} spec={{ path: `networks.${key}.resistance`, label: "Resistor", unit: "Ω", min: 0 }} />
                  <ParamField partKey={key} spec={{ path: `networks.${key}.capacitance`, label: "Capacitor", unit: "F", min: 0 }} />
                </>
              )}
              {on && key === "baseEmitterResistor" && <ParamField partKey={key} spec={{ path: "networks.baseEmitterResistor", label: "Resistor", unit: "Ω", min: 0 }} />}
              {on && key === "feedbackCapacitor" && <ParamField partKey={key} spec={{ path: "networks.feedbackCapacitor", label: "Capacitor", unit: "F", min: 0 }} />}
            </div>
          );
        })}
      </div>
    </Section>
  );
}

const LOAD_LABEL: Record<(typeof LOAD_KINDS)[number], string> = { resistor: "Resistor", coil: "Coil (R + L)", led: "LED string", cell: "Cell or supply under test" };
const STIM_LABEL: Record<(typeof STIMULUS_KINDS)[number], string> = {
  "command-step": "Command step", "command-ramp": "Command ramp", "load-step": "Load step", "supply-step": "Supply step", "power-up": "Power-up",
};

export function LoadSupplyPanel() {
  const store = useWbStore();
  const kind = useWb((s) => s.scenario.load.kind);
  const highside = useWb((s) => s.scenario.template === "source-highside");
  return (
    <Section title="Load and supply" id="panel-load">
      <Select
        id="load-kind" label="Load" value={kind}
        options={LOAD_KINDS.map((k) => ({ value: k, label: LOAD_LABEL[k] }))}
        onChange={(v) => store.getState().edit((s) => setPath(s, "load.kind", v))}
      />
      <ParamField partKey="load" spec={{ path: "load.resistance", label: kind === "led" ? "Series resistance" : kind === "cell" ? "Internal resistance" : "Load resistance", unit: "Ω", min: 0 }} />
      {kind === "coil" && <ParamField partKey="load" spec={{ path: "load.inductance", label: "Coil inductance", unit: "H", min: 0 }} />}
      {kind === "coil" && <ClampField />}
      {kind === "led" && <ParamField partKey="load" spec={{ path: "load.ledCount", label: "LEDs in the string", unit: "", integer: true, min: 1, max: 100 }} />}
      {kind === "led" && <Check id="load-laser" label="Laser emitter" path="load.laserEmitter" />}
      {kind === "cell" && <ParamField partKey="load" spec={{ path: "load.cellVoltage", label: "Cell voltage", unit: "V", min: 0 }} />}
      {kind === "cell" && <ParamField spec={{ path: "load.cellVoltageMin", label: "Lowest cell voltage", unit: "V", min: 0 }} />}
      {kind === "cell" && <ParamField spec={{ path: "load.cellVoltageMax", label: "Highest cell voltage", unit: "V", min: 0 }} />}
      {kind === "cell" && <Check id="load-lithium" label="Lithium cell" path="load.lithium" />}
      <ParamField spec={{ path: "load.resistanceMin", label: "Lightest load (min R)", unit: "Ω", min: 0 }} />
      <ParamField spec={{ path: "load.resistanceMax", label: "Heaviest load (max R)", unit: "Ω", min: 0 }} />
      <ParamField partKey="load" spec={{ path: "load.extraCapacitance", label: "Extra load capacitance", unit: "F", min: 0 }} />
      <ParamField partKey="cable" spec={{ path: "load.cable.length", label: "Cable length", unit: "m", min: 0, max: 1000 }} />
      <ParamField partKey="cable" spec={{ path: "load.cable.rPerM", label: "Cable R per metre (one wire)", unit: "Ω/m", min: 0 }} />
      <ParamField partKey="cable" spec={{ path: "load.cable.lPerM", label: "Cable L per metre", unit: "H/m", min: 0 }} />
      <ParamField partKey="cable" spec={{ path: "load.cable.cPerM", label: "Cable C per metre", unit: "F/m", min: 0 }} />
      <ParamField partKey="cable" spec={{ path: "load.cable.sections", label: "Cable sections", unit: "", integer: true, min: 1, max: 10 }} />
      <ParamField partKey="loadSupply" spec={{ path: "supplies.load", label: highside ? "Supply" : "Load supply", unit: "V", min: 0 }} />
      <ParamField partKey="opamp" spec={{ path: "supplies.opampPositive", label: "Op-amp V+", unit: "V" }} />
      <ParamField partKey="opamp" spec={{ path: "supplies.opampNegative", label: "Op-amp V−", unit: "V" }} />
      <ParamField spec={{ path: "thermal.ambient", label: "Ambient", unit: "°C" }} />
      <ParamField spec={{ path: "thermal.thetaSA", label: "Heatsink θsa (empty = none)", unit: "°C/W", nullable: true, min: 0 }} />
    </Section>
  );
}

export function StimulusPanel() {
  const store = useWbStore();
  const kind = useWb((s) => s.scenario.stimulus.kind);
  return (
    <Section title="Stimulus" id="panel-stimulus">
      <Select
        id="stimulus-kind" label="Kind" value={kind}
        options={STIMULUS_KINDS.map((k) => ({ value: k, label: STIM_LABEL[k] }))}
        onChange={(v) => store.getState().edit((s) => setPath(s, "stimulus.kind", v))}
      />
      <ParamField partKey="command" spec={{ path: "stimulus.commandLow", label: "Command from", unit: "V" }} />
      <ParamField partKey="command" spec={{ path: "stimulus.commandHigh", label: "Command to", unit: "V" }} />
      <ParamField partKey="command" spec={{ path: "stimulus.commandFullScale", label: "Full-scale command", unit: "V", min: 0 }} />
      <ParamField spec={{ path: "stimulus.stepTime", label: "Step at", unit: "s", min: 0 }} />
      {kind === "command-ramp" && <ParamField spec={{ path: "stimulus.rampTime", label: "Ramp time", unit: "s" }} />}
      {kind === "supply-step" && <ParamField spec={{ path: "stimulus.supplyStep", label: "Supply step", unit: "V" }} />}
      {kind === "load-step" && <ParamField partKey="load" spec={{ path: "load.stepResistance", label: "Load-step resistor", unit: "Ω" }} />}
      <ParamField spec={{ path: "stimulus.edgeTime", label: "Edge time", unit: "s" }} />
      <ParamField spec={{ path: "stimulus.stopTime", label: "Simulated time", unit: "s" }} />
      <ParamField partKey="command" spec={{ path: "stimulus.sourceResistance", label: "Command source resistance", unit: "Ω", min: 0 }} />
    </Section>
  );
}

/** A team part's option value in the preset pickers ("team:<id>"), beside the built-in presets' names. */
const TEAM = "team:";

export function OpampPanel() {
  const store = useWbStore();
  const preset = useWb((s) => s.scenario.opamp.preset);
  const ref = useWb((s) => s.scenario.opamp.part);
  const team = useTeamParts("opamp");
  const known = ref ? team.some((p) => p.id === ref.id) : OPAMP_PRESETS.some((p) => p.preset === preset);
  const value = ref ? `${TEAM}${ref.id}` : preset;
  return (
    <Section title="Op-amp" id="panel-opamp" defaultOpen={false}>
      <Select
        id="opamp-preset" label="Op-amp preset" value={known ? value : ""}
        options={[
          ...(known ? [] : [{ value: "", label: ref ? `${preset} (v${ref.version})` : "Custom" }]),
          ...team.map((p) => ({ value: `${TEAM}${p.id}`, label: `Team: ${p.name} (v${p.version})` })),
          ...OPAMP_PRESETS.map((p) => ({ value: p.preset, label: p.preset })),
        ]}
        onChange={(v) => {
          const t = team.find((x) => `${TEAM}${x.id}` === v);
          if (t) {
            store.getState().edit((s) => applyPart(s, { id: t.id, version: t.version, kind: t.kind, name: t.name, values: t.values }));
            return;
          }
          const p = OPAMP_PRESETS.find((x) => x.preset === v);
          if (p) store.getState().edit((s) => ({ ...s, opamp: { ...p, part: null } }));
        }}
      />
      <ParamField partKey="opamp" spec={{ path: "opamp.GBW", label: "Gain–bandwidth", unit: "Hz" }} />
      <ParamField partKey="opamp" spec={{ path: "opamp.Aol", label: "Open-loop gain", unit: "" }} />
      <ParamField partKey="opamp" spec={{ path: "opamp.fp2", label: "Second pole (empty = none)", unit: "Hz", nullable: true }} />
      <ParamField partKey="opamp" spec={{ path: "opamp.Rout", label: "Output resistance", unit: "Ω" }} />
      <ParamField partKey="opamp" spec={{ path: "opamp.slewRate", label: "Slew rate (empty = none)", unit: "V/s", nullable: true }} />
      <ParamField partKey="opamp" spec={{ path: "opamp.swingHigh", label: "Swing to V+ (empty = none)", unit: "V", nullable: true }} />
      <ParamField partKey="opamp" spec={{ path: "opamp.swingLow", label: "Swing to V− (empty = none)", unit: "V", nullable: true }} />
      <ParamField partKey="opamp" spec={{ path: "opamp.Iout", label: "Output current limit (empty = none)", unit: "A", nullable: true }} />
      <ParamField partKey="opamp" spec={{ path: "opamp.vosMax", label: "Max offset voltage", unit: "V" }} />
      <ParamField partKey="opamp" spec={{ path: "opamp.ibMax", label: "Max bias current", unit: "A" }} />
      <ParamField partKey="opamp" spec={{ path: "opamp.supplyMin", label: "Lowest supply (empty = not given)", unit: "V", nullable: true }} />
      <ParamField partKey="opamp" spec={{ path: "opamp.supplyMax", label: "Highest supply (empty = not given)", unit: "V", nullable: true }} />
      <ParamField partKey="opamp" spec={{ path: "opamp.swingCurrent", label: "Swing figures at (empty = not given)", unit: "A", nullable: true }} />
    </Section>
  );
}

export function PassPanel() {
  const store = useWbStore();
  const preset = useWb((s) => s.scenario.pass.preset);
  const kind = useWb((s) => s.scenario.pass.kind);
  const template = useWb((s) => s.scenario.template);
  const wanted = template === "sink-nmos" ? ["nmos"] : template === "source-highside" ? ["pnp", "pmos"] : template === "howland" ? [] : ["npn"];
  const presets = PASS_PRESETS.filter((p) => wanted.includes(p.kind));
  const ref = useWb((s) => s.scenario.pass.part);
  const team = useTeamParts("pass").filter((p) => wanted.includes(String(p.values.kind)));
  const known = ref ? team.some((p) => p.id === ref.id) : presets.some((p) => p.preset === preset);
  const value = ref ? `${TEAM}${ref.id}` : preset;
  if (template === "howland") return null;
  const bjt = kind === "npn" || kind === "pnp";
  return (
    <Section title="Pass device" id="panel-pass" defaultOpen={false}>
      <Select
        id="pass-preset" label="Pass-device preset" value={known ? value : ""}
        options={[
          ...(known ? [] : [{ value: "", label: ref ? `${preset} (v${ref.version})` : "Custom" }]),
          ...team.map((p) => ({ value: `${TEAM}${p.id}`, label: `Team: ${p.name} (v${p.version})` })),
          ...presets.map((p) => ({ value: p.preset, label: p.preset })),
        ]}
        onChange={(v) => {
          const t = team.find((x) => `${TEAM}${x.id}` === v);
          if (t) {
            store.getState().edit((s) => applyPart(s, { id: t.id, version: t.version, kind: t.kind, name: t.name, values: t.values }));
            return;
          }
          const p = PASS_PRESETS.find((x) => x.preset === v);
          if (p) store.getState().edit((s) => ({ ...s, pass: { ...p, part: null } }));
        }}
      />
      {bjt ? (
        <>
          <ParamField partKey="pass" spec={{ path: "pass.betaF", label: "Forward current gain βF", unit: "" }} />
          <ParamField partKey="pass" spec={{ path: "pass.betaMin", label: "Minimum current gain βmin", unit: "" }} />
          <ParamField partKey="pass" spec={{ path: "pass.Is", label: "Saturation current Is", unit: "A" }} />
          <ParamField partKey="pass" spec={{ path: "pass.VA", label: "Early voltage VA (empty = none)", unit: "V", nullable: true }} />
          <ParamField partKey="pass" spec={{ path: "pass.Cje0", label: "Base–emitter capacitance Cje0", unit: "F" }} />
          <ParamField partKey="pass" spec={{ path: "pass.Cjc0", label: "Base–collector capacitance Cjc0", unit: "F" }} />
          <ParamField partKey="pass" spec={{ path: "pass.tauF", label: "Transit time τF", unit: "s" }} />
        </>
      ) : (
        <>
          <ParamField partKey="pass" spec={{ path: "pass.Vth", label: "Threshold Vth", unit: "V" }} />
          <ParamField partKey="pass" spec={{ path: "pass.K", label: "K (square law)", unit: "A/V²" }} />
          <ParamField partKey="pass" spec={{ path: "pass.lambda", label: "Channel-length modulation λ", unit: "1/V" }} />
          <ParamField partKey="pass" spec={{ path: "pass.Cgs", label: "Gate–source capacitance Cgs", unit: "F" }} />
          <ParamField partKey="pass" spec={{ path: "pass.Cgd", label: "Gate–drain capacitance Cgd", unit: "F" }} />
        </>
      )}
      <ParamField partKey="pass" spec={{ path: "pass.vMax", label: "Rated voltage", unit: "V" }} />
      <ParamField partKey="pass" spec={{ path: "pass.pMax", label: "Rated dissipation (25 °C case)", unit: "W" }} />
      <ParamField partKey="pass" spec={{ path: "pass.thetaJC", label: "Thermal resistance θjc", unit: "°C/W" }} />
      <ParamField partKey="pass" spec={{ path: "pass.tjMax", label: "Max junction temperature", unit: "°C" }} />
      <ParamField partKey="pass" spec={{ path: "pass.soaCornerVoltage", label: "SOA corner (empty = not given)", unit: "V", nullable: true }} />
    </Section>
  );
}
