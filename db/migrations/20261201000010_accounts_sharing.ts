import type { Knex } from "knex";

/**
 * Accounts and sharing: password resets, invitations, sign-in attempts (rate limiting lives in PostgreSQL,
 * the server keeps no memory between requests), share links, comments; a session version on users so a
 * password reset signs out every other session.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("users", (t) => {
    t.integer("session_version").notNullable().defaultTo(0);
  });

  await knex.schema.createTable("password_resets", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.uuid("user_id").notNullable().references("users.id").onDelete("CASCADE");
    t.text("token_hash").notNullable().unique();
    t.timestamp("expires_at", { useTz: true }).notNullable();
    t.timestamp("used_at", { useTz: true }).nullable();
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(["user_id"]);
  });

  await knex.schema.createTable("invitations", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.uuid("team_id").notNullable().references("teams.id").onDelete("CASCADE");
    t.text("email").notNullable();
    t.text("role").notNullable();
    t.text("token_hash").notNullable().unique();
    t.uuid("invited_by").nullable().references("users.id").onDelete("SET NULL");
    t.timestamp("expires_at", { useTz: true }).notNullable();
    t.timestamp("accepted_at", { useTz: true }).nullable();
    t.timestamp("revoked_at", { useTz: true }).nullable();
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(["team_id", "created_at"]);
  });
  await knex.raw("create index invitations_email_lower on invitations (lower(email))");
  await knex.raw("alter table invitations add constraint invitations_role check (role in ('lead','designer','viewer'))");

  await knex.schema.createTable("sign_in_attempts", (t) => {
    t.bigIncrements("id");
    t.text("account").notNullable(); // lower-cased address typed in, whether or not an account exists
    t.text("client_address").notNullable();
    t.boolean("succeeded").notNullable();
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(["account", "created_at"]);
    t.index(["client_address", "created_at"]);
  });

  await knex.schema.createTable("share_links", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.uuid("scenario_id").notNullable().references("scenarios.id").onDelete("CASCADE");
    t.uuid("revision_id").notNullable().references("revisions.id").onDelete("CASCADE");
    t.uuid("created_by").nullable().references("users.id").onDelete("SET NULL");
    t.text("token_hash").notNullable().unique();
    t.timestamp("expires_at", { useTz: true }).notNullable();
    t.timestamp("revoked_at", { useTz: true }).nullable();
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(["scenario_id", "created_at"]);
    t.index(["revision_id"]);
  });

  await knex.schema.createTable("comments", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.uuid("scenario_id").notNullable().references("scenarios.id").onDelete("CASCADE");
    t.uuid("revision_id").nullable().references("revisions.id").onDelete("SET NULL");
    t.uuid("author_id").notNullable().references("users.id").onDelete("CASCADE");
    t.text("body").notNullable();
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(["scenario_id", "created_at"]);
    t.index(["author_id"]);
  });

  // Lookup paths of the scenario table and history.
  await knex.schema.alterTable("revisions", (t) => {
    t.index(["author_id"]);
    t.index(["parent_id"]);
  });
  await knex.schema.alterTable("scenarios", (t) => {
    t.index(["team_id", "template"]);
    t.index(["team_id", "status"]);
    t.index(["current_revision_id"]);
  });
  await knex.raw("create index scenarios_team_title_lower on scenarios (team_id, lower(title))");
  await knex.schema.alterTable("audit_log", (t) => {
    t.index(["subject_type", "subject_id"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("audit_log", (t) => t.dropIndex(["subject_type", "subject_id"]));
  await knex.raw("drop index if exists scenarios_team_title_lower");
  await knex.schema.alterTable("scenarios", (t) => {
    t.dropIndex(["team_id", "template"]);
    t.dropIndex(["team_id", "status"]);
    t.dropIndex(["current_revision_id"]);
  });
  await knex.schema.alterTable("revisions", (t) => {
    t.dropIndex(["author_id"]);
    t.dropIndex(["parent_id"]);
  });
  await knex.schema.dropTable("comments");
  await knex.schema.dropTable("share_links");
  await knex.schema.dropTable("sign_in_attempts");
  await knex.schema.dropTable("invitations");
  await knex.schema.dropTable("password_resets");
  await knex.schema.alterTable("users", (t) => t.dropColumn("session_version"));
}
