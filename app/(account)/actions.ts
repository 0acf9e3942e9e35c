"use server";
import { z } from "zod";
import { headers } from "next/headers";
import { redirect } from "next/navigation";
import { validatedAction, validatedPublicAction, type ActionState } from "@/lib/auth/action";
import { clientAddressFrom } from "@/lib/auth/client-address";
import { safeNext } from "@/lib/auth/safe-next";
import { setSession, destroySession, destroyAllSessions, getSession } from "@/lib/auth/session";
import { sessionAccount } from "@/lib/auth/current";
import { signInWithPassword, signUp, requestPasswordReset, resetPassword, createAccountFromInvitation } from "@/lib/auth/accounts";
import { resolveCurrentUser, findUserById, teamsOfUser, setCurrentTeam } from "@/lib/db/users";
import { acceptInvitation, createTeam, findInvitationByToken } from "@/lib/db/teams";
import { DomainError } from "@/lib/errors";
import { db } from "@/lib/db/knex";
import { storedText } from "@/lib/shared/text";

const email = z.string().trim().min(1, "Enter your e-mail address.").max(254).email("Enter an e-mail address such as name@example.com.");
const newPassword = z.string().min(10, "Use at least 10 characters.").max(200, "Use at most 200 characters.");


async function clientAddress(): Promise<string> {
  return clientAddressFrom(await headers());
}

async function startSession(userId: string, preferredTeam?: string | null) {
  const user = await findUserById(userId);
  if (!user) throw new DomainError(404, "This account no longer exists.");
  const cu = await resolveCurrentUser(userId, preferredTeam ?? user.currentTeamId ?? undefined);
  await setSession({ userId, teamId: cu?.teamId ?? "", sv: user.sessionVersion });
}

export const signInAction = validatedPublicAction(
  z.object({ email, password: z.string().min(1, "Enter your password.").max(200), next: z.string().optional() }),
  async (data): Promise<ActionState> => {
    const r = await signInWithPassword(data.email, data.password, await clientAddress());
    if (!r.ok) return { message: r.message, values: { email: data.email } };
    await startSession(r.user.id);
    redirect(safeNext(data.next));
  },
);

export const signUpAction = validatedPublicAction(
  z.object({
    name: storedText("name").trim().min(1, "Enter your name.").max(100),
    email,
    password: newPassword,
    teamName: storedText("teamName").trim().min(2, "Name your team (at least 2 characters).").max(100),
  }),
  async (data) => {
    const { user, teamId } = await signUp(data);
    await setSession({ userId: user.id, teamId, sv: user.sessionVersion });
    redirect("/scenarios");
  },
);

/** Ends this browser's session on the server (a copied cookie stops working too). */
export async function signOutAction(): Promise<void> {
  await destroySession();
  redirect("/sign-in");
}

/** Ends every session of the signed-in user, on every browser. */
export async function signOutEverywhereAction(): Promise<void> {
  await destroyAllSessions();
  redirect("/sign-in");
}

/** Same confirmation whether or not the address has an account. */
export const forgotPasswordAction = validatedPublicAction(z.object({ email }), async (data) => {
  try {
    await requestPasswordReset(data.email);
  } catch (e) {
    console.error("[mail] password reset could not be sent:", e instanceof Error ? e.message : e);
  }
  return { ok: true, message: "If that address has an account, a reset link is on its way. It works once, for one hour." };
});

export const resetPasswordAction = validatedPublicAction(
  z
    .object({ token: z.string().min(10).max(200), password: newPassword, confirm: z.string() })
    .refine((d) => d.password === d.confirm, { path: ["confirm"], message: "The two passwords differ." }),
  async (data) => {
    const { user, sessionVersion } = await resetPassword(data.token, data.password);
    if (user.sessionVersion !== sessionVersion) throw new DomainError(409, "Try again.");
    await startSession(user.id);
    redirect("/scenarios");
  },
);

/** Accept an invitation as the signed-in user (whose address must match it). */
export const acceptInvitationAction = validatedPublicAction(z.object({ token: z.string().min(10).max(200) }), async (data) => {
  const account = await sessionAccount();
  if (!account) return { message: "Sign in first." };
  const { teamId } = await acceptInvitation(data.token, account.id);
  await startSession(account.id, teamId);
  redirect("/scenarios");
});

/** Create an account from an invitation link, then accept it; both in one go. */
export const acceptWithNewAccountAction = validatedPublicAction(
  z.object({ token: z.string().min(10).max(200), name: storedText("name").trim().min(1, "Enter your name.").max(100), password: newPassword }),
  async (data) => {
    const inv = await findInvitationByToken(data.token);
    if (!inv || inv.status !== "pending") return { message: "This invitation is no longer valid." };
    const { user, teamId } = await createAccountFromInvitation(data.token, { name: data.name, password: data.password });
    await setSession({ userId: user.id, teamId, sv: user.sessionVersion });
    redirect("/scenarios");
  },
);

/** Switch the team the user works in (they must belong to it). */
export const switchTeamAction = validatedAction(z.object({ teamId: z.string().uuid("Pick a team.") }), async (data, user) => {
  const teams = await teamsOfUser(user.id);
  if (!teams.some((t) => t.teamId === data.teamId)) return { message: "You are not a member of that team." };
  await setCurrentTeam(user.id, data.teamId);
  const s = await getSession();
  s.teamId = data.teamId;
  await s.save();
  redirect("/scenarios");
});

/** A signed-in user creates another team (and leads it). Works for users who belong to no team any more. */
export const createTeamAction = validatedPublicAction(z.object({ teamName: storedText("teamName").trim().min(2, "Name your team (at least 2 characters).").max(100) }), async (data) => {
  const account = await sessionAccount();
  if (!account) return { message: "Sign in first." };
  const team = await db().transaction((trx) => createTeam(data.teamName, account.id, trx));
  await setSession({ userId: account.id, teamId: team.id, sv: account.sessionVersion });
  redirect("/scenarios");
});
