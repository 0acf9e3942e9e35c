import "server-only";
import { redirect, forbidden } from "next/navigation";
import { headers } from "next/headers";
import { getSession } from "./session";
import { roleAtLeast, type CurrentUser, type Role } from "@/lib/shared/roles";
import type { UserRow } from "@/lib/db/users";
import { accountFromSession, userFromSession } from "@/lib/db/sessions";

export { roleAtLeast };
export type { CurrentUser, Role };

/** The signed-in user in their current team, or null (anonymous, stale session, or no team left). */
export async function currentUser(): Promise<CurrentUser | null> {
  return userFromSession(await getSession());
}

/**
 * The account behind a valid session, whether or not it still belongs to a team (for creating a team or accepting
 * an invitation). Null when anonymous, signed out, or when the session predates a password reset.
 */
export async function sessionAccount(): Promise<UserRow | null> {
  return accountFromSession(await getSession());
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
    if (await sessionAccount()) redirect("/team/new"); // signed in, but in no team any more
    redirect(`/sign-in?next=${encodeURIComponent(await currentPath())}`);
  }
  if (!roleAtLeast(user.role, min)) forbidden();
  return user;
}
