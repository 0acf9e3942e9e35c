"use client";
/**
 * A value typed in engineering notation ("2.2k", "3.3n", "4.7µ", "1M" = mega) with its unit shown, an optional
 * log-scale slider (resistors and capacitors) and E-series snapping. A bad entry is marked in place with the reason
 * and is not applied — never silently clamped. Enter or leaving the field applies a good entry; Escape restores.
 */
import { useEffect, useId, useRef, useState } from "react";
import { formatEng, parseEng } from "@/lib/units/eng";
import { nearestE, type ESeriesName } from "@/lib/design/eseries";
import { editText, editTextFor } from "@/lib/workbench/format";

export { editText };

export interface ValueFieldProps {
  id: string;
  label: string;
  unit: string;
  value: number | null;
  /** Apply a value that passed parsing and `validate`. `coalesce` is set for slider drags. */
  onCommit: (value: number | null, coalesce: boolean) => void;
  /** Extra check after parsing (range, schema rules); return the reason or null. */
  validate?: (value: number) => string | null;
  min?: number;
  max?: number;
  /** Show a log-scale slider between these bounds. */
  slider?: boolean;
  /** Snap applied values to this E-series. */
  snap?: ESeriesName | null;
  /** An empty field means "none" (null). */
  nullable?: boolean;
  integer?: boolean;
  onFocus?: () => void;
  selected?: boolean;
  testId?: string;
  compact?: boolean;
}

const STEPS = 1000;

export function ValueField(props: ValueFieldProps) {
  const { id, label, unit, value, onCommit, validate, min, max, slider, snap, nullable, integer, onFocus, selected, testId, compact } = props;
  const shown = value === null ? "" : editTextFor(value, unit);
  const [draft, setDraft] = useState(shown);
  const [error, setError] = useState<string | null>(null);
  const [note, setNote] = useState<string | null>(null);
  const focused = useRef(false);
  const draftRef = useRef(draft);
  draftRef.current = draft;
  const errId = useId();

  // An outside change (undo, preset, apply) replaces the text unless the person is typing something else in it.
  const lastShown = useRef(shown);
  useEffect(() => {
    const prev = lastShown.current;
    lastShown.current = shown;
    if (focused.current && draftRef.current !== prev) return;
    setDraft(shown);
    setError(null);
  }, [shown]);

  const check = (text: string): { ok: true; value: number | null } | { ok: false; error: string } => {
    if (nullable && text.trim() === "") return { ok: true, value: null };
    const p = parseEng(text, unit || undefined);
    if (!p.ok) return p;
    let v = p.value;
    if (integer && !Number.isInteger(v)) return { ok: false, error: "Must be a whole number" };
    if (min !== undefined && v < min) return { ok: false, error: `Below the minimum ${formatEng(min, unit)}` };
    if (max !== undefined && v > max) return { ok: false, error: `Above the maximum ${formatEng(max, unit)}` };
    const extra = validate?.(v) ?? null;
    if (extra) return { ok: false, error: extra };
    if (snap && v > 0) v = nearestE(v, snap);
    return { ok: true, value: v };
  };

  const apply = () => {
    const r = check(draft);
    if (!r.ok) {
      setError(r.error);
      return;
    }
    setError(null);
    const before = value;
    const typed = parseEng(draft, unit || undefined);
    setNote(snap && r.value !== null && typed.ok && typed.value !== r.value ? `snapped to ${snap}: ${formatEng(r.value, unit)}` : null);
    if (r.value !== before) onCommit(r.value, false);
    setDraft(r.value === null ? "" : editTextFor(r.value, unit));
  };

  const lo = Math.max(min ?? 0, unit === "F" ? 1e-12 : unit === "Ω" ? 1e-3 : 1e-15);
  const hi = max ?? lo * 1e6;
  const toPos = (v: number) => Math.round((Math.log(Math.max(lo, Math.min(hi, v)) / lo) / Math.log(hi / lo)) * STEPS);
  const fromPos = (p: number) => lo * Math.exp((p / STEPS) * Math.log(hi / lo));

  return (
    <div
      className={`rounded px-2 ${compact ? "py-1" : "py-1.5"} ${selected ? "bg-signal-light/60 ring-1 ring-signal" : ""}`}
      data-testid={testId}
    >
      <div className="flex items-center gap-2">
        <label htmlFor={id} className="min-w-0 flex-1 truncate text-[13px] text-ink">{label}</label>
        <div className="flex items-center">
          <input
            id={id}
            type="text"
            inputMode="decimal"
            spellCheck={false}
            autoComplete="off"
            className={`num w-24 rounded border bg-white px-1.5 py-0.5 text-right text-[13px] ${error ? "border-verdict-fail text-verdict-fail" : "border-hairline"} focus-visible:outline-2 focus-visible:outline-signal`}
            value={draft}
            data-editing={draft !== shown ? "true" : undefined}
            aria-invalid={error ? true : undefined}
            aria-describedby={error ? errId : undefined}
            onFocus={() => {
              focused.current = true;
              onFocus?.();
            }}
            onBlur={() => {
              focused.current = false;
              apply();
            }}
            onChange={(e) => {
              setDraft(e.target.value);
              const r = check(e.target.value);
              setError(r.ok ? null : r.error);
            }}
            onKeyDown={(e) => {
              if (e.key === "Enter") {
                e.preventDefault();
                apply();
              } else if (e.key === "Escape") {
                setDraft(shown);
                setError(null);
              }
            }}
          />
          <span className="num w-7 pl-1 text-[12px] text-ink-muted">{unit}</span>
        </div>
      </div>
      {slider && (
        <input
          type="range"
          min={0}
          max={STEPS}
          step={1}
          aria-label={`${label} (log scale)`}
          className="mt-1 w-full accent-signal"
          value={value === null ? 0 : toPos(value)}
          onFocus={onFocus}
          onChange={(e) => {
            let v = fromPos(Number(e.target.value));
            v = snap ? nearestE(v, snap) : Number(v.toPrecision(3));
            setError(null);
            setNote(null);
            onCommit(v, true);
          }}
        />
      )}
      {error && (
        <p id={errId} role="alert" className="mt-0.5 text-[12px] text-verdict-fail" data-testid="field-error">
          {error}
        </p>
      )}
      {!error && note && <p className="mt-0.5 text-[11px] text-ink-muted">{note}</p>}
    </div>
  );
}
