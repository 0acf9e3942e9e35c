import { requirePageUser } from "@/lib/auth/current";
import { libraryFacets, libraryFiltersSchema, listEntries } from "@/lib/db/library";
import { getTeamTolerances } from "@/lib/library/tolerances";
import { LibraryFilters, type FilterValues } from "@/components/library/LibraryFilters";
import { LibraryTable } from "@/components/library/LibraryTable";
import { TolerancesForm } from "@/components/library/TolerancesForm";
import { setTolerancesAction } from "../actions";
import { IslandMark } from "@/components/shell/IslandMark";

export const dynamic = "force-dynamic";
export const metadata = { title: "Library" };

export default async function LibraryPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const user = await requirePageUser("viewer");
  const raw = await searchParams;
  const values: FilterValues = {};
  for (const k of ["q", "template", "status", "loadType", "passElement", "currentMin", "currentMax"] as const) {
    const v = raw[k];
    if (typeof v === "string" && v.trim() !== "") values[k] = v;
  }
  const parsed = libraryFiltersSchema.safeParse(values);
  const [entries, facets, tolerances] = await Promise.all([
    parsed.success ? listEntries(user, parsed.data) : Promise.resolve([]),
    libraryFacets(user.teamId),
    getTeamTolerances(user.teamId),
  ]);
  return (
    <main className="mx-auto max-w-screen-xl px-6 py-8 space-y-4">
      <IslandMark />
      <div>
        <h1 className="text-2xl font-semibold">Library</h1>
        <p className="text-sm text-ink-muted">The designs {user.teamName} built and measured: validated entries are trusted starting points.</p>
      </div>
      <LibraryFilters values={values} facets={facets} />
      {!parsed.success && (
        <p role="alert" className="text-sm text-verdict-fail">
          {parsed.error.issues.map((i) => `${i.path.join(".")}: ${i.message}`).join("; ")}
        </p>
      )}
      <LibraryTable entries={entries} />
      {user.role === "lead" && (
        <section className="rounded border border-hairline bg-white p-4">
          <h2 className="mb-2 font-semibold">Tolerances of the bench comparison</h2>
          <TolerancesForm action={setTolerancesAction} tolerances={tolerances} />
        </section>
      )}
    </main>
  );
}
