"use client";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { send } from "./fetcher";
import { FIELD } from "@/components/shell/classes";

/** Designers set a scenario's status (draft, review, final) through PATCH /api/scenarios/:id. */
export function StatusSelect({ scenarioId, status, statuses }: { scenarioId: string; status: string; statuses: readonly string[] }) {
  const router = useRouter();
  const [value, setValue] = useState(status);
  const [err, setErr] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  async function change(next: string) {
    const prev = value;
    setValue(next);
    setBusy(true);
    setErr(null);
    try {
      await send(`/api/scenarios/${scenarioId}`, "PATCH", { status: next });
      router.refresh();
    } catch (x) {
      setValue(prev);
      setErr((x as Error).message);
    } finally {
      setBusy(false);
    }
  }
  return (
    <span className="inline-flex items-center gap-2">
      <label htmlFor="scenario-status" className="text-sm text-ink-muted">Status</label>
      <select id="scenario-status" value={value} disabled={busy} onChange={(e) => change(e.target.value)} className={FIELD}>
        {statuses.map((s) => <option key={s} value={s}>{s}</option>)}
      </select>
      {err && <span role="alert" className="text-xs text-verdict-fail">Not changed: {err}</span>}
    </span>
  );
}
