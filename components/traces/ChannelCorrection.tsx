"use client";
/**
 * Correct a channel's unit and scale after upload, without the file: what the numbers are in, and a probe factor or
 * sense resistor. Stored on the server as a new version of the trace's channel settings (audited).
 */
import { useState } from "react";
import { FIELD } from "@/components/shell/classes";
import { CONVERSIONS, conversionSettings, needsOf, type Conversion } from "@/lib/traces/conversions";

/** "As the file says" changes nothing, so the correction offers the other choices. */
const CHOICES = CONVERSIONS.filter((c) => c.value !== "keep");

export function ChannelCorrection(props: {
  traceId: string;
  channel: number;
  current: { name: string; unit: string };
  onSaved: () => void;
}) {
  const [open, setOpen] = useState(false);
  const [kind, setKind] = useState<Conversion>("A");
  const [factorUnit, setFactorUnit] = useState<"A" | "V">("A");
  const [value, setValue] = useState("");
  const [busy, setBusy] = useState(false);
  const [message, setMessage] = useState<{ ok: boolean; text: string } | null>(null);
  const needs = needsOf(kind);

  async function save() {
    const { settings, error } = conversionSettings(kind, value, kind === "factor" ? factorUnit : undefined);
    if (error) {
      setMessage({ ok: false, text: error });
      return;
    }
    // The server needs the file's unit named: a sense resistor or probe reads volts unless the choice says otherwise.
    const body = { channel: props.channel, sourceUnit: settings.sourceUnit ?? "V", scale: settings.scale ?? 1, ...(settings.unit ? { unit: settings.unit } : {}) };
    setBusy(true);
    setMessage(null);
    try {
      const r = await fetch(`/api/traces/${props.traceId}`, { method: "PATCH", headers: { "content-type": "application/json" }, body: JSON.stringify(body) });
      const out = await r.json().catch(() => ({}));
      if (!r.ok) {
        const fe = out.fieldErrors ? Object.values(out.fieldErrors as Record<string, string[]>)[0]?.[0] : null;
        setMessage({ ok: false, text: fe ?? out.error ?? `The correction was not saved (HTTP ${r.status}).` });
        return;
      }
      setMessage({ ok: true, text: `Saved: ${props.current.name} is now in ${settings.unit ?? (body.sourceUnit.endsWith("A") ? "A" : "V")} (settings version ${out.settingsVersion}).` });
      setOpen(false);
      props.onSaved();
    } finally {
      setBusy(false);
    }
  }

  return (
    <div className="text-sm no-print" data-testid="channel-correction">
      {!open ? (
        <button type="button" className="text-xs text-signal underline" onClick={() => setOpen(true)}>
          Correct the unit of {props.current.name} ({props.current.unit || "no unit"})
        </button>
      ) : (
        <div className="flex flex-wrap items-end gap-3 rounded border border-hairline p-2">
          <label className="flex flex-col">
            <span className="text-xs text-ink-muted">The numbers in the file are</span>
            <select className={FIELD} value={kind} onChange={(e) => setKind(e.target.value as Conversion)} aria-label="Channel unit correction">
              {CHOICES.map((k) => <option key={k.value} value={k.value}>{k.label}</option>)}
            </select>
          </label>
          {needs && (
            <label className="flex flex-col">
              <span className="text-xs text-ink-muted">{needs === "factor" ? "Probe factor" : "Sense resistor, Ω"}</span>
              <input className={`${FIELD} num w-28`} value={value} inputMode="decimal" onChange={(e) => setValue(e.target.value)} aria-label={needs === "factor" ? "Correction probe factor" : "Correction sense resistor"} />
            </label>
          )}
          {needs === "factor" && (
            <label className="flex flex-col">
              <span className="text-xs text-ink-muted">Unit after</span>
              <select className={FIELD} value={factorUnit} onChange={(e) => setFactorUnit(e.target.value as "A" | "V")} aria-label="Correction unit after">
                <option value="A">A (a current probe, A/V)</option>
                <option value="V">V (a voltage probe)</option>
              </select>
            </label>
          )}
          <button type="button" disabled={busy} onClick={() => void save()} className="rounded bg-signal px-3 py-1.5 text-sm font-medium text-white disabled:opacity-50">
            {busy ? "Saving…" : "Save the correction"}
          </button>
          <button type="button" onClick={() => setOpen(false)} className="text-xs text-ink-muted underline">Cancel</button>
        </div>
      )}
      {message && <p role={message.ok ? "status" : "alert"} className={`mt-1 text-xs ${message.ok ? "text-verdict-pass" : "text-verdict-fail"}`} data-testid="correction-message">{message.text}</p>}
    </div>
  );
}
