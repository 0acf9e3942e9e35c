import "server-only";
import { cookies, headers } from "next/headers";
import { getIronSession, type IronSession } from "iron-session";
import { sessionOptions, type SessionData } from "./session-config";

export type { SessionData } from "./session-config";

/** The sealed-cookie session of this request (pages, layouts, server actions). */
export async function getSession(): Promise<IronSession<SessionData>> {
  const h = await headers();
  const opts = sessionOptions({ proto: h.get("x-forwarded-proto"), host: h.get("host") });
  return getIronSession<SessionData>(await cookies(), opts);
}

/** Starts a session for a user in a team (after sign-in, sign-up or accepting an invitation). */
export async function setSession(data: Required<SessionData>): Promise<void> {
  const s = await getSession();
  s.userId = data.userId;
  s.teamId = data.teamId;
  s.sv = data.sv;
  await s.save();
}

export async function destroySession(): Promise<void> {
  const s = await getSession();
  s.destroy();
}
