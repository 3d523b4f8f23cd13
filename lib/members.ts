import { getAuth } from "@/lib/auth/server";

export interface PendingInvitation {
  id: string;
  email: string;
  role: string;
  expiresAt: Date;
}

/** True when `expiresAt` lies in the past (an invitation that can no longer be accepted). */
export function hasExpired(expiresAt: Date, now: Date = new Date()): boolean {
  return expiresAt.getTime() <= now.getTime();
}

/** The workspace's invitations still waiting for an answer (pending and not expired), soonest to expire first. */
export async function listPendingInvitations(workspaceId: string, requestHeaders: Headers): Promise<PendingInvitation[]> {
  const all = await getAuth().api.listInvitations({ query: { organizationId: workspaceId }, headers: requestHeaders });
  return all
    .map((invitation) => ({ id: invitation.id, email: invitation.email, role: invitation.role ?? "viewer", status: invitation.status, expiresAt: new Date(invitation.expiresAt) }))
    .filter((invitation) => invitation.status === "pending" && !hasExpired(invitation.expiresAt))
    .sort((a, b) => a.expiresAt.getTime() - b.expiresAt.getTime())
    .map(({ id, email, role, expiresAt }) => ({ id, email, role, expiresAt }));
}
