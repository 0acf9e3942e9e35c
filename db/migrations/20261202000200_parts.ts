import type { Knex } from "knex";

/**
 * The team's own parts (op-amps and pass devices), versioned:
 * - parts: one row per part; `current_version` is the latest; `retired_at` set when retired (kept for old revisions).
 * - part_versions: every version's values (the design layer's op-amp or pass-device fields), never changed after.
 * Every change is also written to audit_log (part.create, part.version, part.retire) in the same transaction.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("parts", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.uuid("team_id").notNullable().references("teams.id").onDelete("CASCADE");
    /** "opamp" or "pass" */
    t.text("kind").notNullable();
    t.text("name").notNullable();
    t.integer("current_version").notNullable().defaultTo(1);
    t.uuid("created_by").notNullable().references("users.id");
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp("updated_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp("retired_at", { useTz: true }).nullable();
    t.index(["team_id", "kind"]);
  });
  await knex.raw("ALTER TABLE parts ADD CONSTRAINT parts_kind_check CHECK (kind IN ('opamp', 'pass'))");
  // one live part per name and kind in a team (a retired name may be used again)
  await knex.raw("CREATE UNIQUE INDEX parts_team_kind_name_live ON parts (team_id, kind, lower(name)) WHERE retired_at IS NULL");

  await knex.schema.createTable("part_versions", (t) => {
    t.uuid("part_id").notNullable().references("parts.id").onDelete("CASCADE");
    t.integer("version").notNullable();
    t.text("name").notNullable();
    t.jsonb("values").notNullable();
    t.text("note").notNullable().defaultTo("");
    t.uuid("author_id").notNullable().references("users.id");
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.primary(["part_id", "version"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists("part_versions");
  await knex.schema.dropTableIfExists("parts");
}
