"use client";
/**
 * The Parts page's list and forms: new part (from a built-in preset's values), a new version of a part, retire,
 * import and export of the parts file. Writes go to /api/parts, which checks the role and the values and answers
 * with the field that is wrong.
 */
import { useRouter } from "next/navigation";
import { useState } from "react";
import type { PartDetail } from "@/lib/db/parts";
import { OPAMP_PRESETS, PASS_PRESETS } from "@/lib/design/presets";
import { parseEng } from "@/lib/units/eng";
import { formatEngInput } from "@/lib/units/field";

type Kind = "opamp" | "pass";
type Values = Record<string, unknown>;

/** Units of the values the forms show (SI); fields without one are plain numbers or words. */
const UNITS: Record<string, string> = {
  GBW: "Hz", fp2: "Hz", Rout: "Ω", slewRate: "V/s", Vos: "V", Ib: "A", swingHigh: "V", swingLow: "V", Iout: "A",
  vosMax: "V", ibMax: "A", vosDrift: "V/°C", cmLowFromVee: "V", cmHighFromVcc: "V",
  Is: "A", VA: "V", Cje0: "F", Cjc0: "F", tauF: "s", Vth: "V", K: "A/V²", lambda: "1/V", Cgs: "F", Cgd: "F",
  vMax: "V", iMax: "A", pMax: "W", vSat: "V", thetaJC: "°C/W", thetaJA: "°C/W", tjMax: "°C",
};

function startValues(kind: Kind): Values {
  const { preset: _p, ...v } = kind === "opamp" ? OPAMP_PRESETS[0]! : PASS_PRESETS[0]!;
  return v;
}

async function send(method: string, url: string, body?: unknown): Promise<string | null> {
  const r = await fetch(url, { method, headers: { "content-type": "application/json" }, body: body === undefined ? undefined : JSON.stringify(body) });
  if (r.ok) return null;
  const j = (await r.json().catch(() => ({}))) as { error?: string; fieldErrors?: Record<string, string[]> };
  const fields = j.fieldErrors ? Object.entries(j.fieldErrors).map(([k, v]) => `${k}: ${v.join(", ")}`).join("; ") : "";
  return [j.error, fields].filter(Boolean).join(" ") || `The server answered ${r.status}.`;
}

/** The values as editable fields: numbers in engineering notation (empty = none where allowed), words as text. */
function ValuesForm({ values, onChange, idPrefix }: { values: Values; onChange: (v: Values) => void; idPrefix: string }) {
  const [text, setText] = useState<Record<string, string>>(() =>
    Object.fromEntries(Object.entries(values).map(([k, v]) => [k, typeof v === "number" ? formatEngInput(v) : v === null ? "" : String(v)])));
  const [errors, setErrors] = useState<Record<string, string>>({});
  return (
    <div className="grid grid-cols-1 gap-x-4 gap-y-1 sm:grid-cols-2">
      {Object.entries(values).map(([k, v]) => {
        const id = `${idPrefix}-${k}`;
        return (
          <label key={k} htmlFor={id} className="flex items-center gap-2 text-[13px]">
            <span className="w-32 shrink-0 font-mono text-[12px]">{k}</span>
            <input id={id} data-testid={id} className="num w-full rounded border border-hairline px-1 py-0.5" value={text[k] ?? ""}
              onChange={(e) => {
                const t = e.target.value;
                setText({ ...text, [k]: t });
                if (typeof v === "string") { onChange({ ...values, [k]: t }); return; }
                if (t.trim() === "") { onChange({ ...values, [k]: null }); setErrors({ ...errors, [k]: "" }); return; }
                const p = parseEng(t);
                if (p.ok) { onChange({ ...values, [k]: p.value }); setErrors({ ...errors, [k]: "" }); }
                else setErrors({ ...errors, [k]: p.error });
              }} />
            <span className="w-12 text-[11px] text-ink-muted">{UNITS[k] ?? ""}</span>
            {errors[k] && <span className="text-[11px] text-verdict-fail">{errors[k]}</span>}
          </label>
        );
      })}
    </div>
  );
}

function NewPart({ onDone }: { onDone: () => void }) {
  const [kind, setKind] = useState<Kind>("opamp");
  const [name, setName] = useState("");
  const [values, setValues] = useState<Values>(() => startValues("opamp"));
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  return (
    <form className="space-y-2 rounded border border-hairline bg-white p-3" data-testid="part-new"
      onSubmit={async (e) => {
        e.preventDefault();
        setBusy(true);
        const err = await send("POST", "/api/parts", { kind, name, values });
        setBusy(false);
        setError(err);
        if (!err) { setName(""); onDone(); }
      }}>
      <h2 className="text-sm font-semibold">New part</h2>
      <div className="flex flex-wrap items-center gap-3 text-[13px]">
        <label className="flex items-center gap-2">Kind
          <select value={kind} data-testid="part-new-kind" className="rounded border border-hairline px-1 py-0.5"
            onChange={(e) => { const k = e.target.value as Kind; setKind(k); setValues(startValues(k)); }}>
            <option value="opamp">Op-amp</option>
            <option value="pass">Pass device</option>
          </select>
        </label>
        <label className="flex flex-1 items-center gap-2">Name
          <input value={name} onChange={(e) => setName(e.target.value)} data-testid="part-new-name" required maxLength={80}
            className="w-full rounded border border-hairline px-1 py-0.5" placeholder="e.g. Bench amp 2 MHz" />
        </label>
      </div>
      <p className="text-[12px] text-ink-muted">Starts from a built-in preset&apos;s values; change what your part&apos;s datasheet says.</p>
      <ValuesForm key={kind} values={values} onChange={setValues} idPrefix="part-new" />
      {error && <p role="alert" className="text-[13px] text-verdict-fail">{error}</p>}
      <button type="submit" disabled={busy} className="rounded bg-signal px-3 py-1.5 text-sm font-medium text-white disabled:opacity-50" data-testid="part-new-save">Create part</button>
    </form>
  );
}

