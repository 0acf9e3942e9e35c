import "server-only";
import type { Knex } from "knex";
import { db } from "./knex";
import { audit } from "./audit";
import { DomainError } from "@/lib/errors";
import { isUuid } from "./users";
import { roleAtLeast, type CurrentUser } from "@/lib/shared/roles";

/** Float64Array → little-endian bytes (the stored form, independent of the server's byte order). */
export function encodeFloat64(values: Float64Array): Buffer {
  const out = Buffer.allocUnsafe(values.length * 8);
  for (let i = 0; i < values.length; i++) out.writeDoubleLE(values[i], i * 8);
  return out;
}

/** Little-endian bytes → Float64Array. */
export function decodeFloat64(bytes: Buffer, offset = 0, count = (bytes.length - offset) / 8): Float64Array {
  const out = new Float64Array(count);
  for (let i = 0; i < count; i++) out[i] = bytes.readDoubleLE(offset + i * 8);
  return out;
}

export interface TraceChannelMeta {
  name: string;
  /** Unit after scaling (what the stored values are in). */
  unit: string;
  /** Unit as written in the file. */
  sourceUnit: string;
  /** Factor from the file's numbers to the stored values. */
  scale: number;
}

export interface TraceSummary {
  id: string;
  scenarioId: string;
  revisionId: string;
  revisionNumber: number;
  label: string;
  fileName: string;
  sampleCount: number;
  channels: TraceChannelMeta[];
  settings: Record<string, unknown>;
  uploaderId: string;
  uploaderName: string;
  createdAt: string;
  /** Time span of the record, s. */
  duration: number;
  /** Version of the channel settings: 0 as uploaded, then one more per correction (bench_trace_settings). */
  settingsVersion: number;
}

export interface TraceData extends TraceSummary {
  /** Seconds. */
  time: Float64Array;
  /** One array per channel, in `channels` order, in each channel's unit. */
  values: Float64Array[];
}

function summaryFrom(r: Record<string, any>): TraceSummary {
  return {
    id: r.id,
    scenarioId: r.scenario_id,
    revisionId: r.revision_id,
    revisionNumber: r.revision_number,
    label: r.label,
    fileName: r.file_name,
    sampleCount: r.sample_count,
    channels: r.corrected_channels ?? r.channels,
    settings: r.settings ?? {},
    uploaderId: r.uploader_id,
    uploaderName: r.uploader_name,
    createdAt: new Date(r.created_at).toISOString(),
    duration: Number(r.duration ?? 0),
    settingsVersion: Number(r.settings_version ?? 0),
  };
}

const SUMMARY_COLUMNS = [
  "t.id", "t.scenario_id", "t.revision_id", "t.label", "t.file_name", "t.sample_count", "t.channels", "t.settings",
  "t.uploader_id", "t.created_at", "r.number as revision_number", "u.name as uploader_name",
];

function summaryQuery(trx: Knex | Knex.Transaction) {
  return trx("bench_traces as t")
    .join("revisions as r", "r.id", "t.revision_id")
    .join("users as u", "u.id", "t.uploader_id")
    .select(
      ...SUMMARY_COLUMNS,
      // Last time sample minus the first, read from the stored bytes (float8send is big-endian, so decode in JS instead).
      // The latest correction of the channel settings, if any (the samples are rescaled on reading: getTrace).
      trx.raw("(select s.channels from bench_trace_settings s where s.trace_id = t.id order by s.version desc limit 1) as corrected_channels"),
      trx.raw("(select max(s.version) from bench_trace_settings s where s.trace_id = t.id) as settings_version"),
      trx.raw("octet_length(t.time_data) as time_bytes"),
      trx.raw("substring(t.time_data from 1 for 8) as t_first"),
      trx.raw("substring(t.time_data from octet_length(t.time_data) - 7 for 8) as t_last"),
    );
}

function withDuration(r: Record<string, any>): TraceSummary {
  const first = r.t_first ? (r.t_first as Buffer).readDoubleLE(0) : 0;
  const last = r.t_last ? (r.t_last as Buffer).readDoubleLE(0) : 0;
  return summaryFrom({ ...r, duration: last - first });
}

