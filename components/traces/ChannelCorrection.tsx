"use client";
/**
 * Correct a channel's unit and scale after upload, without the file: what the numbers are in, and a probe factor or
 * sense resistor. Stored on the server as a new version of the trace's channel settings (audited).
 */
import { useState } from "react";
import { FIELD } from "@/components/shell/classes";

type Kind = "A" | "mA" | "V" | "mV" | "sense" | "msense" | "factor";

const KINDS: { value: Kind; label: string }[] = [
  { value: "A", label: "already in amperes (A)" },
  { value: "mA", label: "in milliamperes (mA)" },
  { value: "V", label: "already in volts (V)" },
  { value: "mV", label: "in millivolts (mV)" },
  { value: "sense", label: "volts across a sense resistor → amps" },
  { value: "msense", label: "millivolts across a sense resistor → amps" },
  { value: "factor", label: "volts × a probe factor (A/V) → amps" },
];

export function ChannelCorrection(props: {
  traceId: string;
  channel: number;
  current: { name: string; unit: string };
  onSaved: () => void;
}) {
  const [open, setOpen] = useState(false);
  const [kind, setKind] = useState<Kind>("A");
  const [value, setValue] = useState("");
  const [busy, setBusy] = useState(false);
  const [message, setMessage] = useState<{ ok: boolean; text: string } | null>(null);
  const needsValue = kind === "sense" || kind === "msense" || kind === "factor";

  async function save() {
    let body: Record<string, unknown>;
    if (needsValue) {
      const v = Number(value);
      if (!Number.isFinite(v) || v <= 0) {
        setMessage({ ok: false, text: kind === "factor" ? "Probe factor: enter a number above zero, in A/V." : "Sense resistor: enter a resistance above zero, in Ω." });
        return;
      }
      body = { channel: props.channel, sourceUnit: kind === "msense" ? "mV" : "V", scale: kind === "factor" ? v : 1 / v, unit: "A" };
    } else body = { channel: props.channel, sourceUnit: kind, scale: 1 };
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
      setMessage({ ok: true, text: `Saved: ${props.current.name} is now in ${body.unit ?? (String(body.sourceUnit).endsWith("A") ? "A" : "V")} (settings version ${out.settingsVersion}).` });
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
            <select className={FIELD} value={kind} onChange={(e) => setKind(e.target.value as Kind)} aria-label="Channel unit correction">
              {KINDS.map((k) => <option key={k.value} value={k.value}>{k.label}</option>)}
            </select>
          </label>
          {needsValue && (
            <label className="flex flex-col">
              <span className="text-xs text-ink-muted">{kind === "factor" ? "Probe factor, A/V" : "Sense resistor, Ω"}</span>
              <input className={`${FIELD} num w-28`} value={value} inputMode="decimal" onChange={(e) => setValue(e.target.value)} aria-label={kind === "factor" ? "Correction probe factor" : "Correction sense resistor"} />
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