function PartRow({ part, canEdit, onDone }: { part: PartDetail; canEdit: boolean; onDone: () => void }) {
  const [editing, setEditing] = useState(false);
  const [values, setValues] = useState<Values>(part.values);
  const [note, setNote] = useState("");
  const [error, setError] = useState<string | null>(null);
  const slug = part.name.replace(/[^\w]+/g, "-").toLowerCase();
  return (
    <li className="px-4 py-2" data-testid={`part-${slug}`}>
      <div className="flex flex-wrap items-center gap-3 text-sm">
        <span className="font-medium">{part.name}</span>
        <span className="text-ink-muted">{part.kind === "opamp" ? "op-amp" : `pass device (${String(part.values.kind)})`}</span>
        <span className="num text-ink-muted" data-testid={`part-${slug}-version`}>version {part.currentVersion}</span>
        {part.retired && <span className="text-verdict-warn">retired</span>}
        {canEdit && !part.retired && (
          <span className="ml-auto flex gap-2">
            <button type="button" className="text-signal underline" data-testid={`part-${slug}-edit`} onClick={() => setEditing(!editing)}>{editing ? "Close" : "New version"}</button>
            <button type="button" className="text-verdict-fail underline" data-testid={`part-${slug}-retire`}
              onClick={async () => { const err = await send("DELETE", `/api/parts/${part.id}`); setError(err); if (!err) onDone(); }}>Retire</button>
          </span>
        )}
      </div>
      {editing && (
        <form className="mt-2 space-y-2" onSubmit={async (e) => {
          e.preventDefault();
          const err = await send("PATCH", `/api/parts/${part.id}`, { values, note });
          setError(err);
          if (!err) { setEditing(false); onDone(); }
        }}>
          <ValuesForm values={values} onChange={setValues} idPrefix={`part-${slug}`} />
          <label className="flex items-center gap-2 text-[13px]">Note
            <input value={note} onChange={(e) => setNote(e.target.value)} maxLength={2000} className="w-full rounded border border-hairline px-1 py-0.5" />
          </label>
          <button type="submit" className="rounded bg-signal px-3 py-1 text-sm font-medium text-white" data-testid={`part-${slug}-save`}>Save version {part.currentVersion + 1}</button>
        </form>
      )}
      {error && <p role="alert" className="mt-1 text-[13px] text-verdict-fail">{error}</p>}
      <details className="mt-1 text-[12px] text-ink-muted">
        <summary className="cursor-pointer">History ({part.versions.length} version{part.versions.length === 1 ? "" : "s"})</summary>
        <ul>
          {part.versions.map((v) => (
            <li key={v.version}>version {v.version} · {v.authorName ?? "someone"} · {v.createdAt.slice(0, 16).replace("T", " ")} UTC{v.note ? ` · ${v.note}` : ""}</li>
          ))}
        </ul>
      </details>
    </li>
  );
}

export function PartsManager({ parts, canEdit }: { parts: PartDetail[]; canEdit: boolean }) {
  const router = useRouter();
  const [importError, setImportError] = useState<string | null>(null);
  const refresh = () => router.refresh();
  return (
    <div className="mt-6 space-y-4" data-testid="parts-manager">
      <div className="flex flex-wrap items-center gap-4 text-sm">
        <a href="/api/parts?export=1" className="text-signal underline" data-testid="parts-export">Export parts (JSON)</a>
        {canEdit && (
          <label className="flex items-center gap-2">Import a parts file
            <input type="file" accept="application/json,.json" data-testid="parts-import"
              onChange={async (e) => {
                const file = e.target.files?.[0];
                if (!file) return;
                let data: unknown;
                try { data = JSON.parse(await file.text()); } catch { setImportError("The file is not valid JSON."); return; }
                const err = await send("POST", "/api/parts", data);
                setImportError(err);
                if (!err) refresh();
              }} />
          </label>
        )}
      </div>
      {importError && <p role="alert" className="text-[13px] text-verdict-fail">{importError}</p>}
      {canEdit && <NewPart onDone={refresh} />}
      <section className="rounded border border-hairline bg-white">
        <h2 className="border-b border-hairline px-4 py-2 text-sm font-semibold">Parts</h2>
        {parts.length === 0 && <p className="px-4 py-3 text-sm text-ink-muted">No parts yet: scenarios use the built-in generic presets.</p>}
        <ul className="divide-y divide-hairline" data-testid="parts-list">
          {parts.map((p) => <PartRow key={`${p.id}-${p.currentVersion}`} part={p} canEdit={canEdit} onDone={refresh} />)}
        </ul>
      </section>
    </div>
  );
}
