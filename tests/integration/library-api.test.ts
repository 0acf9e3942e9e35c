import { afterAll, beforeAll, describe, expect, it } from "vitest";


import { db } from "@/lib/db/knex";
import * as library from "@/app/api/library/route";
import * as libraryEntry from "@/app/api/library/[id]/route";
import * as scenarioTraces from "@/app/api/scenarios/[id]/traces/route";
import * as trace from "@/app/api/traces/[id]/route";
import { MAX_UPLOAD_BYTES } from "@/lib/api/traceUpload";
import { closeDb, cookieFor, ctx, makeFixture, ORIGIN, request, type Actor, type Fixture } from "./support/fixtures";

type Who = "anonymous" | "viewer" | "designer" | "lead" | "outsider";
const WHO: Who[] = ["anonymous", "viewer", "designer", "lead", "outsider"];

let f: Fixture;
const actor = (w: Who): Actor | null => (w === "anonymous" ? null : f[w]);

/** A capture made here: time in ms, current in mA, a step at 1 ms. */
function csv(rows = 50): string {
  const lines = ["Time (ms),I (mA)"];
  for (let k = 0; k < rows; k++) lines.push(`${(k * 0.1).toFixed(1)},${k < 10 ? 0 : 750}`);
  return lines.join("\n");
}

async function upload(who: Who, scenarioId: string, file: string, fields: Record<string, string> = {}): Promise<Response> {
  const form = new FormData();
  form.set("file", new File([file], "bench.csv", { type: "text/csv" }));
  for (const [k, v] of Object.entries(fields)) form.set(k, v);
  const headers: Record<string, string> = { host: "127.0.0.1:3999" };
  const cookie = await cookieFor(actor(who));
  if (cookie) headers.cookie = cookie;
  const req = new Request(`${ORIGIN}/api/scenarios/${scenarioId}/traces`, { method: "POST", headers, body: form });
  return scenarioTraces.POST(req, ctx({ id: scenarioId }));
}

beforeAll(async () => {
  f = await makeFixture("libapi");
});
afterAll(closeDb);

describe("bench-trace upload API", () => {
  it("answers 401 to anonymous requests on every route, whatever the body or id", async () => {
    const bogus = "00000000-0000-0000-0000-000000000000";
    expect((await library.GET(await request("GET", "/api/library", null), ctx({}))).status).toBe(401);
    expect((await library.POST(await request("POST", "/api/library", null, { nonsense: 1 }), ctx({}))).status).toBe(401);
    expect((await libraryEntry.GET(await request("GET", `/api/library/x`, null), ctx({ id: "x" }))).status).toBe(401);
    expect((await libraryEntry.PATCH(await request("PATCH", `/api/library/${bogus}`, null, { status: "validated" }), ctx({ id: bogus }))).status).toBe(401);
    expect((await upload("anonymous", f.scenarioId, "garbage")).status).toBe(401);
    expect((await scenarioTraces.GET(await request("GET", `/api/scenarios/${bogus}/traces`, null), ctx({ id: bogus }))).status).toBe(401);
    expect((await trace.GET(await request("GET", `/api/traces/${bogus}`, null), ctx({ id: bogus }))).status).toBe(401);
    expect((await trace.DELETE(await request("DELETE", `/api/traces/${bogus}`, null), ctx({ id: bogus }))).status).toBe(401);
  });

  it("stores a good file (designer), refuses viewers (403) and outsiders (404)", async () => {
    const expected: Record<Who, number> = { anonymous: 401, viewer: 403, designer: 201, lead: 201, outsider: 404 };
    for (const w of WHO) {
      const r = await upload(w, f.scenarioId, csv(), { label: `by ${w}`, options: JSON.stringify({ channels: [{ name: "Load current" }] }), settings: JSON.stringify({ probe: "shunt 0.1 Ω" }) });
      expect([w, r.status]).toEqual([w, expected[w]]);
      if (r.status === 201) {
        const body = await r.json();
        expect(body).toMatchObject({ label: `by ${w}`, sampleCount: 50, revisionId: f.revisionId, channels: [{ name: "Load current", unit: "A", sourceUnit: "mA" }] });
        expect(body.settings.probe).toBe("shunt 0.1 Ω");
      }
    }
    const list = await scenarioTraces.GET(await request("GET", `/api/scenarios/${f.scenarioId}/traces`, f.viewer), ctx({ id: f.scenarioId }));
    expect(list.status).toBe(200);
    const { traces } = await list.json();
    expect(traces.map((t: { label: string }) => t.label).sort()).toEqual(["by designer", "by lead"]);
    const one = await trace.GET(await request("GET", `/api/traces/${traces[0].id}`, f.viewer), ctx({ id: traces[0].id }));
    const data = await one.json();
    // 750 mA → 0.75 A; 4.9 ms → 0.0049 s (SI prefixes)
    expect(data.channels[0].values[49]).toBeCloseTo(0.75, 12);
    expect(data.time[49]).toBeCloseTo(0.0049, 12);
  });

  it("a malformed file gets 400 naming the line and the problem, and nothing is stored", async () => {
    const before = await db()("bench_traces").where({ scenario_id: f.scenarioId }).count<{ count: string }[]>({ count: "*" });
    const lines = csv().split("\n");
    lines[17] = "1.6,seven hundred"; // line 18
    const r = await upload("designer", f.scenarioId, lines.join("\n"));
    expect(r.status).toBe(400);
    const body = await r.json();
    expect(body.error).toBe('Line 18 of bench.csv: column 2 (I): "seven hundred" is not a number.');
    expect(body.problems).toEqual([{ line: 18, message: 'column 2 (I): "seven hundred" is not a number' }]);
    const bad = await upload("designer", f.scenarioId, csv(), { options: JSON.stringify({ channels: [{ scale: "ten" }] }) });
    expect(bad.status).toBe(400);
    expect((await bad.json()).fieldErrors.options[0]).toMatch(/^options\.channels\.0\.scale: /);
    const after = await db()("bench_traces").where({ scenario_id: f.scenarioId }).count<{ count: string }[]>({ count: "*" });
    expect(after[0].count).toBe(before[0].count);
  });

  it("too big an upload is 413", async () => {
    const big = "Time (s),V (V)\n" + "0.000001,0.5\n".repeat(Math.ceil(MAX_UPLOAD_BYTES / 13) + 10);
    const r = await upload("designer", f.scenarioId, big);
    expect(r.status).toBe(413);
  });
});

