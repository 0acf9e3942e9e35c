import "server-only";
/**
 * The team's own parts: rows, versions and their queries. Values are stored as given (lib/parts checks them against
 * the design layer's schemas first); every write is audited in the same transaction. Another team's part is "not
 * found" (404), never "forbidden", so its existence is not revealed.
 */
import type { Knex } from "knex";
import { z } from "zod";
import { db } from "./knex";
import { audit } from "./audit";
import { isUuid } from "./users";
import { DomainError } from "@/lib/errors";
import type { CurrentUser } from "@/lib/shared/roles";

export const PART_KIND_NAMES = ["opamp", "pass"] as const;

export interface PartSummary {
  id: string;
  kind: "opamp" | "pass";
  name: string;
  currentVersion: number;
  retired: boolean;
  updatedAt: string;
  createdAt: string;
}

export interface PartVersion {
  version: number;
  name: string;
  values: Record<string, unknown>;
  note: string;
  authorName: string | null;
  createdAt: string;
}

export interface PartDetail extends PartSummary {
  /** the current version's values */
  values: Record<string, unknown>;
  versions: PartVersion[];
}

/** List filters: kind, a name search, and whether retired parts are included. */
export const partFiltersSchema = z.object({
  kind: z.enum(PART_KIND_NAMES, { error: "kind must be opamp or pass" }).optional(),
  q: z.string().max(80, "q: at most 80 characters").optional(),
  retired: z.enum(["include", "exclude", "only"], { error: "retired must be include, exclude or only" }).optional(),
}).strict();
export type PartFilters = z.infer<typeof partFiltersSchema>;

function summaryFrom(r: Record<string, any>): PartSummary {
  return {
    id: r.id,
    kind: r.kind,
    name: r.name,
    currentVersion: r.current_version,
    retired: r.retired_at !== null,
    updatedAt: new Date(r.updated_at).toISOString(),
    createdAt: new Date(r.created_at).toISOString(),
  };
}

export async function listParts(actor: CurrentUser, filters: PartFilters = {}): Promise<PartSummary[]> {
  const q = db()("parts").where({ team_id: actor.teamId });
  if (filters.kind) q.andWhere({ kind: filters.kind });
  const retired = filters.retired ?? "exclude";
  if (retired === "exclude") q.whereNull("retired_at");
  if (retired === "only") q.whereNotNull("retired_at");
  if (filters.q) q.andWhereILike("name", `%${filters.q.replace(/[\\%_]/g, (m) => `\\${m}`)}%`);
  const rows = await q.orderBy([{ column: "kind" }, { column: "name" }]);
  return rows.map(summaryFrom);
}

async function partRow(actor: CurrentUser, id: string, trx: Knex | Knex.Transaction = db(), lock = false): Promise<Record<string, any>> {
  if (!isUuid(id)) throw new DomainError(404, "No such part.");
  const q = trx("parts").where({ id, team_id: actor.teamId }).first();
  const r = lock ? await q.forUpdate() : await q;
  if (!r) throw new DomainError(404, "No such part.");
  return r;
}

/** The part with every version, newest first. */
export async function getPart(actor: CurrentUser, id: string): Promise<PartDetail> {
  const r = await partRow(actor, id);
  const versions = await db()("part_versions as v")
    .leftJoin("users as u", "u.id", "v.author_id")
    .where("v.part_id", id)
    .orderBy("v.version", "desc")
    .select("v.*", "u.name as author_name");
  const list: PartVersion[] = versions.map((v) => ({
    version: v.version, name: v.name, values: v.values, note: v.note, authorName: v.author_name, createdAt: new Date(v.created_at).toISOString(),
  }));
  return { ...summaryFrom(r), values: list.find((v) => v.version === r.current_version)?.values ?? {}, versions: list };
}

/** One version of a part of the actor's team (what an old revision was made with). */
export async function getPartVersion(actor: CurrentUser, id: string, version: number): Promise<PartVersion & { id: string; kind: "opamp" | "pass" }> {
  const r = await partRow(actor, id);
  const v = await db()("part_versions").where({ part_id: id, version }).first();
  if (!v) throw new DomainError(404, `Part version ${version} does not exist.`);
  return { id, kind: r.kind, version: v.version, name: v.name, values: v.values, note: v.note, authorName: null, createdAt: new Date(v.created_at).toISOString() };
}

