import type { Knex } from "knex";

/**
 * Evidence that is read right.
 * - bench_trace_settings: versions of a trace's channel settings (unit and scale) corrected after upload; the
 *   samples stay as stored at upload (`bench_traces.channels` is version 0) and are rescaled on reading by the
 *   latest version's scale over the upload's.
 * - library_entries.override_reason: the lead's written reason for validating an entry whose comparison failed or
 *   is missing (null for an entry validated on passing evidence).
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("bench_trace_settings", (t) => {
    t.bigIncrements("id");
    t.uuid("trace_id").notNullable().references("bench_traces.id").onDelete("CASCADE");
    t.integer("version").notNullable();
    /** Channel descriptions after the correction: [{ name, unit, scale, sourceUnit }], in stored order. */
    t.jsonb("channels").notNullable();
    t.uuid("actor_id").nullable().references("users.id").onDelete("SET NULL");
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.unique(["trace_id", "version"]);
  });
  await knex.schema.alterTable("library_entries", (t) => {
    t.text("override_reason").nullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("library_entries", (t) => {
    t.dropColumn("override_reason");
  });
  await knex.schema.dropTable("bench_trace_settings");
}
