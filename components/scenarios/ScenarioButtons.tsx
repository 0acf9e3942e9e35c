"use client";
import { useRouter } from "next/navigation";
import { useState, useTransition } from "react";
import { BUTTON, TOOL_BUTTON } from "@/components/shell/classes";

export type Fork = (input: { revisionId: string; title?: string }) => Promise<{ ok: true; scenarioId: string } | { ok: false; message: string }>;
type SetDeleted = (input: { scenarioId: string; deleted: boolean }) => Promise<{ ok: true } | { ok: false; message: string }>;

/** A button that runs a server action in a transition and shows its refusal beside it. */
function ActionButton({ run, label, busyLabel, className }: {
  run: () => Promise<string | null>;
  label: string;
  busyLabel?: string;
  className: string;
}) {
  const [pending, start] = useTransition();
  const [err, setErr] = useState<string | null>(null);
  return (
    <span className="inline-flex items-center gap-2">
      <button type="button" disabled={pending} onClick={() => start(async () => setErr(await run()))} className={`${className} disabled:opacity-60`}>
        {pending && busyLabel ? busyLabel : label}
      </button>
      {err && <span role="alert" className="text-xs text-verdict-fail">{err}</span>}
    </span>
  );
}

/** "Fork to my drafts": copies a revision into a new scenario of the user and opens it. */
export function ForkButton({ revisionId, fork, label = "Fork to my drafts", compact = false }: { revisionId: string; fork: Fork; label?: string; compact?: boolean }) {
  const router = useRouter();
  return (
    <ActionButton
      label={label}
      busyLabel="Forking…"
      className={compact ? `${TOOL_BUTTON} text-ink` : BUTTON}
      run={async () => {
        const r = await fork({ revisionId });
        if (!r.ok) return r.message;
        router.push(`/scenarios/${r.scenarioId}`);
        return null;
      }}
    />
  );
}

type CopyShared = (input: { token: string }) => Promise<{ ok: true; scenarioId: string } | { ok: false; message: string }>;

/** "Open a copy" of a publicly shared revision in the signed-in user's team. */
export function OpenCopyButton({ token, copy }: { token: string; copy: CopyShared }) {
  const router = useRouter();
  return (
    <ActionButton
      label="Open a copy"
      busyLabel="Copying…"
      className={BUTTON}
      run={async () => {
        const r = await copy({ token });
        if (!r.ok) return r.message;
        router.push(`/scenarios/${r.scenarioId}`);
        return null;
      }}
    />
  );
}

/** Soft delete (to the table's Deleted view) or restore; owner or lead. */
export function DeleteButton({ scenarioId, deleted, setDeleted }: { scenarioId: string; deleted: boolean; setDeleted: SetDeleted }) {
  const router = useRouter();
  return (
    <ActionButton
      label={deleted ? "Restore" : "Delete"}
      className={`rounded border px-3 py-1.5 text-sm ${deleted ? "border-hairline bg-white" : "border-verdict-fail/40 text-verdict-fail"}`}
      run={async () => {
        const r = await setDeleted({ scenarioId, deleted: !deleted });
        if (!r.ok) return r.message;
        if (!deleted) router.push("/scenarios");
        else router.refresh();
        return null;
      }}
    />
  );
}