/** The latest versions of the given parts of the actor's team, by id (for "a newer version exists"). */
export async function latestVersions(actor: CurrentUser, ids: string[]): Promise<Record<string, { version: number; name: string; retired: boolean }>> {
  const good = ids.filter(isUuid);
  if (good.length === 0) return {};
  const rows = await db()("parts").where({ team_id: actor.teamId }).whereIn("id", good);
  return Object.fromEntries(rows.map((r) => [r.id, { version: r.current_version, name: r.name, retired: r.retired_at !== null }]));
}

function nameTaken(e: unknown): boolean {
  return typeof e === "object" && e !== null && (e as { code?: string }).code === "23505";
}

/** Creates a part at version 1 (values already checked by the caller). */
export async function insertPart(actor: CurrentUser, input: { kind: "opamp" | "pass"; name: string; values: unknown; note?: string }): Promise<PartSummary> {
  try {
    return await db().transaction(async (trx) => {
      const [r] = await trx("parts").insert({ team_id: actor.teamId, kind: input.kind, name: input.name, current_version: 1, created_by: actor.id }).returning("*");
      await trx("part_versions").insert({ part_id: r.id, version: 1, name: input.name, values: JSON.stringify(input.values), note: input.note ?? "", author_id: actor.id });
      await audit({ teamId: actor.teamId, actorId: actor.id, action: "part.create", subjectType: "part", subjectId: r.id, detail: { kind: input.kind, name: input.name, version: 1 } }, trx);
      return summaryFrom(r);
    });
  } catch (e) {
    if (nameTaken(e)) throw new DomainError(409, `name: the team already has a ${input.kind === "opamp" ? "op-amp" : "pass device"} called "${input.name}".`);
    throw e;
  }
}

/**
 * A new version of a live part: the values given (already checked against the part's kind by the caller, which
 * reads the kind with `partKind`), its name kept unless renamed. A retired part takes no new versions (409).
 */
export async function insertPartVersion(actor: CurrentUser, id: string, input: { name?: string; values: unknown; note?: string }): Promise<PartSummary> {
  try {
    return await db().transaction(async (trx) => {
      const r = await partRow(actor, id, trx, true);
      if (r.retired_at !== null) throw new DomainError(409, "This part is retired: it takes no new versions.");
      const version = r.current_version + 1;
      const name = input.name ?? r.name;
      await trx("part_versions").insert({ part_id: id, version, name, values: JSON.stringify(input.values), note: input.note ?? "", author_id: actor.id });
      const [u] = await trx("parts").where({ id }).update({ current_version: version, name, updated_at: trx.fn.now() }).returning("*");
      await audit({ teamId: actor.teamId, actorId: actor.id, action: "part.version", subjectType: "part", subjectId: id, detail: { name, version } }, trx);
      return summaryFrom(u);
    });
  } catch (e) {
    if (nameTaken(e)) throw new DomainError(409, `name: the team already has a part called "${input.name}".`);
    throw e;
  }
}

/** The kind of a part of the actor's team (404 otherwise). */
export async function partKind(actor: CurrentUser, id: string): Promise<"opamp" | "pass"> {
  return (await partRow(actor, id)).kind;
}

/** Retires a part: it leaves the pickers and takes no new versions; its versions stay for old revisions. */
export async function retirePart(actor: CurrentUser, id: string): Promise<void> {
  await db().transaction(async (trx) => {
    const r = await partRow(actor, id, trx, true);
    if (r.retired_at !== null) return;
    await trx("parts").where({ id }).update({ retired_at: trx.fn.now(), updated_at: trx.fn.now() });
    await audit({ teamId: actor.teamId, actorId: actor.id, action: "part.retire", subjectType: "part", subjectId: id, detail: { name: r.name, version: r.current_version } }, trx);
  });
}

/** A live part with its current values, for the workbench's pickers and its "a newer version exists" offer. */
export interface PartOption {
  id: string;
  kind: "opamp" | "pass";
  name: string;
  version: number;
  values: Record<string, unknown>;
}

export async function livePartOptions(actor: CurrentUser): Promise<PartOption[]> {
  const rows = await db()("parts as p")
    .join("part_versions as v", function join() {
      this.on("v.part_id", "=", "p.id").andOn("v.version", "=", "p.current_version");
    })
    .where("p.team_id", actor.teamId)
    .whereNull("p.retired_at")
    .orderBy([{ column: "p.kind" }, { column: "p.name" }])
    .select("p.id", "p.kind", "p.name", "p.current_version", "v.values");
  return rows.map((r) => ({ id: r.id, kind: r.kind, name: r.name, version: r.current_version, values: r.values }));
}
