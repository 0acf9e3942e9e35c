import { z } from "zod";
import { apiRoute, ApiError } from "@/lib/api/handler";
import { getEntry } from "@/lib/db/library";
import { actionForStatus, changeEntryStatus, commentOnEntry } from "@/lib/library/workflow";
import { LIBRARY_STATUSES } from "@/lib/shared/statuses";
import { storedText } from "@/lib/shared/text";

type P = { id: string };

/** GET /api/library/:id — the entry with its revision body, history and evidence traces. */
export const GET = apiRoute<P>({}, async ({ user, params }) => getEntry(user, params.id));

const patchBody = z
  .object({
    /** Target status: validated (lead), draft = return with comments (lead), retired (lead). */
    status: z.enum(LIBRARY_STATUSES, { error: `status must be one of ${LIBRARY_STATUSES.join(", ")}` }).optional(),
    /** The submitter (or a lead) withdraws a submission. */
    withdraw: z.literal(true).optional(),
    comment: storedText("comment").max(4000, "comment: at most 4000 characters").optional(),
    /** Validating against a failed or missing comparison: the lead's written reason (required then). */
    overrideReason: storedText("overrideReason").max(4000, "overrideReason: at most 4000 characters").optional(),
  })
  .strict()
  .refine((b) => b.status !== undefined || b.withdraw || (b.comment ?? "").trim() !== "", {
    message: "Give a status, withdraw: true, or a comment",
    path: ["status"],
  });

/**
 * PATCH /api/library/:id — `{ status, comment?, overrideReason? }` changes the status (validating against failing
 * or missing evidence needs `overrideReason`) (validate, return and retire are for leads
 * only, checked in lib/library/workflow); `{ withdraw: true }` takes a submission back; `{ comment }` alone adds a comment
 * (any member).
 */
export const PATCH = apiRoute<P, typeof patchBody>({ body: patchBody }, async ({ user, params, body }) => {
  if (body.withdraw) return changeEntryStatus(user, params.id, "withdraw", body.comment ?? "");
  if (body.status) {
    const current = await getEntry(user, params.id);
    const action = actionForStatus(current.status, body.status);
    if (!action) {
      throw new ApiError(409, body.status === "submitted"
        ? "status: submit a revision with POST /api/library (traces and a note are needed)."
        : `status: an entry that is ${current.status} cannot become ${body.status}.`);
    }
    return changeEntryStatus(user, params.id, action, body.comment ?? "", body.overrideReason);
  }
  return commentOnEntry(user, params.id, body.comment ?? "");
});
