import "server-only";
import { cookies, headers } from "next/headers";
import { getIronSession, type IronSession } from "iron-session";
import { sessionOptions, SESSION_TTL_S, type SessionData } from "./session-config";
import { createSessionRow, endAllSessionRows, endSessionRow } from "@/lib/db/sessions";

export type { SessionData } from "./session-config";

/** The sealed-cookie session of this request (pages, layouts, server actions). */
export async function getSession(): Promise<IronSession<SessionData>> {
  const h = await headers();
  const opts = sessionOptions({ proto: h.get("x-forwarded-proto"), host: h.get("host") });
  return getIronSession<SessionData>(await cookies(), opts);
}

/**
 * Starts a session for a user in a team (after sign-in, sign-up or accepting an invitation): a new server-side
 * session row, named in the sealed cookie. A session this browser held before is ended.
 */
export async function setSession(data: { userId: string; teamId: string; sv: number }): Promise<void> {
  const s = await getSession();
  if (s.sid) await endSessionRow(s.sid);
  s.userId = data.userId;
  s.teamId = data.teamId;
  s.sv = data.sv;
  s.sid = await createSessionRow(data.userId, SESSION_TTL_S);
  await s.save();
}

/** Signs this browser out: the session row is deleted (every copy of the cookie stops working), then the cookie. */
export async function destroySession(): Promise<void> {
  const s = await getSession();
  if (s.sid) await endSessionRow(s.sid);
  s.destroy();
}

/** Signs the user out on every browser: every session row of theirs is deleted, then this browser's cookie. */
export async function destroyAllSessions(): Promise<void> {
  const s = await getSession();
  if (s.userId) await endAllSessionRows(s.userId);
  s.destroy();
}
