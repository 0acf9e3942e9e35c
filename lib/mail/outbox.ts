import "server-only";
import { db } from "@/lib/db/knex";
import { mailSettings } from "./transport";

/**
 * The development outbox shows what the local SMTP fake received. On only while mail goes to a loopback host
 * (the fake), and never when QUELL_DEV_OUTBOX=0; a real relay turns it off.
 */
export function devOutboxEnabled(): boolean {
  if (process.env.QUELL_DEV_OUTBOX === "0") return false;
  const host = mailSettings().host;
  return host === "127.0.0.1" || host === "localhost" || host === "::1";
}

export interface OutboxMessage {
  id: string;
  to: string;
  subject: string;
  text: string;
  receivedAt: string;
}

/** Messages sent to the team's members or to addresses the team invited, newest first. */
export async function teamOutbox(teamId: string, limit = 50): Promise<OutboxMessage[]> {
  const members = db()("memberships as m").join("users as u", "u.id", "m.user_id").where("m.team_id", teamId).select(db().raw("lower(u.email)"));
  const invited = db()("invitations").where({ team_id: teamId }).select(db().raw("lower(email)"));
  const rows = await db()("dev_mailbox")
    .where((q) => q.whereRaw("lower(to_address) in (?)", [members]).orWhereRaw("lower(to_address) in (?)", [invited]))
    .orderBy("id", "desc")
    .limit(limit);
  return rows.map((r) => ({ id: String(r.id), to: r.to_address, subject: r.subject, text: r.text_body, receivedAt: new Date(r.received_at).toISOString() }));
}
