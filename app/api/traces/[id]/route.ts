import { z } from "zod";
import { apiRoute } from "@/lib/api/handler";
import { correctTraceChannel, deleteTrace, getTrace } from "@/lib/db/traces";
import { CHANNEL_SOURCE_UNITS, channelSettings } from "@/lib/traces/units";

type P = { id: string };

/** GET /api/traces/:id — the trace's metadata and samples: `time` in s, each channel's `values` in its unit. */
export const GET = apiRoute<P>({}, async ({ user, params }) => {
  const t = await getTrace(user, params.id);
  const { time, values, ...meta } = t;
  return {
    ...meta,
    time: Array.from(time),
    channels: meta.channels.map((c, i) => ({ ...c, values: Array.from(values[i]) })),
  };
});

const patchBody = z
  .object({
    /** Channel index, 0 = the first column after time. */
    channel: z.number({ error: "channel must be a number" }).int("channel must be a whole number").min(0, "channel must be 0 or more"),
    /** What the file's numbers are in ("" = no unit, as written). */
    sourceUnit: z.enum(CHANNEL_SOURCE_UNITS, { error: `sourceUnit must be one of ${CHANNEL_SOURCE_UNITS.filter(Boolean).join(", ")} or empty` }),
    /** Probe factor or 1/R of a sense resistor, applied after the unit prefix. */
    scale: z.number({ error: "scale must be a number" }).finite("scale must be finite").refine((x) => x !== 0, "scale must not be zero").default(1),
    /** Unit after scaling; the source unit's base when absent. */
    unit: z.enum(["A", "V"], { error: "unit must be A or V" }).optional(),
  })
  .strict();

/**
 * PATCH /api/traces/:id — correct a channel's unit and scale without uploading again (designers and leads): a new
 * version of the trace's channel settings, audited; refused (409) while the trace is evidence under review or validated.
 */
export const PATCH = apiRoute<P, typeof patchBody>({ role: "designer", body: patchBody }, async ({ user, params, body }) =>
  correctTraceChannel(user, params.id, body.channel, channelSettings(body.sourceUnit, body.scale, body.unit)),
);

/** DELETE /api/traces/:id — the uploader or a lead; refused (409) while the trace is evidence under review or validated. */
export const DELETE = apiRoute<P>({ role: "designer" }, async ({ user, params }) => {
  await deleteTrace(user, params.id);
  return new Response(null, { status: 204 });
});
