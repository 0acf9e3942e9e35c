import "server-only";
import type { Knex } from "knex";
import { db } from "./knex";

export interface AuditEntry {
  teamId: string | null;
  actorId: string | null;
  action: string;
  subjectType: string;
  subjectId?: string | null;
  detail?: Record<string, unknown>;
}

/** Records an important action; pass the transaction so the entry commits (or not) with the change. */
export async function audit(e: AuditEntry, trx: Knex | Knex.Transaction = db()): Promise<void> {
  await trx("audit_log").insert({
    team_id: e.teamId,
    actor_id: e.actorId,
    action: e.action,
    subject_type: e.subjectType,
    subject_id: e.subjectId ?? null,
    detail: JSON.stringify(e.detail ?? {}),
  });
}

export interface AuditRow {
  id: string;
  action: string;
  subjectType: string;
  subjectId: string | null;
  actorName: string | null;
  detail: Record<string, unknown>;
  createdAt: string;
}

/** The team's most recent audit entries, newest first. */
export async function listAudit(teamId: string, limit = 50): Promise<AuditRow[]> {
  const rows = await db()("audit_log as a")
    .leftJoin("users as u", "u.id", "a.actor_id")
    .where("a.team_id", teamId)
    .orderBy("a.id", "desc")
    .limit(limit)
    .select("a.id", "a.action", "a.subject_type", "a.subject_id", "a.detail", "a.created_at", "u.name as actor_name");
  return rows.map((r) => ({
    id: String(r.id),
    action: r.action,
    subjectType: r.subject_type,
    subjectId: r.subject_id,
    actorName: r.actor_name,
    detail: r.detail,
    createdAt: new Date(r.created_at).toISOString(),
  }));
}
