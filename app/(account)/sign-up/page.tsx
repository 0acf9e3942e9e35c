import { AccountCard, SignUpForm } from "@/components/account/AccountForms";
import { signUpAction } from "../actions";

export const dynamic = "force-dynamic";
export const metadata = { title: "Start a team" };

export default function SignUpPage() {
  return (
    <AccountCard title="Start a team">
      <SignUpForm action={signUpAction} />
    </AccountCard>
  );
}
