"use client";
import Link from "next/link";
import { useState } from "react";
import useSWR from "swr";
import { ago, fetcher, type FetchError } from "./fetcher";
import { diffBodies } from "@/lib/design/diff";
import { DiffTable } from "./DiffTable";
import { Loading, LoadError } from "./Status";
import { formatDateTime } from "@/lib/shared/dates";

interface Rev {
  id: string;
  number: number;
  authorName: string;
  note: string;
  createdAt: string;
}

/** The revision list, newest first; pick two to see how their values differ (part values first). */
export function RevisionHistory({ scenarioId }: { scenarioId: string }) {
  const base = `/api/scenarios/${scenarioId}/revisions`;
  const { data, error, isLoading, mutate } = useSWR<{ revisions: Rev[] }, FetchError>(base, fetcher);
  const revs = data?.revisions ?? [];
  const [older, setOlder] = useState<string | null>(null);
  const [newer, setNewer] = useState<string | null>(null);
  const a = older ?? revs[1]?.id ?? null;
  const b = newer ?? revs[0]?.id ?? null;
  const ra = useSWR<{ body: unknown; number: number }, FetchError>(a ? `${base}?revision=${a}` : null, fetcher);
  const rb = useSWR<{ body: unknown; number: number }, FetchError>(b ? `${base}?revision=${b}` : null, fetcher);

  if (error) return <LoadError error={error} retry={() => mutate()} />;
  if (isLoading) return <Loading what="revisions" />;
  return (
    <div className="space-y-6">
      <section aria-labelledby="revs-title" className="overflow-x-auto rounded border border-hairline bg-white">
        <h2 id="revs-title" className="border-b border-hairline px-4 py-2 text-sm font-semibold">Revisions</h2>
        <table className="w-full text-sm">
          <thead className="text-xs uppercase tracking-wide text-ink-muted">
            <tr>
              <th scope="col" className="px-4 py-2 text-left font-medium">Rev.</th>
              <th scope="col" className="px-4 py-2 text-left font-medium">Note</th>
              <th scope="col" className="px-4 py-2 text-left font-medium">Author</th>
              <th scope="col" className="px-4 py-2 text-left font-medium">Saved</th>
              <th scope="col" className="px-4 py-2 text-left font-medium">Compare from</th>
              <th scope="col" className="px-4 py-2 text-left font-medium">to</th>
            </tr>
          </thead>
          <tbody className="divide-y divide-hairline">
            {revs.map((r) => (
              <tr key={r.id}>
                <td className="num px-4 py-1.5">
                  <Link href={`/share/r/${r.id}`} className="text-signal hover:underline">r{r.number}</Link>
                </td>
                <td className="px-4 py-1.5">{r.note || <span className="text-ink-muted">—</span>}</td>
                <td className="px-4 py-1.5">{r.authorName}</td>
                <td className="px-4 py-1.5 text-ink-muted" title={formatDateTime(r.createdAt)}>{ago(r.createdAt)}</td>
                <td className="px-4 py-1.5">
                  <input type="radio" name="older" aria-label={`Compare from revision ${r.number}`} checked={a === r.id} onChange={() => setOlder(r.id)} />
                </td>
                <td className="px-4 py-1.5">
                  <input type="radio" name="newer" aria-label={`Compare to revision ${r.number}`} checked={b === r.id} onChange={() => setNewer(r.id)} />
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </section>
      {a && b && (
        <section aria-labelledby="diff-title" className="overflow-x-auto rounded border border-hairline bg-white">
          <h2 id="diff-title" className="border-b border-hairline px-4 py-2 text-sm font-semibold">
            Differences{ra.data && rb.data ? `: revision ${ra.data.number} → ${rb.data.number}` : ""}
          </h2>
          {ra.error || rb.error ? (
            <LoadError error={(ra.error ?? rb.error)!} />
          ) : !ra.data || !rb.data ? (
            <Loading what="the two revisions" />
          ) : (
            <DiffTable rows={diffBodies(ra.data.body, rb.data.body)} beforeLabel={`Revision ${ra.data.number}`} afterLabel={`Revision ${rb.data.number}`} />
          )}
        </section>
      )}
    </div>
  );
}
