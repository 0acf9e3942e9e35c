import { afterAll, beforeAll, describe, expect, it } from "vitest";

import { db } from "@/lib/db/knex";
import { devOutboxEnabled } from "@/lib/mail/outbox";
import { teamOutbox } from "@/lib/db/outbox";
import { createInvitation } from "@/lib/db/teams";
import { closeDb, makeFixture, type Fixture } from "./support/fixtures";

let f: Fixture;
beforeAll(async () => {
  f = await makeFixture("outbox");
});
afterAll(closeDb);

describe("development outbox", () => {
  it("is on while mail goes to the local fake", () => {
    expect(devOutboxEnabled()).toBe(true);
  });

  it("shows a team's lead the mail of its members and invitees only", async () => {
    await createInvitation(f.lead, `invitee.${f.tag}@fixture.test`, "viewer");
    await db()("dev_mailbox").insert([
      { to_address: f.viewer.email, from_address: "quell@localhost", subject: "for a member", text_body: "a", html_body: "" },
      { to_address: `invitee.${f.tag}@fixture.test`, from_address: "quell@localhost", subject: "for an invitee", text_body: "b", html_body: "" },
      { to_address: f.outsider.email, from_address: "quell@localhost", subject: "for another team", text_body: "c", html_body: "" },
    ]);
    const subjects = (await teamOutbox(f.lead.teamId)).map((m) => m.subject).sort();
    expect(subjects).toEqual(["for a member", "for an invitee"]);
    expect((await teamOutbox(f.outsider.teamId)).map((m) => m.subject)).toEqual(["for another team"]);
  });
});
