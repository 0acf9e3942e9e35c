import { requirePageUser, roleAtLeast } from "@/lib/auth/current";
import { getPart, listParts } from "@/lib/db/parts";
import { PartsManager } from "@/components/parts/PartsManager";

export const dynamic = "force-dynamic";
export const metadata = { title: "Parts" };

/** The team's own op-amps and pass devices: every member reads; designers and leads create, edit and retire. */
export default async function PartsPage() {
  const user = await requirePageUser("viewer");
  const summaries = await listParts(user, { retired: "include" });
  const parts = await Promise.all(summaries.map((p) => getPart(user, p.id)));
  return (
    <main className="mx-auto max-w-5xl px-6 py-10">
      <h1 className="text-2xl font-semibold">Parts of {user.teamName}</h1>
      <p className="mt-1 text-sm text-ink-muted">
        Op-amps and pass devices of your team. Every change is a new version; scenarios keep the version they were made with.
      </p>
      <PartsManager parts={parts} canEdit={roleAtLeast(user.role, "designer")} />
    </main>
  );
}
