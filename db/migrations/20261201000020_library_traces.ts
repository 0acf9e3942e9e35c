import type { Knex } from "knex";

/**
 * Team library of validated setups and bench traces.
 * - library_entries: one per submitted revision; status draft | submitted | validated | retired.
 * - library_events: the entry's history (submitted, returned, validated, retired, commented…), comments included.
 * - bench_traces: parsed oscilloscope captures against a revision, samples in SI units as little-endian float64.
 * - library_settings: the team's tolerances for the measured-vs-simulated verdict.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("bench_traces", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.uuid("team_id").notNullable().references("teams.id").onDelete("CASCADE");
    t.uuid("scenario_id").notNullable().references("scenarios.id").onDelete("CASCADE");
    t.uuid("revision_id").notNullable().references("revisions.id").onDelete("CASCADE");
    t.uuid("uploader_id").notNullable().references("users.id");
    t.text("label").notNullable();
    t.text("file_name").notNullable().defaultTo("");
    t.integer("sample_count").notNullable();
    /** Channel descriptions: [{ name, unit, scale, sourceUnit }], in the order the values are stored. */
    t.jsonb("channels").notNullable();
    /** Instrument settings and parsing options the uploader entered (probe factor, sense resistor, timebase…). */
    t.jsonb("settings").notNullable().defaultTo("{}");
    /** Time column, seconds, float64 little-endian. */
    t.binary("time_data").notNullable();
    /** Channel values after scaling (SI units), channel-major, float64 little-endian. */
    t.binary("value_data").notNullable();
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(["scenario_id", "created_at"]);
    t.index(["revision_id"]);
    t.index(["team_id"]);
  });

  await knex.schema.createTable("library_entries", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.uuid("team_id").notNullable().references("teams.id").onDelete("CASCADE");
    t.uuid("scenario_id").notNullable().references("scenarios.id").onDelete("CASCADE");
    t.uuid("revision_id").notNullable().references("revisions.id").onDelete("CASCADE");
    t.text("status").notNullable().defaultTo("draft");
    t.text("title").notNullable();
    t.text("template").notNullable();
    t.text("pass_element").notNullable().defaultTo("");
    t.text("load_type").notNullable().defaultTo("");
    /** Full-scale load current range, A (from the scenario body). */
    t.double("current_min").nullable();
    t.double("current_max").nullable();
    /** Simulated key figures computed in the submitter's browser (phase margin, overshoot, settling…). */
    t.jsonb("key_figures").notNullable().defaultTo("{}");
    /** Evidence: bench trace ids and the measured-vs-simulated comparison at submission. */
    t.jsonb("evidence").notNullable().defaultTo("{}");
    t.text("note").notNullable().defaultTo("");
    t.uuid("created_by").notNullable().references("users.id");
    t.uuid("submitted_by").nullable().references("users.id");
    t.timestamp("submitted_at", { useTz: true }).nullable();
    t.uuid("validated_by").nullable().references("users.id");
    t.timestamp("validated_at", { useTz: true }).nullable();
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp("updated_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.unique(["revision_id"]);
    t.index(["team_id", "status"]);
    t.index(["team_id", "template"]);
    t.index(["scenario_id"]);
  });
  await knex.raw(
    "alter table library_entries add constraint library_entries_status check (status in ('draft','submitted','validated','retired'))",
  );

  await knex.schema.createTable("library_events", (t) => {
    t.bigIncrements("id");
    t.uuid("entry_id").notNullable().references("library_entries.id").onDelete("CASCADE");
    t.uuid("actor_id").nullable().references("users.id").onDelete("SET NULL");
    t.text("action").notNullable();
    t.text("from_status").nullable();
    t.text("to_status").nullable();
    t.text("comment").notNullable().defaultTo("");
    t.jsonb("detail").notNullable().defaultTo("{}");
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(["entry_id", "created_at"]);
  });

  await knex.schema.createTable("library_settings", (t) => {
    t.uuid("team_id").primary().references("teams.id").onDelete("CASCADE");
    /** Tolerances of the measured-vs-simulated verdict (see lib/traces/compare.ts `Tolerances`). */
    t.jsonb("tolerances").notNullable();
    t.uuid("updated_by").nullable().references("users.id").onDelete("SET NULL");
    t.timestamp("updated_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("library_settings");
  await knex.schema.dropTable("library_events");
  await knex.schema.dropTable("library_entries");
  await knex.schema.dropTable("bench_traces");
}
