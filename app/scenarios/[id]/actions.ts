"use server";
import { z } from "zod";
import { revalidatePath } from "next/cache";
import { validatedInputAction } from "@/lib/auth/action";
import { forkRevision } from "@/lib/db/revisions";
import { softDeleteScenario, restoreScenario } from "@/lib/db/scenarios";
import { addComment } from "@/lib/db/comments";
import { saveRevision } from "@/lib/scenarios/save";
import { storedText } from "@/lib/shared/text";

/**
 * Saves the workbench's scenario as a new immutable revision with a note. A stale base revision is refused with
 * the current revision (number, body, author, time) so both versions can be shown; nothing is overwritten.
 */
export const saveScenarioRevision = validatedInputAction(
  z.object({
    scenarioId: z.string().uuid("scenarioId must be a scenario id"),
    baseRevisionId: z.string().uuid("baseRevisionId must be a revision id"),
    note: storedText("note").max(2000, "note: at most 2000 characters"),
    body: z.unknown(),
  }),
  async (data, user) => {
    const r = await saveRevision(user, data);
    if (r.ok) revalidatePath(`/scenarios/${data.scenarioId}`);
    return r;
  },
  { role: "designer", messages: { session: "Your session has ended: sign in again to save.", role: "Viewers cannot save scenarios." } },
);

/** Copies a revision into a new scenario owned by the user (designers and leads). */
export const forkScenario = validatedInputAction(
  z.object({ revisionId: z.string().uuid("revisionId must be a revision id"), title: storedText("title").max(200, "title: at most 200 characters").optional() }),
  async (data, user) => {
    const r = await forkRevision(user, data.revisionId, data.title);
    revalidatePath("/scenarios");
    return { ok: true as const, scenarioId: r.scenarioId };
  },
  { role: "designer", messages: { role: "Viewers cannot fork scenarios." } },
);

/** Soft delete or restore (owner or lead). */
export const setScenarioDeleted = validatedInputAction(
  z.object({ scenarioId: z.string().uuid("scenarioId must be a scenario id"), deleted: z.boolean("deleted must be true or false") }),
  async (data, user) => {
    if (data.deleted) await softDeleteScenario(user, data.scenarioId);
    else await restoreScenario(user, data.scenarioId);
    revalidatePath("/scenarios");
    return { ok: true as const };
  },
);

/** Any member, viewers included, comments on a scenario (optionally on one revision). */
export const commentOnScenario = validatedInputAction(
  z.object({
    scenarioId: z.string().uuid("scenarioId must be a scenario id"),
    revisionId: z.string().uuid("revisionId must be a revision id").optional(),
    body: storedText("comment").trim().min(1, "Write a comment first.").max(4000, "Comments are at most 4000 characters."),
  }),
  async (data, user) => {
    const c = await addComment(user, data.scenarioId, data);
    return { ok: true as const, id: c.id };
  },
);
