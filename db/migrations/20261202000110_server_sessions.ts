import type { Knex } from "knex";

/**
 * Sessions that end on the server.
 * - sessions: one row per signed-in browser; the sealed cookie carries the row's id, and a request is signed in only
 *   while the row exists and has not expired. Sign-out deletes the row, "sign out everywhere" every row of the user.
 * - Public links of scenarios deleted before this migration are revoked, as deleting now does, so restoring such a
 *   scenario does not bring its links back.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("sessions", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.uuid("user_id").notNullable().references("users.id").onDelete("CASCADE");
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp("expires_at", { useTz: true }).notNullable();
    t.index(["user_id"]);
    t.index(["expires_at"]);
  });
  await knex.raw(
    `update share_links l set revoked_at = s.deleted_at
       from scenarios s
      where s.id = l.scenario_id and s.deleted_at is not null and l.revoked_at is null`,
  );
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("sessions");
}
