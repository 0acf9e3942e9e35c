import { apiRoute, json } from "@/lib/api/handler";
import { commentBody } from "@/lib/api/schemas";
import { addComment, listComments } from "@/lib/db/comments";

type P = { id: string };

/** GET /api/scenarios/:id/comments — every member. */
export const GET = apiRoute<P>({}, async ({ user, params }) => ({ comments: await listComments(user, params.id) }));

/** POST /api/scenarios/:id/comments — every member, viewers included. */
export const POST = apiRoute<P, typeof commentBody>({ body: commentBody, maxBodyBytes: 16 * 1024 }, async ({ user, params, body }) =>
  json(await addComment(user, params.id, body), 201),
);
