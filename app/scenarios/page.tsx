import Link from "next/link";
import { db } from "@/lib/db/knex";

export const dynamic = "force-dynamic";
export const metadata = { title: "Scenarios" };

export default async function ScenariosPage() {
  const rows = await db()("scenarios as s")
    .join("teams as t", "t.id", "s.team_id")
    .whereNull("s.deleted_at")
    .select("s.id", "s.title", "s.template", "t.name as team")
    .orderBy("s.title");
  return (
    <main className="mx-auto max-w-4xl px-6 py-10">
      <h1 className="text-2xl font-semibold">Scenarios</h1>
      <ul className="mt-6 divide-y divide-hairline rounded border border-hairline bg-white">
        {rows.map((r) => (
          <li key={r.id} className="flex items-center justify-between px-4 py-3">
            <Link href={`/scenarios/${r.id}`} className="font-medium text-signal hover:underline">{r.title}</Link>
            <span className="text-sm text-ink-muted">{r.team}</span>
          </li>
        ))}
      </ul>
    </main>
  );
}
