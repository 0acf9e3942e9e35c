"use client";
/** The lead's form for the team's measured-vs-simulated tolerances. */
import { useActionState } from "react";
import type { ActionState } from "@/lib/auth/action-state";
import type { Tolerances } from "@/lib/traces/compare";

const FIELDS: [keyof Tolerances, string][] = [
  ["riseTimePct", "Rise time ± %"],
  ["overshootPts", "Overshoot ± points"],
  ["settlingTimePct", "Settling time ± %"],
  ["ringingPct", "Ringing frequency ± %"],
  ["rmsPctOfStep", "RMS difference ≤ % of step"],
  ["settleBandPct", "Settling band ± %"],
];

export function TolerancesForm({ action, tolerances }: { action: (s: ActionState, f: FormData) => Promise<ActionState>; tolerances: Tolerances }) {
  const [state, formAction, pending] = useActionState(action, {});
  return (
    <form action={formAction} className="flex flex-wrap items-end gap-3 text-sm" aria-label="Team tolerances">
      {FIELDS.map(([k, label]) => (
        <label key={k} className="flex flex-col">
          <span className="text-xs text-ink-muted">{label}</span>
          <input name={k} defaultValue={state.values?.[k] ?? String(tolerances[k])} className="num w-24 rounded border border-hairline px-2 py-1" inputMode="decimal" aria-label={label} />
          {state.fieldErrors?.[k] && <span className="text-xs text-verdict-fail">{state.fieldErrors[k][0]}</span>}
        </label>
      ))}
      <button type="submit" disabled={pending} className="rounded border border-signal px-3 py-1.5 text-signal">Save tolerances</button>
      {state.message && <span role={state.ok ? "status" : "alert"} className={state.ok ? "text-verdict-pass" : "text-verdict-fail"}>{state.message}</span>}
    </form>
  );
}
