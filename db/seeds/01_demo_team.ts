import type { Knex } from "knex";
import bcrypt from "bcryptjs";
import { demoScenarios } from "../../lib/design/demos";

/** Development passwords of the demo team; printed by the start command, never used in production. */
export const DEMO_TEAM = "Kestrel Hollow Instruments — bench group";
export const DEMO_USERS = [
  { email: "lena.marsh@kestrel-hollow.test", name: "Lena Marsh", role: "lead", password: "demo-lead-2026" },
  { email: "dev.okafor@kestrel-hollow.test", name: "Dev Okafor", role: "designer", password: "demo-designer-2026" },
  { email: "vera.lind@kestrel-hollow.test", name: "Vera Lind", role: "viewer", password: "demo-viewer-2026" },
] as const;

/** Idempotent: creates the demo team, its three members and its scenarios once; a second run changes nothing. */
export async function seed(knex: Knex): Promise<void> {
  if (process.env.NODE_ENV === "production" && process.env.QUELL_DEMO_SEED !== "1") {
    console.log("[seed] NODE_ENV=production: the demo team (with its published passwords) is not created");
    return;
  }
  const existing = await knex("teams").where({ name: DEMO_TEAM }).first();
  if (existing) return;
  await knex.transaction(async (trx) => {
    const [team] = await trx("teams").insert({ name: DEMO_TEAM }).returning("*");
    const ids: Record<string, string> = {};
    for (const u of DEMO_USERS) {
      const hash = await bcrypt.hash(u.password, 10);
      const [user] = await trx("users")
        .insert({ email: u.email, name: u.name, password_hash: hash, current_team_id: team.id })
        .returning("*");
      await trx("memberships").insert({ team_id: team.id, user_id: user.id, role: u.role });
      ids[u.role] = user.id;
    }
    for (const s of demoScenarios()) {
      const [scenario] = await trx("scenarios")
        .insert({ team_id: team.id, owner_id: ids.designer, title: s.title, template: s.template })
        .returning("*");
      const [rev] = await trx("revisions")
        .insert({ scenario_id: scenario.id, number: 1, author_id: ids.designer, note: s.note, body: JSON.stringify(s.body) })
        .returning("*");
      await trx("scenarios").where({ id: scenario.id }).update({ current_revision_id: rev.id });
    }
  });
}
