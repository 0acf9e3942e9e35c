"use client";
/**
 * Upload a scope export: the file is parsed in the browser first (so a bad line shows at once), then sent as a
 * multipart form; the server parses it again and stores nothing when it cannot read it.
 */
import { useMemo, useState, type FormEvent } from "react";
import { parseTraceCsv, TraceParseError, type ChannelOption, type ParsedTrace, type TraceProblem } from "@/lib/traces/parse";
import { formatEng } from "@/lib/units/eng";
import { FIELD } from "@/components/shell/classes";
import { useHydrated } from "@/components/shell/useHydrated";
import { CONVERSIONS, conversionSettings, needsOf, type Conversion } from "@/lib/traces/conversions";

interface ChannelForm { name: string; convert: Conversion; value: string; unit: "" | "V" | "A" }

function channelOption(c: ChannelForm): { option: ChannelOption; error: string | null } {
  const { settings, error } = conversionSettings(c.convert, c.value, c.unit || undefined);
  const option: ChannelOption = { ...settings };
  if (c.name.trim()) option.name = c.name.trim();
  return { option, error };
}

export function TraceUpload({ scenarioId, revisionId, revisionNumber, onUploaded }: { scenarioId: string; revisionId: string; revisionNumber: number; onUploaded: () => void }) {
  const [file, setFile] = useState<File | null>(null);
  const [text, setText] = useState<string | null>(null);
  const [label, setLabel] = useState("");
  // The label follows the chosen file until the user types in it.
  const [labelEdited, setLabelEdited] = useState(false);
  const [timeUnit, setTimeUnit] = useState("");
  const [channels, setChannels] = useState<ChannelForm[]>([]);
  const [settings, setSettings] = useState({ probe: "", verticalScale: "", timebase: "", bandwidthLimit: "", notes: "" });
  const [busy, setBusy] = useState(false);
  const [serverError, setServerError] = useState<{ error: string; problems?: TraceProblem[] } | null>(null);
  const [done, setDone] = useState<string | null>(null);
  // A file chosen before this form hydrates would be lost: tests wait for data-ready (the page's IslandMark too).
  const ready = useHydrated();

  const options = useMemo(() => {
    const errors: string[] = [];
    const list = channels.map((c) => { const r = channelOption(c); if (r.error) errors.push(r.error); return r.option; });
    return { timeUnit: timeUnit || undefined, channels: list, errors };
  }, [channels, timeUnit]);

  const preview = useMemo((): { ok: true; parsed: ParsedTrace } | { ok: false; error: string; problems: TraceProblem[] } | null => {
    if (text === null) return null;
    try {
      return { ok: true, parsed: parseTraceCsv(text, { timeUnit: options.timeUnit, channels: options.channels }) };
    } catch (e) {
      if (e instanceof TraceParseError) return { ok: false, error: e.message, problems: e.problems };
      return { ok: false, error: e instanceof Error ? e.message : String(e), problems: [] };
    }
  }, [text, options]);

  async function pick(f: File | null) {
    setFile(f);
    setServerError(null);
    setDone(null);
    if (!f) { setText(null); return; }
    if (!labelEdited) setLabel(f.name.replace(/\.[^.]+$/, ""));
    const t = await f.text();
    setText(t);
    try {
      const p = parseTraceCsv(t);
      setChannels(p.channels.map((c) => ({ name: c.name, convert: "keep", value: "", unit: "" })));
    } catch {
      setChannels([]);
    }
  }

  async function submit(e: FormEvent) {
    e.preventDefault();
    if (!file) return;
    setBusy(true);
    setServerError(null);
    const form = new FormData();
    form.set("file", file);
    form.set("label", label);
    form.set("revisionId", revisionId);
    form.set("options", JSON.stringify({ timeUnit: options.timeUnit, channels: options.channels }));
    form.set("settings", JSON.stringify(Object.fromEntries(Object.entries(settings).filter(([, v]) => v.trim() !== ""))));
    try {
      const r = await fetch(`/api/scenarios/${scenarioId}/traces`, { method: "POST", body: form });
      const body = await r.json().catch(() => ({}));
      if (!r.ok) { setServerError({ error: body.error ?? `Upload failed (HTTP ${r.status})`, problems: body.problems }); return; }
      setDone(`Stored “${body.label}”: ${body.sampleCount} samples.`);
      setFile(null); setText(null); setLabel(""); setLabelEdited(false); setChannels([]);
      const input = document.getElementById("trace-file") as HTMLInputElement | null;
      if (input) input.value = "";
      onUploaded();
    } finally {
      setBusy(false);
    }
  }

  const problems = serverError?.problems ?? (preview && !preview.ok ? preview.problems : []);
  return (
    <form onSubmit={submit} className="space-y-3" data-testid="trace-upload" data-ready={ready ? "1" : undefined} aria-label="Upload a bench trace">
      <p className="text-xs text-ink-muted">Oscilloscope export (CSV): a time column and one or more channels; settings lines and a header are recognised. Stored against revision {revisionNumber}.</p>
      <div className="flex flex-wrap gap-4">
        <label className="flex flex-col text-sm">
          <span className="text-xs text-ink-muted">CSV file</span>
          <input id="trace-file" type="file" accept=".csv,.txt,text/csv,text/plain" onChange={(e) => void pick(e.target.files?.[0] ?? null)} aria-label="CSV file" />
        </label>
        <label className="flex flex-col text-sm">
          <span className="text-xs text-ink-muted">Label</span>
          <input className={FIELD} value={label} onChange={(e) => { setLabel(e.target.value); setLabelEdited(true); }} maxLength={200} aria-label="Label" />
        </label>
        <label className="flex flex-col text-sm">
          <span className="text-xs text-ink-muted">Time unit</span>
          <select className={FIELD} value={timeUnit} onChange={(e) => setTimeUnit(e.target.value)} aria-label="Time unit">
            <option value="">from the file</option>
            <option value="s">s</option><option value="ms">ms</option><option value="µs">µs</option><option value="ns">ns</option>
          </select>
        </label>
      </div>
      {channels.length > 0 && (
        <fieldset className="rounded border border-hairline p-2">
          <legend className="px-1 text-xs text-ink-muted">Channels: names and scaling to SI units</legend>
          {channels.map((c, i) => (
            <div key={i} className="flex flex-wrap items-end gap-3 py-1 text-sm">
              <label className="flex flex-col"><span className="text-xs text-ink-muted">Channel {i + 1} name</span>
                <input className={FIELD} value={c.name} aria-label={`Channel ${i + 1} name`} onChange={(e) => setChannels(channels.map((x, j) => (j === i ? { ...x, name: e.target.value } : x)))} />
              </label>
              <label className="flex flex-col"><span className="text-xs text-ink-muted">Conversion</span>
                <select className={FIELD} value={c.convert} aria-label={`Channel ${i + 1} conversion`} onChange={(e) => setChannels(channels.map((x, j) => (j === i ? { ...x, convert: e.target.value as Conversion } : x)))}>
                  {CONVERSIONS.map((o) => <option key={o.value} value={o.value}>{o.label}</option>)}
                </select>
              </label>
              {needsOf(c.convert) && (
                <label className="flex flex-col"><span className="text-xs text-ink-muted">{needsOf(c.convert) === "factor" ? "Factor (e.g. 10 for 10 A/V)" : "Sense resistor, Ω"}</span>
                  <input className={`${FIELD} num w-28`} value={c.value} inputMode="decimal" aria-label={needsOf(c.convert) === "factor" ? `Channel ${i + 1} factor` : `Channel ${i + 1} sense resistor`} onChange={(e) => setChannels(channels.map((x, j) => (j === i ? { ...x, value: e.target.value } : x)))} />
                </label>
              )}
              {c.convert === "factor" && (
                <label className="flex flex-col"><span className="text-xs text-ink-muted">Unit after</span>
                  <select className={FIELD} value={c.unit} aria-label={`Channel ${i + 1} unit after`} onChange={(e) => setChannels(channels.map((x, j) => (j === i ? { ...x, unit: e.target.value as ChannelForm["unit"] } : x)))}>
                    <option value="">same</option><option value="A">A</option><option value="V">V</option>
                  </select>
                </label>
              )}
            </div>
          ))}
        </fieldset>
      )}
      <fieldset className="flex flex-wrap gap-3 rounded border border-hairline p-2 text-sm">
        <legend className="px-1 text-xs text-ink-muted">Instrument settings (kept with the trace)</legend>
        {([["probe", "Probe / shunt"], ["verticalScale", "Vertical scale"], ["timebase", "Timebase"], ["bandwidthLimit", "Bandwidth limit"], ["notes", "Notes"]] as const).map(([k, l]) => (
          <label key={k} className="flex flex-col"><span className="text-xs text-ink-muted">{l}</span>
            <input className={FIELD} value={settings[k]} maxLength={500} aria-label={l} onChange={(e) => setSettings({ ...settings, [k]: e.target.value })} />
          </label>
        ))}
      </fieldset>
      {options.errors.length > 0 && <p role="alert" className="text-sm text-verdict-fail">{options.errors[0]}</p>}
      {preview?.ok && (
        <p className="text-sm text-ink-muted num" data-testid="trace-preview">
          Read {preview.parsed.time.length.toLocaleString("en")} rows from line {preview.parsed.firstDataLine}: {formatEng(preview.parsed.time[0], "s")} to {formatEng(preview.parsed.time[preview.parsed.time.length - 1], "s")};{" "}
          {preview.parsed.channels.map((c) => `${c.name} [${c.unit || "no unit"}]`).join(", ")}.
          {preview.parsed.warnings.map((w) => <span key={w} className="block text-verdict-warn">Note: {w}</span>)}
        </p>
      )}
      {(serverError || (preview && !preview.ok)) && (
        <div role="alert" className="rounded border border-verdict-fail/30 bg-red-50 px-3 py-2 text-sm text-verdict-fail" data-testid="trace-error">
          {serverError?.error ?? (preview && !preview.ok ? preview.error : "")}
          {problems.length > 1 && <ul className="mt-1 list-disc pl-5">{problems.slice(0, 10).map((p, i) => <li key={i}>{p.line > 0 ? `Line ${p.line}: ` : ""}{p.message}</li>)}</ul>}
        </div>
      )}
      {done && <p role="status" className="text-sm text-verdict-pass">{done}</p>}
      <button type="submit" disabled={!file || busy || !preview?.ok || options.errors.length > 0} className="rounded bg-signal px-3 py-1.5 text-sm font-medium text-white disabled:opacity-50">
        {busy ? "Uploading…" : "Upload trace"}
      </button>
    </form>
  );
}
