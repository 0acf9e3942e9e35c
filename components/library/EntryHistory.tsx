/** The entry's history: every submission, decision and comment, oldest first. */
import type { LibraryEvent } from "@/lib/db/library";
import { formatDateTime } from "@/lib/shared/dates";

const VERB: Record<string, string> = {
  created: "created the entry", submitted: "submitted it for validation", returned: "returned it with comments",
  validated: "validated it", validated_with_override: "validated it with an override", retired: "retired it", withdrawn: "withdrew it", commented: "commented",
};

export function EntryHistory({ events }: { events: LibraryEvent[] }) {
  return (
    <ol className="space-y-2 text-sm" data-testid="entry-history">
      {events.map((e) => (
        <li key={e.id} className="border-l-2 border-hairline pl-3">
          <span className="font-medium">{e.actorName ?? "someone"}</span> {VERB[e.action] ?? e.action}
          {e.fromStatus && e.toStatus && e.fromStatus !== e.toStatus && <span className="text-xs text-ink-muted"> ({e.fromStatus} → {e.toStatus})</span>}
          <span className="block text-xs text-ink-muted num">{formatDateTime(e.createdAt)}</span>
          {e.comment && <p className="mt-1 whitespace-pre-wrap rounded bg-paper px-2 py-1">{e.comment}</p>}
        </li>
      ))}
    </ol>
  );
}
