import { requirePageUser } from "@/lib/auth/current";
import { roleAtLeast } from "@/lib/shared/roles";
import { TEMPLATE_CHOICES } from "@/lib/design/scenarioBody";
import { ScenarioTable } from "@/components/scenarios/ScenarioTable";

export const dynamic = "force-dynamic";
export const metadata = { title: "Scenarios" };

export default async function ScenariosPage() {
  const user = await requirePageUser("viewer");
  return (
    <main className="mx-auto max-w-6xl px-6 py-10">
      <h1 className="text-2xl font-semibold">Scenarios</h1>
      <p className="mt-1 text-sm text-ink-muted">{user.teamName}</p>
      <ScenarioTable me={{ id: user.id, role: user.role }} canCreate={roleAtLeast(user.role, "designer")} templates={[...TEMPLATE_CHOICES]} />
    </main>
  );
}
