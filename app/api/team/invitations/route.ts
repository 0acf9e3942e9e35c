import { apiRoute, json } from "@/lib/api/handler";
import { invitationBody, invitationDeleteQuery } from "@/lib/api/schemas";
import { listInvitations, revokeInvitation } from "@/lib/db/teams";
import { inviteMember } from "@/lib/auth/invitations";

/** GET /api/team/invitations — the team's invitations and their state (leads). */
export const GET = apiRoute({ role: "lead" }, async ({ user }) => ({ invitations: await listInvitations(user.teamId) }));

/** POST /api/team/invitations — `{ email, role }`: stores the invitation and e-mails its link (leads). */
export const POST = apiRoute<Record<string, never>, typeof invitationBody>({ role: "lead", body: invitationBody, maxBodyBytes: 4096 }, async ({ user, body }) =>
  json(await inviteMember(user, body.email, body.role), 201),
);

/** DELETE /api/team/invitations?id=ID — withdraw a pending invitation (leads). */
export const DELETE = apiRoute<Record<string, never>, undefined, typeof invitationDeleteQuery>({ role: "lead", query: invitationDeleteQuery }, async ({ user, query }) => {
  await revokeInvitation(user, query.id);
  return new Response(null, { status: 204 });
});
