"use server";
import { z } from "zod";
import { revalidatePath } from "next/cache";
import { validatedInputAction } from "@/lib/auth/action";
import { openPublicLink } from "@/lib/db/shareLinks";
import { createScenario } from "@/lib/scenarios/save";
import { DomainError } from "@/lib/errors";

/**
 * "Open a copy": a signed-in designer or lead copies the revision behind a public link into a new scenario of their
 * own team (the link is checked again: an expired or revoked one copies nothing).
 */
export const copySharedRevision = validatedInputAction(
  z.object({ token: z.string().min(1, "The link is incomplete.").max(200, "The link is too long.") }),
  async (data, user) => {
    const link = await openPublicLink(data.token);
    if (link.state !== "active") throw new DomainError(404, "This link has expired or was revoked.");
    const r = link.revision;
    const created = await createScenario(user, {
      title: `${r.scenarioTitle} (copy)`.slice(0, 200),
      template: r.template,
      body: r.body,
      note: `Copied from a shared link to “${r.scenarioTitle}” revision ${r.number}`,
    });
    revalidatePath("/scenarios");
    return { ok: true as const, scenarioId: created.id };
  },
  { role: "designer", messages: { session: "Sign in to open a copy.", role: "Viewers cannot create scenarios." } },
);
