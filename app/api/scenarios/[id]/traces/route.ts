import { z } from "zod";
import { apiRoute, ApiError, json } from "@/lib/api/handler";
import { listTraces, storeTrace } from "@/lib/db/traces";
import { readTraceUpload, MAX_UPLOAD_BYTES } from "@/lib/api/traceUpload";

type P = { id: string };

const query = z.object({ revisionId: z.string().uuid("revisionId: not a revision id").optional() });

/** GET /api/scenarios/:id/traces?revisionId= — the scenario's bench traces (no samples). */
export const GET = apiRoute<P, undefined, typeof query>({ query }, async ({ user, params, query }) => ({
  traces: await listTraces(user, params.id, { revisionId: query.revisionId }),
}));

/**
 * POST /api/scenarios/:id/traces — multipart upload: `file` (CSV), `label`, `revisionId?`, `options` (JSON: time
 * unit and per-channel unit/scale/name), `settings` (JSON: instrument settings as entered). A file that cannot be
 * read is answered 400 naming the line and the problem, and nothing is stored; too big a request is 413.
 */
export const POST = apiRoute<P>({ role: "designer" }, async ({ user, params, req }) => {
  const declared = Number(req.headers.get("content-length") ?? "NaN");
  if (Number.isFinite(declared) && declared > MAX_UPLOAD_BYTES) {
    throw new ApiError(413, `The upload is ${(declared / 1048576).toFixed(1)} MB; the limit is ${(MAX_UPLOAD_BYTES / 1048576).toFixed(0)} MB.`);
  }
  const upload = await readTraceUpload(req);
  if (!upload.ok) return json({ error: upload.error, ...(upload.problems ? { problems: upload.problems } : {}), ...(upload.fieldErrors ? { fieldErrors: upload.fieldErrors } : {}) }, upload.status);
  const saved = await storeTrace(user, {
    scenarioId: params.id,
    revisionId: upload.revisionId,
    label: upload.label,
    fileName: upload.fileName,
    parsed: upload.parsed,
    settings: { ...upload.settings, parse: upload.options },
  });
  return json({ ...saved, warnings: upload.parsed.warnings }, 201);
});
