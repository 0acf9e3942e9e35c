import { AccountCard, SignInForm } from "@/components/account/AccountForms";
import { signInAction } from "../actions";

import { redirect } from "next/navigation";
import { currentUser } from "@/lib/auth/current";

export const dynamic = "force-dynamic";
export const metadata = { title: "Sign in" };

export default async function SignInPage({ searchParams }: { searchParams: Promise<{ next?: string }> }) {
  // Someone already signed in has nothing to do here: their scenarios.
  if (await currentUser().catch(() => null)) redirect("/scenarios");
  const { next } = await searchParams;
  return (
    <AccountCard title="Sign in">
      <SignInForm action={signInAction} next={typeof next === "string" ? next : undefined} />
    </AccountCard>
  );
}
