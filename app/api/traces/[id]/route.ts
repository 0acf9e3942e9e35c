import { apiRoute } from "@/lib/api/handler";
import { deleteTrace, getTrace } from "@/lib/db/traces";

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

/** DELETE /api/traces/:id — the uploader or a lead; refused (409) while the trace is evidence under review or validated. */
export const DELETE = apiRoute<P>({ role: "designer" }, async ({ user, params }) => {
  await deleteTrace(user, params.id);
  return new Response(null, { status: 204 });
});
