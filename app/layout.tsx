import type { Metadata, Viewport } from "next";
import type { ReactNode } from "react";
import "./globals.css";
import { TopBar, type TopBarAccount } from "@/components/shell/TopBar";
import { HydrationMark } from "@/components/shell/HydrationMark";
import { currentUser } from "@/lib/auth/current";
import { teamsOfUser } from "@/lib/db/users";
import { signOutAction, signOutEverywhereAction, switchTeamAction } from "./(account)/actions";

export const metadata: Metadata = {
  title: { default: "Quell", template: "%s · Quell" },
  description: "Design, check and share op-amp-driven linear current sources and sinks.",
};

export const viewport: Viewport = { width: "device-width", initialScale: 1 };

/** Who is signed in, for the top bar; null when nobody is, or when the database is down (the page still renders). */
async function signedIn(): Promise<TopBarAccount | null> {
  try {
    const user = await currentUser();
    return user ? { user, teams: await teamsOfUser(user.id), switchTeam: switchTeamAction, signOut: signOutAction, signOutEverywhere: signOutEverywhereAction } : null;
  } catch {
    return null; // the database is down: the page (and its health badge) still renders
  }
}

export default async function RootLayout({ children }: { children: ReactNode }) {
  const me = await signedIn();
  return (
    <html lang="en">
      <body className="min-h-screen font-sans antialiased">
        <HydrationMark />
        <TopBar me={me} />
        {children}
      </body>
    </html>
  );
}
