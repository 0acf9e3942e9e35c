import { z } from "zod";
import { SCENARIO_STATUSES } from "@/lib/shared/statuses";
import { ROLES } from "@/lib/shared/roles";
import { TEMPLATE_IDS } from "@/lib/design/schema";
import { storedText } from "@/lib/shared/text";

const uuid = (what: string) => z.string().uuid(`${what} must be an id`);
const intFromQuery = (min: number, max: number, name: string) =>
  z.coerce.number({ error: `${name} must be a number` }).int(`${name} must be a whole number`).min(min, `${name} must be at least ${min}`).max(max, `${name} must be at most ${max}`);

export const scenarioListQuery = z
  .object({
    q: z.string().max(200, "q: at most 200 characters").optional(),
    owner: z.union([z.literal("me"), uuid("owner")]).optional(),
    template: z.string().max(60).optional(),
    status: z.string().max(40).optional(),
    sort: z.enum(["title", "updated", "created", "template", "status", "owner"], { error: "sort must be title, updated, created, template, status or owner" }).optional(),
    dir: z.enum(["asc", "desc"], { error: "dir must be asc or desc" }).optional(),
    page: intFromQuery(1, 10_000, "page").optional(),
    pageSize: intFromQuery(1, 100, "pageSize").optional(),
    deleted: z.enum(["0", "1", "true", "false"]).transform((v) => v === "1" || v === "true").optional(),
  })
  .strict();

export const createScenarioBody = z
  .object({
    title: storedText("title").trim().min(1, "title: give the scenario a title").max(200, "title: at most 200 characters"),
    template: z.enum(TEMPLATE_IDS, { error: `template must be one of ${TEMPLATE_IDS.join(", ")}` }),
    body: z.record(z.string(), z.unknown()).optional(),
    note: storedText("note").max(2000, "note: at most 2000 characters").optional(),
    /** Start from a revision (e.g. a library entry's) instead of the template's defaults. */
    fromRevisionId: uuid("fromRevisionId").optional(),
  })
  .strict();

export const patchScenarioBody = z
  .object({
    baseRevisionId: uuid("baseRevisionId").optional(),
    note: storedText("note").max(2000, "note: at most 2000 characters").optional(),
    body: z.record(z.string(), z.unknown()).optional(),
    title: storedText("title").trim().min(1, "title: give the scenario a title").max(200, "title: at most 200 characters").optional(),
    status: z.enum(SCENARIO_STATUSES).optional(),
    restore: z.literal(true).optional(),
  })
  .strict()
  .refine((v) => (v.body === undefined) === (v.baseRevisionId === undefined), {
    path: ["baseRevisionId"],
    message: "baseRevisionId and body go together: a new revision needs the revision it was based on",
  })
  .refine((v) => !(v.restore && v.body !== undefined), {
    path: ["restore"],
    message: "restore the scenario first, then save a revision on it (a save that conflicted would leave it restored)",
  })
  .refine((v) => v.body !== undefined || v.title !== undefined || v.status !== undefined || v.restore, {
    path: ["_"],
    message: "nothing to change: send body with baseRevisionId, title, status or restore",
  });

export const commentBody = z
  .object({
    body: storedText("body").trim().min(1, "body: write a comment first").max(4000, "body: at most 4000 characters"),
    revisionId: uuid("revisionId").optional(),
  })
  .strict();

export const shareLinkBody = z
  .object({
    revisionId: uuid("revisionId").optional(),
    days: z.number().int("days must be a whole number").min(1, "days must be at least 1").max(90, "days must be at most 90").default(14),
  })
  .strict();

export const revokeShareLinkQuery = z.object({ id: uuid("id") }).strict();

export const memberPatchBody = z.object({ userId: uuid("userId"), role: z.enum(ROLES as [string, ...string[]], { error: "role must be lead, designer or viewer" }) }).strict();
export const memberDeleteQuery = z.object({ userId: uuid("userId") }).strict();

export const invitationBody = z
  .object({
    email: z.string().trim().max(254).email("email: enter an address such as name@example.com"),
    role: z.enum(["lead", "designer", "viewer"], { error: "role must be lead, designer or viewer" }),
  })
  .strict();
export const invitationDeleteQuery = z.object({ id: uuid("id") }).strict();

export const revisionsQuery = z.object({ revision: uuid("revision").optional() }).strict();
