import { AccountCard, ForgotPasswordForm } from "@/components/account/AccountForms";
import { forgotPasswordAction } from "../actions";

import { redirect } from "next/navigation";
import { currentUser } from "@/lib/auth/current";

export const dynamic = "force-dynamic";
export const metadata = { title: "Reset your password" };

export default async function ForgotPasswordPage() {
  if (await currentUser().catch(() => null)) redirect("/scenarios");
  return (
    <AccountCard title="Reset your password">
      <p className="mb-4 text-sm text-ink-muted">We e-mail you a link that works once, for one hour.</p>
      <ForgotPasswordForm action={forgotPasswordAction} />
    </AccountCard>
  );
}
