import { eq } from "drizzle-orm";
import { getDb } from "@/db";
import { invitations, organizations, users } from "@/db/schema";

/** What an invitation page shows: who invited which address to which workspace with which role. */
export interface InvitationSummary {
  id: string;
  email: string;
  role: string;
  status: string;
  expiresAt: Date;
  workspaceId: string;
  workspaceName: string;
  inviterName: string;
  inviterEmail: string;
}

/** One invitation by its id (an unguessable UUID that travels only in the invitation mail), or null. */
export async function getInvitationSummary(invitationId: string): Promise<InvitationSummary | null> {
  const rows = await getDb()
    .select({
      id: invitations.id,
      email: invitations.email,
      role: invitations.role,
      status: invitations.status,
      expiresAt: invitations.expiresAt,
      workspaceId: organizations.id,
      workspaceName: organizations.name,
      inviterName: users.name,
      inviterEmail: users.email,
    })
    .from(invitations)
    .innerJoin(organizations, eq(organizations.id, invitations.organizationId))
    .innerJoin(users, eq(users.id, invitations.inviterId))
    .where(eq(invitations.id, invitationId))
    .limit(1);
  const row = rows[0];
  return row ? { ...row, role: row.role ?? "viewer" } : null;
}