describe("library API", () => {
  let entryId: string;
  let traceId: string;

  beforeAll(async () => {
    const r = await upload("designer", f.scenarioId, csv(), { label: "evidence" });
    traceId = (await r.json()).id;
  });

  it("POST /api/library submits (designer), with field errors for a bad body", async () => {
    const bad = await library.POST(await request("POST", "/api/library", f.designer, { scenarioId: f.scenarioId, note: "", traceIds: [] }), ctx({}));
    expect(bad.status).toBe(400);
    const errors = (await bad.json()).fieldErrors;
    expect(errors.note[0]).toBe("Write a note for the reviewer");
    expect(errors.traceIds[0]).toBe("Attach at least one bench trace");
    const viewer = await library.POST(await request("POST", "/api/library", f.viewer, { scenarioId: f.scenarioId, note: "n", traceIds: [traceId] }), ctx({}));
    expect(viewer.status).toBe(403);
    const ok = await library.POST(await request("POST", "/api/library", f.designer, { scenarioId: f.scenarioId, note: "Bench agrees.", traceIds: [traceId], comparisons: [{ traceId, channel: 0, offset: 0, verdict: "pass", rows: [] }] }), ctx({}));
    expect(ok.status).toBe(201);
    entryId = (await ok.json()).entryId;
  });

  it("PATCH status validated: 403 for viewer and designer, 404 for an outsider, 200 for the lead", async () => {
    const expected: Record<Who, number> = { anonymous: 401, viewer: 403, designer: 403, lead: 200, outsider: 404 };
    for (const w of ["anonymous", "viewer", "designer", "outsider", "lead"] as Who[]) {
      const r = await libraryEntry.PATCH(await request("PATCH", `/api/library/${entryId}`, actor(w), { status: "validated", comment: "ok" }), ctx({ id: entryId }));
      expect([w, r.status]).toEqual([w, expected[w]]);
    }
    const got = await libraryEntry.GET(await request("GET", `/api/library/${entryId}`, f.viewer), ctx({ id: entryId }));
    const entry = await got.json();
    expect(entry).toMatchObject({ status: "validated", validatedBy: f.lead.id });
    expect(entry.events.map((e: { action: string }) => e.action)).toEqual(["created", "submitted", "validated"]);
  });

  it("GET /api/library filters by status and rejects an unknown status", async () => {
    const r = await library.GET(await request("GET", "/api/library?status=validated&template=sink-npn&q=", f.viewer), ctx({}));
    expect(r.status).toBe(200);
    expect((await r.json()).entries.map((e: { id: string }) => e.id)).toEqual([entryId]);
    const none = await library.GET(await request("GET", "/api/library?status=submitted", f.viewer), ctx({}));
    expect((await none.json()).entries).toEqual([]);
    const bad = await library.GET(await request("GET", "/api/library?status=approved", f.viewer), ctx({}));
    expect(bad.status).toBe(400);
    const outsider = await library.GET(await request("GET", "/api/library", f.outsider), ctx({}));
    expect((await outsider.json()).entries).toEqual([]);
  });

  it("evidence cannot be deleted; a lead retires the entry, then it can", async () => {
    const del = await trace.DELETE(await request("DELETE", `/api/traces/${traceId}`, f.designer), ctx({ id: traceId }));
    expect(del.status).toBe(409);
    const designerRetire = await libraryEntry.PATCH(await request("PATCH", `/api/library/${entryId}`, f.designer, { status: "retired" }), ctx({ id: entryId }));
    expect(designerRetire.status).toBe(403);
    const retire = await libraryEntry.PATCH(await request("PATCH", `/api/library/${entryId}`, f.lead, { status: "retired" }), ctx({ id: entryId }));
    expect(retire.status).toBe(200);
    const del2 = await trace.DELETE(await request("DELETE", `/api/traces/${traceId}`, f.designer), ctx({ id: traceId }));
    expect(del2.status).toBe(204);
  });
});
