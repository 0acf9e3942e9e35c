import { NewScenario } from "@/components/workbench/NewScenario";
import { requirePageUser, roleAtLeast } from "@/lib/auth/current";

export const metadata = { title: "New scenario" };

export const dynamic = "force-dynamic";

export default async function NewScenarioPage() {
  const user = await requirePageUser("viewer"); // signed-in members only; the API refuses viewers when saving
  return <NewScenario canCreate={roleAtLeast(user.role, "designer")} />;
}
