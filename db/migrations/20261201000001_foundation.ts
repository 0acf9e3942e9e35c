import type { Knex } from "knex";

/** Users, teams, memberships, scenarios with immutable revisions, the development mailbox and the audit log. */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("users", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.text("email").notNullable();
    t.text("name").notNullable();
    t.text("password_hash").notNullable();
    t.uuid("current_team_id").nullable();
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });
  await knex.raw("create unique index users_email_lower on users (lower(email))");

  await knex.schema.createTable("teams", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.text("name").notNullable();
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });
  await knex.schema.alterTable("users", (t) => {
    t.foreign("current_team_id").references("teams.id").onDelete("SET NULL");
  });

  await knex.schema.createTable("memberships", (t) => {
    t.uuid("team_id").notNullable().references("teams.id").onDelete("CASCADE");
    t.uuid("user_id").notNullable().references("users.id").onDelete("CASCADE");
    t.text("role").notNullable();
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.primary(["team_id", "user_id"]);
    t.index(["user_id"]);
  });
  await knex.raw("alter table memberships add constraint memberships_role check (role in ('lead','designer','viewer'))");

  await knex.schema.createTable("scenarios", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.uuid("team_id").notNullable().references("teams.id").onDelete("CASCADE");
    t.uuid("owner_id").notNullable().references("users.id");
    t.text("title").notNullable();
    t.text("template").notNullable();
    t.text("status").notNullable().defaultTo("draft");
    t.uuid("current_revision_id").nullable();
    t.timestamp("deleted_at", { useTz: true }).nullable();
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp("updated_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(["team_id", "updated_at"]);
    t.index(["owner_id"]);
  });

  await knex.schema.createTable("revisions", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.uuid("scenario_id").notNullable().references("scenarios.id").onDelete("CASCADE");
    t.integer("number").notNullable();
    t.uuid("parent_id").nullable().references("revisions.id");
    t.uuid("author_id").notNullable().references("users.id");
    t.text("note").notNullable().defaultTo("");
    t.jsonb("body").notNullable();
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.unique(["scenario_id", "number"]);
  });
  await knex.schema.alterTable("scenarios", (t) => {
    t.foreign("current_revision_id").references("revisions.id").onDelete("SET NULL");
  });

  await knex.schema.createTable("dev_mailbox", (t) => {
    t.bigIncrements("id");
    t.text("to_address").notNullable();
    t.text("from_address").notNullable();
    t.text("subject").notNullable();
    t.text("text_body").notNullable();
    t.text("html_body").notNullable();
    t.timestamp("received_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(["to_address"]);
  });

  await knex.schema.createTable("audit_log", (t) => {
    t.bigIncrements("id");
    t.uuid("team_id").nullable().references("teams.id").onDelete("SET NULL");
    t.uuid("actor_id").nullable().references("users.id").onDelete("SET NULL");
    t.text("action").notNullable();
    t.text("subject_type").notNullable();
    t.text("subject_id").nullable();
    t.jsonb("detail").notNullable().defaultTo("{}");
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(["team_id", "created_at"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("audit_log");
  await knex.schema.dropTable("dev_mailbox");
  await knex.schema.alterTable("scenarios", (t) => t.dropForeign(["current_revision_id"]));
  await knex.schema.dropTable("revisions");
  await knex.schema.dropTable("scenarios");
  await knex.schema.dropTable("memberships");
  await knex.schema.alterTable("users", (t) => t.dropForeign(["current_team_id"]));
  await knex.schema.dropTable("teams");
  await knex.schema.dropTable("users");
}
