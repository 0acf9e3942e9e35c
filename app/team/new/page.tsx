import { redirect } from "next/navigation";
import { AccountCard, CreateTeamForm } from "@/components/account/AccountForms";
import { sessionAccount } from "@/lib/auth/current";
import { createTeamAction } from "@/app/(account)/actions";

export const dynamic = "force-dynamic";
export const metadata = { title: "New team" };

export default async function NewTeamPage() {
  if (!(await sessionAccount())) redirect("/sign-in?next=/team/new");
  return (
    <AccountCard title="Start a new team">
      <p className="mb-4 text-sm text-ink-muted">You will lead it; invite the others from the team page.</p>
      <CreateTeamForm action={createTeamAction} />
    </AccountCard>
  );
}
