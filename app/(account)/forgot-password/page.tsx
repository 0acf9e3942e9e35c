import { AccountCard, ForgotPasswordForm } from "@/components/account/AccountForms";
import { forgotPasswordAction } from "../actions";

export const dynamic = "force-dynamic";
export const metadata = { title: "Reset your password" };

export default function ForgotPasswordPage() {
  return (
    <AccountCard title="Reset your password">
      <p className="mb-4 text-sm text-ink-muted">We e-mail you a link that works once, for one hour.</p>
      <ForgotPasswordForm action={forgotPasswordAction} />
    </AccountCard>
  );
}
