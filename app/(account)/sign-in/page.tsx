import { AccountCard, SignInForm } from "@/components/account/AccountForms";
import { signInAction } from "../actions";

export const dynamic = "force-dynamic";
export const metadata = { title: "Sign in" };

export default async function SignInPage({ searchParams }: { searchParams: Promise<{ next?: string }> }) {
  const { next } = await searchParams;
  return (
    <AccountCard title="Sign in">
      <SignInForm action={signInAction} next={typeof next === "string" ? next : undefined} />
    </AccountCard>
  );
}
