import Link from "next/link";
import { AccountCard, ResetPasswordForm } from "@/components/account/AccountForms";
import { resetTokenState } from "@/lib/db/passwordResets";
import { resetPasswordAction } from "../actions";

export const dynamic = "force-dynamic";
export const metadata = { title: "Choose a new password" };

const why = { used: "This reset link has been used already.", expired: "This reset link has expired.", unknown: "This reset link is not valid." };

export default async function ResetPasswordPage({ searchParams }: { searchParams: Promise<{ token?: string }> }) {
  const { token } = await searchParams;
  const state = typeof token === "string" ? await resetTokenState(token) : "unknown";
  return (
    <AccountCard title="Choose a new password">
      {state === "valid" && token ? (
        <ResetPasswordForm action={resetPasswordAction} token={token} />
      ) : (
        <p role="alert" className="text-sm">
          {why[state === "valid" ? "unknown" : state]} <Link href="/forgot-password" className="text-signal underline">Ask for a new one</Link>.
        </p>
      )}
    </AccountCard>
  );
}