export interface StoreTraceInput {
  scenarioId: string;
  /** Revision the capture belongs to; the scenario's current revision when absent. */
  revisionId?: string | null;
  label: string;
  fileName: string;
  /** The parsed capture (lib/traces/parse: ParsedTrace has this shape): time in s, one column per channel. */
  parsed: { time: Float64Array; channels: (TraceChannelMeta & { values: Float64Array })[] };
  /** Instrument settings and parsing options as the uploader entered them. */
  settings: Record<string, unknown>;
}

/** Stores a parsed capture against a revision of a team scenario (designers and leads). */
export async function storeTrace(actor: CurrentUser, input: StoreTraceInput): Promise<TraceSummary> {
  if (!roleAtLeast(actor.role, "designer")) throw new DomainError(403, "Viewers cannot upload bench traces.");
  if (!isUuid(input.scenarioId)) throw new DomainError(404, "No such scenario.");
  const { parsed } = input;
  const n = parsed.time.length;
  const values = Buffer.concat(parsed.channels.map((c) => encodeFloat64(c.values)));
  return db().transaction(async (trx) => {
    const s = await trx("scenarios").where({ id: input.scenarioId, team_id: actor.teamId }).whereNull("deleted_at").first();
    if (!s) throw new DomainError(404, "No such scenario.");
    const revisionId = input.revisionId ?? s.current_revision_id;
    if (!revisionId || !isUuid(revisionId)) throw new DomainError(400, "revisionId: the scenario has no revision to attach the trace to.");
    const rev = await trx("revisions").where({ id: revisionId, scenario_id: s.id }).first("id");
    if (!rev) throw new DomainError(400, "revisionId: not a revision of this scenario.");
    const [row] = await trx("bench_traces")
      .insert({
        team_id: actor.teamId,
        scenario_id: s.id,
        revision_id: revisionId,
        uploader_id: actor.id,
        label: input.label.trim().slice(0, 200) || input.fileName || "Bench trace",
        file_name: input.fileName.slice(0, 255),
        sample_count: n,
        channels: JSON.stringify(parsed.channels.map(({ name, unit, sourceUnit, scale }) => ({ name, unit, sourceUnit, scale }))),
        settings: JSON.stringify(input.settings),
        time_data: encodeFloat64(parsed.time),
        value_data: values,
      })
      .returning("id");
    await audit(
      { teamId: actor.teamId, actorId: actor.id, action: "trace.upload", subjectType: "bench_trace", subjectId: row.id, detail: { scenarioId: s.id, revisionId, samples: n, label: input.label } },
      trx,
    );
    const stored = await summaryQuery(trx).where("t.id", row.id).first();
    return withDuration(stored);
  });
}

/** The bench traces of a team scenario, newest first (samples left out). */
export async function listTraces(actor: CurrentUser, scenarioId: string, opts: { revisionId?: string } = {}): Promise<TraceSummary[]> {
  if (!isUuid(scenarioId)) throw new DomainError(404, "No such scenario.");
  const s = await db()("scenarios").where({ id: scenarioId, team_id: actor.teamId }).first("id");
  if (!s) throw new DomainError(404, "No such scenario.");
  const q = summaryQuery(db()).where("t.scenario_id", scenarioId).orderBy("t.created_at", "desc");
  if (opts.revisionId) {
    if (!isUuid(opts.revisionId)) return [];
    q.where("t.revision_id", opts.revisionId);
  }
  return (await q).map(withDuration);
}

/** Trace summaries by id, limited to the actor's team (for an entry's evidence). */
export async function tracesByIds(teamId: string, ids: string[], trx: Knex | Knex.Transaction = db()): Promise<TraceSummary[]> {
  const valid = ids.filter(isUuid);
  if (valid.length === 0) return [];
  return (await summaryQuery(trx).whereIn("t.id", valid).andWhere("t.team_id", teamId).orderBy("t.created_at")).map(withDuration);
}

/** One trace with its samples, for a member of its team (404 otherwise). */
export async function getTrace(actor: CurrentUser, id: string): Promise<TraceData> {
  if (!isUuid(id)) throw new DomainError(404, "No such trace.");
  const row = await summaryQuery(db()).select("t.time_data", "t.value_data").where("t.id", id).andWhere("t.team_id", actor.teamId).first();
  if (!row) throw new DomainError(404, "No such trace.");
  const summary = withDuration(row);
  const n = summary.sampleCount;
  const time = decodeFloat64(row.time_data, 0, n);
  const uploaded = row.channels as TraceChannelMeta[];
  const values = summary.channels.map((ch, c) => {
    const v = decodeFloat64(row.value_data, c * n * 8, n);
    // Stored as the file's numbers × the upload's scale; a correction changes the scale, not the stored samples.
    const ratio = ch.scale / uploaded[c].scale;
    if (ratio !== 1) for (let i = 0; i < n; i++) v[i] *= ratio;
    return v;
  });
  return { ...summary, time, values };
}

