import { AccountCard } from "@/components/account/AccountForms";
import { signOutAction } from "../actions";

export const metadata = { title: "Sign out" };

export default function SignOutPage() {
  return (
    <AccountCard title="Sign out">
      <form action={signOutAction}>
        <button type="submit" className="rounded bg-signal px-4 py-2 text-sm font-medium text-white hover:bg-signal-dark">
          Sign out
        </button>
      </form>
    </AccountCard>
  );
}
