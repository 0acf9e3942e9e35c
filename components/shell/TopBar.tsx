import Link from "next/link";
import { currentUser } from "@/lib/auth/current";
import { teamsOfUser } from "@/lib/db/users";
import { UserMenu } from "@/components/account/UserMenu";
import { signOutAction, signOutEverywhereAction, switchTeamAction } from "@/app/(account)/actions";

async function signedIn() {
  try {
    const user = await currentUser();
    return user ? { user, teams: await teamsOfUser(user.id) } : null;
  } catch {
    return null; // the database is down: the page (and its health badge) still renders
  }
}

/** The quiet bar above every page: the product name, the main places, and who is signed in. */
export async function TopBar() {
  const me = await signedIn();
  return (
    <header className="no-print border-b border-hairline bg-white">
      <nav className="mx-auto flex h-12 max-w-screen-2xl items-center gap-6 px-4 text-sm" aria-label="Main">
        <Link href="/" className="flex items-center gap-2 font-semibold tracking-tight text-ink">
          <svg aria-hidden viewBox="0 0 32 32" className="h-6 w-6">
            <rect width="32" height="32" rx="6" fill="#0F766E" />
            <path d="M6 20 h5 l3 -9 l4 14 l3 -5 h5" fill="none" stroke="#F7F5F0" strokeWidth="2.4" strokeLinecap="round" strokeLinejoin="round" />
          </svg>
          Quell
        </Link>
        <Link href="/scenarios" className="text-ink-muted hover:text-ink">Scenarios</Link>
        {me && <Link href="/library" className="text-ink-muted hover:text-ink">Library</Link>}
        {me && <Link href="/team" className="text-ink-muted hover:text-ink">Team</Link>}
        {me ? (
          <UserMenu
            name={me.user.name}
            role={me.user.role}
            teamId={me.user.teamId}
            teams={me.teams}
            switchTeam={switchTeamAction}
            signOut={signOutAction}
            signOutEverywhere={signOutEverywhereAction}
          />
        ) : (
          <Link href="/sign-in" className="ml-auto rounded border border-hairline px-2 py-1 text-ink hover:border-signal">Sign in</Link>
        )}
      </nav>
    </header>
  );
}
