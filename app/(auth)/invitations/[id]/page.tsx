import type { Metadata } from "next";
import Link from "next/link";
import { z } from "zod";
import { SignOutButton } from "@/components/shell/sign-out-button";
import { CenteredCard } from "@/components/shell/centered-layout";
import { buttonClasses } from "@/components/ui/button";
import { Notice } from "@/components/ui/notice";
import { getInvitationSummary } from "@/db/queries/invitations";
import { getSession } from "@/lib/auth/session";
import { hasExpired } from "@/lib/members";
import { InvitationAnswer } from "./invitation-answer";

export const metadata: Metadata = { title: "Invitation" };

const idSchema = z.string().trim().min(1).max(100);

export default async function InvitationPage({ params }: { params: Promise<{ id: string }> }) {
  const parsed = idSchema.safeParse((await params).id);
  const invitation = parsed.success ? await getInvitationSummary(parsed.data) : null;
  if (!invitation) {
    return (
      <CenteredCard title="Invitation not found">
        <Notice tone="error">This invitation does not exist. Ask the person who invited you to send a new one.</Notice>
      </CenteredCard>
    );
  }

  const here = `/invitations/${invitation.id}`;
  const inviter = invitation.inviterName || invitation.inviterEmail;
  const expired = hasExpired(invitation.expiresAt);
  const summary = (
    <p className="text-sm text-tremor-content-emphasis dark:text-dark-tremor-content-emphasis">
      <strong>{inviter}</strong> invited <strong>{invitation.email}</strong> to the <strong>{invitation.workspaceName}</strong> workspace as{" "}
      <strong>{invitation.role}</strong>.
    </p>
  );

  if (invitation.status !== "pending" || expired) {
    const state = expired && invitation.status === "pending" ? "expired" : invitation.status === "accepted" ? "accepted already" : invitation.status;
    return (
      <CenteredCard title={`Join ${invitation.workspaceName}`}>
        <div className="space-y-4">
          {summary}
          <Notice tone="warning" title={`This invitation was ${state}`}>
            {invitation.status === "accepted" ? (
              <Link href="/campaigns" className="underline underline-offset-2">
                Open the workspace
              </Link>
            ) : (
              "Ask an admin of the workspace to invite you again."
            )}
          </Notice>
        </div>
      </CenteredCard>
    );
  }

  const session = await getSession();
  if (!session) {
    const next = encodeURIComponent(here);
    return (
      <CenteredCard title={`Join ${invitation.workspaceName}`}>
        <div className="space-y-5">
          {summary}
          <p className="text-sm text-tremor-content dark:text-dark-tremor-content">
            Sign in or create an account with <strong>{invitation.email}</strong> to accept.
          </p>
          <div className="flex flex-wrap gap-3">
            <Link href={`/sign-up?next=${next}&email=${encodeURIComponent(invitation.email)}`} className={buttonClasses("primary")}>
              Create an account
            </Link>
            <Link href={`/sign-in?next=${next}`} className={buttonClasses("secondary")}>
              Sign in
            </Link>
          </div>
        </div>
      </CenteredCard>
    );
  }

  if (session.user.email.toLowerCase() !== invitation.email.toLowerCase()) {
    return (
      <CenteredCard title={`Join ${invitation.workspaceName}`}>
        <div className="space-y-5">
          {summary}
          <Notice tone="warning" title="Signed in with another account">
            You are signed in as <strong>{session.user.email}</strong>, but this invitation is for <strong>{invitation.email}</strong>. Sign out, then
            sign in with the invited address.
          </Notice>
          <SignOutButton next={here} />
        </div>
      </CenteredCard>
    );
  }

  return (
    <CenteredCard title={`Join ${invitation.workspaceName}`}>
      <div className="space-y-5">
        {summary}
        <InvitationAnswer invitationId={invitation.id} workspaceId={invitation.workspaceId} workspaceName={invitation.workspaceName} />
      </div>
    </CenteredCard>
  );
}
