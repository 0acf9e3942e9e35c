import "server-only";
import { redirect, forbidden } from "next/navigation";
import { headers } from "next/headers";
import { getSession } from "./session";
import { roleAtLeast, type CurrentUser, type Role } from "./roles";
import { resolveCurrentUser } from "@/lib/db/users";

export { roleAtLeast };
export type { CurrentUser, Role };

/** The signed-in user in their current team, or null (anonymous, stale session, or no team left). */
export async function currentUser(): Promise<CurrentUser | null> {
  const s = await getSession();
  if (!s.userId) return null;
  return resolveCurrentUser(s.userId, s.teamId, s.sv);
}

/** Whether a session exists at all (signed in but possibly in no team). */
export async function sessionUserId(): Promise<string | null> {
  const s = await getSession();
  return s.userId ?? null;
}

/** Where the current page is, for the `next` parameter of the sign-in redirect (set by proxy.ts). */
async function currentPath(): Promise<string> {
  const h = await headers();
  const p = h.get("x-quell-path");
  return p && p.startsWith("/") && !p.startsWith("//") ? p : "/scenarios";
}

/**
 * For pages: the signed-in user with at least `min` role. Anonymous visitors go to /sign-in?next=…;
 * a signed-in user without the role gets the 403 page.
 */
export async function requirePageUser(min: Role = "viewer"): Promise<CurrentUser> {
  const user = await currentUser();
  if (!user) {
    const s = await getSession();
    if (s.userId) redirect("/team/new");
    redirect(`/sign-in?next=${encodeURIComponent(await currentPath())}`);
  }
  if (!roleAtLeast(user.role, min)) forbidden();
  return user;
}
