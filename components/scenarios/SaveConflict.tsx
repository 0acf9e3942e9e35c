/**
 * The save-conflict view: a save on a stale base revision comes back with the newer revision; this shows who saved
 * it and when, the values that differ from it to the user's version, and the choices the caller offers (children).
 * Shown by the workbench's save control and by the JSON save form.
 */
import type { ReactNode } from "react";
import type { SaveResult } from "@/lib/db/revisions";
import { diffBodies } from "@/lib/design/diff";
import { DiffTable } from "./DiffTable";
import { formatDateTime } from "@/lib/shared/dates";

/** A save function as the pages pass it down (the server action saveScenarioRevision). */
export type SaveFn = (input: { scenarioId: string; baseRevisionId: string; note: string; body: unknown }) => Promise<SaveResult>;

/** The newer revision a save ran into (SaveResult's conflict). */
export type ConflictingRevision = NonNullable<Extract<SaveResult, { ok: false }>["conflict"]>["current"];

export function SaveConflict({ current, mine, children }: { current: ConflictingRevision; mine: unknown; children: ReactNode }) {
  return (
    <div className="mt-3 rounded border border-verdict-warn/40 bg-verdict-warn/5" data-testid="save-conflict">
      <p className="px-4 py-2 text-sm">
        <span className="font-semibold text-verdict-warn">Conflict:</span> revision {current.number} by {current.author} (
        {formatDateTime(current.createdAt)}) was saved after the one you started from. Differences from it to yours:
      </p>
      <div className="max-h-64 overflow-auto">
        <DiffTable rows={diffBodies(current.body, mine)} beforeLabel={`Revision ${current.number}`} afterLabel="Yours" />
      </div>
      <div className="flex flex-wrap gap-2 p-3">{children}</div>
    </div>
  );
}
