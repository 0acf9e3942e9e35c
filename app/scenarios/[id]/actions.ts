"use server";
import { z } from "zod";
import { revalidatePath } from "next/cache";
import { currentUser } from "@/lib/auth/current";
import { roleAtLeast } from "@/lib/auth/roles";
import { saveRevision, forkRevision, type SaveResult } from "@/lib/db/revisions";
import { softDeleteScenario, restoreScenario } from "@/lib/db/scenarios";
import { addComment } from "@/lib/db/comments";
import { DomainError } from "@/lib/db/errors";
import { storedText } from "@/lib/api/text";
import { DATABASE_UNAVAILABLE, isDatabaseUnavailable } from "@/lib/db/outage";

const saveInput = z.object({
  scenarioId: z.string().uuid("scenarioId must be a scenario id"),
  baseRevisionId: z.string().uuid("baseRevisionId must be a revision id"),
  note: storedText("note").max(2000, "note: at most 2000 characters"),
  body: z.unknown(),
});

function refusal(e: unknown): { ok: false; message: string; retry?: true } {
  if (e instanceof DomainError) return { ok: false, message: e.message };
  // An outage: nothing was saved, and the same request can be sent again once the database is back.
  if (isDatabaseUnavailable(e)) return { ok: false, message: DATABASE_UNAVAILABLE, retry: true };
  throw e;
}

/**
 * Saves the workbench's scenario as a new immutable revision with a note. A stale base revision is refused with
 * the current revision (number, body, author, time) so both versions can be shown; nothing is overwritten.
 */
export async function saveScenarioRevision(input: { scenarioId: string; baseRevisionId: string; note: string; body: unknown }): Promise<
  | { ok: true; revisionId: string; number: number }
  | { ok: false; conflict?: { current: { revisionId: string; number: number; body: unknown; author: string; createdAt: string } }; message: string; retry?: true }
> {
  const user = await currentUser().catch((e: unknown) => {
    if (isDatabaseUnavailable(e)) return "unavailable" as const;
    throw e;
  });
  if (user === "unavailable") return { ok: false, message: DATABASE_UNAVAILABLE, retry: true };
  if (!user) return { ok: false, message: "Your session has ended: sign in again to save." };
  if (!roleAtLeast(user.role, "designer")) return { ok: false, message: "Viewers cannot save scenarios." };
  const parsed = saveInput.safeParse(input);
  if (!parsed.success) return { ok: false, message: parsed.error.issues.map((i) => i.message).join("; ") };
  try {
    const r: SaveResult = await saveRevision(user, parsed.data);
    if (r.ok) revalidatePath(`/scenarios/${parsed.data.scenarioId}`);
    return r;
  } catch (e) {
    return refusal(e);
  }
}

/** Copies a revision into a new scenario owned by the user (designers and leads). */
export async function forkScenario(input: { revisionId: string; title?: string }): Promise<{ ok: true; scenarioId: string } | { ok: false; message: string }> {
  const user = await currentUser();
  if (!user) return { ok: false, message: "Your session has ended: sign in again." };
  if (!roleAtLeast(user.role, "designer")) return { ok: false, message: "Viewers cannot fork scenarios." };
  const parsed = z.object({ revisionId: z.string().uuid("revisionId must be a revision id"), title: storedText("title").max(200, "title: at most 200 characters").optional() }).safeParse(input);
  if (!parsed.success) return { ok: false, message: parsed.error.issues.map((i) => i.message).join("; ") };
  try {
    const r = await forkRevision(user, parsed.data.revisionId, parsed.data.title);
    revalidatePath("/scenarios");
    return { ok: true, scenarioId: r.scenarioId };
  } catch (e) {
    return refusal(e);
  }
}

/** Soft delete or restore (owner or lead). */
export async function setScenarioDeleted(input: { scenarioId: string; deleted: boolean }): Promise<{ ok: true } | { ok: false; message: string }> {
  const user = await currentUser();
  if (!user) return { ok: false, message: "Your session has ended: sign in again." };
  const parsed = z.object({ scenarioId: z.string().uuid(), deleted: z.boolean() }).safeParse(input);
  if (!parsed.success) return { ok: false, message: "scenarioId must be a scenario id" };
  try {
    if (parsed.data.deleted) await softDeleteScenario(user, parsed.data.scenarioId);
    else await restoreScenario(user, parsed.data.scenarioId);
    revalidatePath("/scenarios");
    return { ok: true };
  } catch (e) {
    return refusal(e);
  }
}

/** Any member, viewers included, comments on a scenario (optionally on one revision). */
export async function commentOnScenario(input: { scenarioId: string; revisionId?: string; body: string }): Promise<{ ok: true; id: string } | { ok: false; message: string }> {
  const user = await currentUser();
  if (!user) return { ok: false, message: "Your session has ended: sign in again." };
  const parsed = z
    .object({ scenarioId: z.string().uuid(), revisionId: z.string().uuid().optional(), body: storedText("comment").trim().min(1, "Write a comment first.").max(4000, "Comments are at most 4000 characters.") })
    .safeParse(input);
  if (!parsed.success) return { ok: false, message: parsed.error.issues.map((i) => i.message).join("; ") };
  try {
    const c = await addComment(user, parsed.data.scenarioId, parsed.data);
    return { ok: true, id: c.id };
  } catch (e) {
    return refusal(e);
  }
}