/**
 * Corrects one channel's unit and scale after upload, without the file: a new version of the trace's channel
 * settings (bench_trace_settings), audited. Designers and leads of the team; not while the trace is evidence of a
 * submitted or validated library entry (the reviewer judged the figures as they were).
 */
export async function correctTraceChannel(
  actor: CurrentUser, id: string, channel: number, correction: { unit: string; sourceUnit: string; scale: number },
): Promise<TraceSummary> {
  if (!roleAtLeast(actor.role, "designer")) throw new DomainError(403, "Viewers cannot change bench traces.");
  if (!isUuid(id)) throw new DomainError(404, "No such trace.");
  if (!Number.isFinite(correction.scale) || correction.scale === 0) throw new DomainError(400, "scale: a finite, non-zero number.");
  return db().transaction(async (trx) => {
    const t = await trx("bench_traces").where({ id, team_id: actor.teamId }).forUpdate().first("id", "channels", "scenario_id", "label");
    if (!t) throw new DomainError(404, "No such trace.");
    const inUse = await trx("library_entries")
      .where({ team_id: actor.teamId })
      .whereIn("status", ["submitted", "validated"])
      .whereRaw("evidence->'traceIds' \\? ?", [id])
      .first("id", "status");
    if (inUse) throw new DomainError(409, `This trace is evidence of a ${inUse.status} library entry; its units stay as the reviewer saw them.`);
    const latest = await trx("bench_trace_settings").where({ trace_id: id }).orderBy("version", "desc").first("version", "channels");
    const current = (latest?.channels ?? t.channels) as TraceChannelMeta[];
    if (!Number.isInteger(channel) || channel < 0 || channel >= current.length) {
      throw new DomainError(400, `channel: the trace has ${current.length} channel${current.length === 1 ? "" : "s"} (0 to ${current.length - 1}).`);
    }
    const before = current[channel];
    const channels = current.map((c, i) => (i === channel ? { ...c, unit: correction.unit, sourceUnit: correction.sourceUnit, scale: correction.scale } : c));
    const version = (latest?.version ?? 0) + 1;
    await trx("bench_trace_settings").insert({ trace_id: id, version, channels: JSON.stringify(channels), actor_id: actor.id });
    await audit(
      {
        teamId: actor.teamId, actorId: actor.id, action: "trace.correct_units", subjectType: "bench_trace", subjectId: id,
        detail: { scenarioId: t.scenario_id, channel, version, from: { unit: before.unit, sourceUnit: before.sourceUnit, scale: before.scale }, to: correction },
      },
      trx,
    );
    return withDuration(await summaryQuery(trx).where("t.id", id).first());
  });
}

/**
 * Deletes a trace: its uploader or a lead. A trace that is evidence of a submitted or validated library entry
 * stays (409) — evidence is not withdrawn behind the reviewer's back.
 */
export async function deleteTrace(actor: CurrentUser, id: string): Promise<void> {
  if (!isUuid(id)) throw new DomainError(404, "No such trace.");
  await db().transaction(async (trx) => {
    const t = await trx("bench_traces").where({ id, team_id: actor.teamId }).forUpdate().first("id", "uploader_id", "scenario_id", "label");
    if (!t) throw new DomainError(404, "No such trace.");
    if (t.uploader_id !== actor.id && actor.role !== "lead") {
      throw new DomainError(403, "Only the uploader or a lead can delete a bench trace.");
    }
    const inUse = await trx("library_entries")
      .where({ team_id: actor.teamId })
      .whereIn("status", ["submitted", "validated"])
      .whereRaw("evidence->'traceIds' \\? ?", [id])
      .first("id", "status");
    if (inUse) throw new DomainError(409, `This trace is evidence of a ${inUse.status} library entry; retire or return the entry first.`);
    await trx("bench_traces").where({ id }).delete();
    await audit({ teamId: actor.teamId, actorId: actor.id, action: "trace.delete", subjectType: "bench_trace", subjectId: id, detail: { scenarioId: t.scenario_id, label: t.label } }, trx);
  });
}
