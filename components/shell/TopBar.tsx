import Link from "next/link";
import type { ComponentProps } from "react";
import { UserMenu } from "@/components/account/UserMenu";
import { MainMenu } from "./MainMenu";

type Action = ComponentProps<typeof UserMenu>["switchTeam"];

/** Who is signed in, their teams, and the actions of the user menu (the root layout reads them on the server). */
export interface TopBarAccount {
  user: { name: string; role: string; teamId: string };
  teams: { teamId: string; teamName: string; role: string }[];
  switchTeam: Action;
  signOut: () => Promise<void>;
  signOutEverywhere: () => Promise<void>;
}

/** The quiet bar above every page: the product name, the main places, and who is signed in (`me`, null when nobody is). */
export function TopBar({ me }: { me: TopBarAccount | null }) {
  return (
    <header className="no-print border-b border-hairline bg-white">
      <nav className="relative mx-auto flex h-12 max-w-screen-2xl items-center gap-6 px-4 text-sm" aria-label="Main">
        <Link href="/" className="flex items-center gap-2 font-semibold tracking-tight text-ink">
          <svg aria-hidden viewBox="0 0 32 32" className="h-6 w-6">
            <rect width="32" height="32" rx="6" fill="#0F766E" />
            <path d="M6 20 h5 l3 -9 l4 14 l3 -5 h5" fill="none" stroke="#F7F5F0" strokeWidth="2.4" strokeLinecap="round" strokeLinejoin="round" />
          </svg>
          Quell
        </Link>
        <MainMenu>
        <Link href="/scenarios" className="text-ink-muted hover:text-ink">Scenarios</Link>
        {me && <Link href="/library" className="text-ink-muted hover:text-ink">Library</Link>}
        {me && <Link href="/team" className="text-ink-muted hover:text-ink">Team</Link>}
        {me ? (
          <UserMenu
            name={me.user.name}
            role={me.user.role}
            teamId={me.user.teamId}
            teams={me.teams}
            switchTeam={me.switchTeam}
            signOut={me.signOut}
            signOutEverywhere={me.signOutEverywhere}
          />
        ) : (
          <span className="flex flex-wrap items-center gap-3 md:ml-auto">
            <Link href="/sign-up" className="text-ink-muted hover:text-ink">Create a team</Link>
            <Link href="/sign-in" className="rounded border border-hairline px-2 py-1 text-ink hover:border-signal">Sign in</Link>
          </span>
        )}
        </MainMenu>
      </nav>
    </header>
  );
}
