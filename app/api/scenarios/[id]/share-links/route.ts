import { apiRoute, json } from "@/lib/api/handler";
import { revokeShareLinkQuery, shareLinkBody } from "@/lib/api/schemas";
import { createPublicLink, listShareLinks, revokePublicLink } from "@/lib/db/shareLinks";
import { publicBaseUrl } from "@/lib/shared/tokens";

type P = { id: string };

/** GET /api/scenarios/:id/share-links — the public links and their state (every member may see them). */
export const GET = apiRoute<P>({}, async ({ user, params }) => ({ links: await listShareLinks(user, params.id) }));

/** POST /api/scenarios/:id/share-links — a public read-only link to a revision (owner or lead). The URL is shown once. */
export const POST = apiRoute<P, typeof shareLinkBody>({ role: "designer", body: shareLinkBody, maxBodyBytes: 4096 }, async ({ user, params, body }) => {
  const { link, token } = await createPublicLink(user, params.id, body);
  return json({ link, url: `${publicBaseUrl()}/share/p/${token}` }, 201);
});

/** DELETE /api/scenarios/:id/share-links?id=LINK — revoke a public link (owner or lead). */
export const DELETE = apiRoute<P, undefined, typeof revokeShareLinkQuery>({ role: "designer", query: revokeShareLinkQuery }, async ({ user, params, query }) => {
  await revokePublicLink(user, params.id, query.id);
  return new Response(null, { status: 204 });
});
