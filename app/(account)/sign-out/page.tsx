import { AccountCard } from "@/components/account/AccountForms";
import { signOutAction, signOutEverywhereAction } from "../actions";

export const metadata = { title: "Sign out" };

export default function SignOutPage() {
  return (
    <AccountCard title="Sign out">
      <form action={signOutAction}>
        <button type="submit" className="rounded bg-signal px-4 py-2 text-sm font-medium text-white hover:bg-signal-dark">
          Sign out
        </button>
      </form>
      <form action={signOutEverywhereAction} className="mt-4">
        <button type="submit" className="text-sm text-ink-muted underline hover:text-ink">
          Sign out everywhere
        </button>
      </form>
    </AccountCard>
  );
}
