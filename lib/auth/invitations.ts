import "server-only";
import { createInvitation, INVITATION_TTL_MS, type Invitation } from "@/lib/db/teams";
import { sendMail } from "@/lib/mail/transport";
import { invitationMail } from "@/lib/mail/messages";
import { publicBaseUrl } from "@/lib/shared/tokens";
import type { CurrentUser, Role } from "@/lib/shared/roles";

/** A lead invites an address: the invitation is stored (token hashed) and the link e-mailed. */
export async function inviteMember(actor: CurrentUser, email: string, role: Role): Promise<{ invitation: Invitation; mailSent: boolean }> {
  const { invitation, token } = await createInvitation(actor, email, role);
  const link = `${publicBaseUrl()}/invitations/${encodeURIComponent(token)}`;
  try {
    await sendMail(
      invitationMail({ to: invitation.email, teamName: actor.teamName, inviterName: actor.name, role, link, expiresAt: new Date(Date.now() + INVITATION_TTL_MS) }),
    );
    return { invitation, mailSent: true };
  } catch (e) {
    console.error("[mail] invitation could not be sent:", e instanceof Error ? e.message : e);
    return { invitation, mailSent: false };
  }
}
