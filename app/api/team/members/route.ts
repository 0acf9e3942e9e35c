import { apiRoute } from "@/lib/api/handler";
import { memberDeleteQuery, memberPatchBody } from "@/lib/api/schemas";
import { changeRole, listMembers, removeMember } from "@/lib/db/teams";
import type { Role } from "@/lib/shared/roles";

/** GET /api/team/members — the current team's members and roles (every member). */
export const GET = apiRoute({}, async ({ user }) => ({ team: { id: user.teamId, name: user.teamName }, me: { id: user.id, role: user.role }, members: await listMembers(user.teamId) }));

/** PATCH /api/team/members — `{ userId, role }` (leads). */
export const PATCH = apiRoute<Record<string, never>, typeof memberPatchBody>({ role: "lead", body: memberPatchBody, maxBodyBytes: 4096 }, async ({ user, body }) =>
  changeRole(user, body.userId, body.role as Role),
);

/** DELETE /api/team/members?userId=ID — remove a member (leads; never the last lead). */
export const DELETE = apiRoute<Record<string, never>, undefined, typeof memberDeleteQuery>({ role: "lead", query: memberDeleteQuery }, async ({ user, query }) => {
  await removeMember(user, query.userId);
  return new Response(null, { status: 204 });
});
