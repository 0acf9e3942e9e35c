import "server-only";
import { db } from "./knex";
import { hashToken } from "@/lib/shared/tokens";

/** One message the local SMTP fake received (table dev_mailbox); lib/mail/outbox.ts says when the outbox is on. */
export interface OutboxMessage {
  id: string;
  to: string;
  subject: string;
  text: string;
  receivedAt: string;
}

const RESET_LINK = /\/reset-password\?token=/;
const INVITATION_LINK = /\/invitations\/([A-Za-z0-9_-]{10,200})/g;
const LIBRARY_LINK = /\/library\/([0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12})/gi;

/**
 * Messages for the team's lead to read, newest first: mail to the team's members and invitees, minus what belongs
 * to someone else. An address may be in several teams (or be invited by anyone), so going by address alone showed
 * a lead other teams' invitation links (usable to join them) and members' password-reset links (usable to take the
 * account). So: a reset mail only to its own addressee (`viewerEmail`); an invitation mail only when its link is one
 * of this team's invitations; a library notice only when its entry is this team's.
 */
export async function teamOutbox(teamId: string, limit = 50, viewerEmail?: string): Promise<OutboxMessage[]> {
  const members = db()("memberships as m").join("users as u", "u.id", "m.user_id").where("m.team_id", teamId).select(db().raw("lower(u.email)"));
  const invited = db()("invitations").where({ team_id: teamId }).select(db().raw("lower(email)"));
  const rows = await db()("dev_mailbox")
    .where((q) => q.whereRaw("lower(to_address) in (?)", [members]).orWhereRaw("lower(to_address) in (?)", [invited]))
    .orderBy("id", "desc")
    .limit(Math.min(limit * 4, 1000));
  const links = rows.map((r) => {
    const text = `${r.text_body ?? ""}\n${r.html_body ?? ""}`;
    return {
      reset: RESET_LINK.test(text),
      invitations: [...new Set([...text.matchAll(INVITATION_LINK)].map((m) => hashToken(m[1]!)))],
      entries: [...new Set([...text.matchAll(LIBRARY_LINK)].map((m) => m[1]!.toLowerCase()))],
    };
  });
  const allInvitations = [...new Set(links.flatMap((l) => l.invitations))];
  const allEntries = [...new Set(links.flatMap((l) => l.entries))];
  const ownInvitations = new Set<string>(
    allInvitations.length ? (await db()("invitations").where({ team_id: teamId }).whereIn("token_hash", allInvitations).pluck("token_hash")) : [],
  );
  const ownEntries = new Set<string>(
    allEntries.length ? (await db()("library_entries").where({ team_id: teamId }).whereIn("id", allEntries).pluck("id")) : [],
  );
  const me = viewerEmail?.trim().toLowerCase();
  const visible = rows.filter((r, i) => {
    const l = links[i]!;
    if (l.reset && (!me || String(r.to_address).trim().toLowerCase() !== me)) return false;
    if (l.invitations.some((h) => !ownInvitations.has(h))) return false;
    if (l.entries.some((id) => !ownEntries.has(id))) return false;
    return true;
  });
  return visible.slice(0, limit).map((r) => ({ id: String(r.id), to: r.to_address, subject: r.subject, text: r.text_body, receivedAt: new Date(r.received_at).toISOString() }));
}
