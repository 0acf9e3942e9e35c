import Link from "next/link";
import { AccountCard, AcceptInvitationForm, NewAccountFromInvitationForm } from "@/components/account/AccountForms";
import { findInvitationByToken } from "@/lib/db/teams";
import { findUserByEmail } from "@/lib/db/users";
import { sessionAccount } from "@/lib/auth/current";
import { acceptInvitationAction, acceptWithNewAccountAction } from "../../actions";

export const dynamic = "force-dynamic";
export const metadata = { title: "Invitation" };

export default async function InvitationPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const inv = await findInvitationByToken(token);
  if (!inv || inv.status !== "pending") {
    const why = !inv ? "This invitation link is not valid." : inv.status === "accepted" ? "This invitation has been used already." : `This invitation has ${inv.status === "expired" ? "expired" : "been withdrawn"}.`;
    return (
      <AccountCard title="Invitation">
        <p role="alert" className="text-sm">{why} Ask a lead of the team to invite you again.</p>
      </AccountCard>
    );
  }
  const me = await sessionAccount();
  const existing = await findUserByEmail(inv.email);
  const next = `/invitations/${encodeURIComponent(token)}`;
  return (
    <AccountCard title={`Join ${inv.teamName}`}>
      <p className="mb-4 text-sm text-ink-muted">
        You are invited as <span className="font-medium text-ink">{inv.role}</span>.
      </p>
      {me && me.email.toLowerCase() === inv.email.toLowerCase() ? (
        <AcceptInvitationForm action={acceptInvitationAction} token={token} label={`Join ${inv.teamName}`} />
      ) : me ? (
        <p role="alert" className="text-sm">
          This invitation was sent to another address than the one you are signed in with. Sign out, then open the link again.
        </p>
      ) : existing ? (
        <p className="text-sm">
          An account with this address exists: <Link className="text-signal underline" href={`/sign-in?next=${encodeURIComponent(next)}`}>sign in</Link> to accept.
        </p>
      ) : (
        <NewAccountFromInvitationForm action={acceptWithNewAccountAction} token={token} email={inv.email} />
      )}
    </AccountCard>
  );
}
