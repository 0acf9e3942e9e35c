import { afterAll, describe, expect, it } from "vitest";
import { db } from "@/lib/db/knex";
import { DEMO_TEAM, DEMO_USERS } from "@/db/seeds/01_demo_team";

// Runs against the real PostgreSQL started and migrated by the test command.
describe("database foundation", () => {
  afterAll(async () => {
    await db().destroy();
    (globalThis as { quellKnex?: unknown }).quellKnex = undefined;
  });

  it("has every migration applied", async () => {
    const [, pending] = (await db().migrate.list()) as [unknown[], unknown[]];
    expect(pending).toHaveLength(0);
  });

  it("seeded the demo team with one member of each role", async () => {
    const rows = await db()("memberships as m")
      .join("teams as t", "t.id", "m.team_id")
      .join("users as u", "u.id", "m.user_id")
      .where("t.name", DEMO_TEAM)
      .select("u.email", "m.role")
      .orderBy("u.email");
    expect(rows.map((r) => r.role).sort()).toEqual(["designer", "lead", "viewer"]);
    expect(rows.map((r) => r.email).sort()).toEqual(DEMO_USERS.map((u) => u.email).sort());
  });

  it("gives every demo scenario a current revision", async () => {
    const rows = await db()("scenarios as s")
      .join("revisions as r", "r.id", "s.current_revision_id")
      .join("teams as t", "t.id", "s.team_id")
      .where("t.name", DEMO_TEAM)
      .select("s.title", "r.number");
    expect(rows.map((r) => r.title).sort()).toEqual(["Cell-test load", "Grow-light channel", "Valve coil driver"]);
    expect(rows.every((r) => r.number === 1)).toBe(true);
  });

  it("refuses a second user with the same address in another case", async () => {
    await expect(
      db()("users").insert({ email: DEMO_USERS[0].email.toUpperCase(), name: "Dup", password_hash: "x" }),
    ).rejects.toThrow(/users_email_lower/);
  });
});
