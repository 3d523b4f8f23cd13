import { and, asc, eq } from "drizzle-orm";
import { getDb } from "@/db";
import { members, organizations, users } from "@/db/schema";

export interface Membership {
  memberId: string;
  workspaceId: string;
  workspaceName: string;
  workspaceSlug: string;
  timeZone: string;
  role: string;
}

const membershipColumns = {
  memberId: members.id,
  workspaceId: organizations.id,
  workspaceName: organizations.name,
  workspaceSlug: organizations.slug,
  timeZone: organizations.timeZone,
  role: members.role,
};

function toMembership(row: Omit<Membership, "timeZone"> & { timeZone: string | null }): Membership {
  return { ...row, timeZone: row.timeZone ?? "UTC" };
}

/** The user's membership of one workspace, or null when the user is not a member. */
export async function getMembership(workspaceId: string, userId: string): Promise<Membership | null> {
  const rows = await getDb()
    .select(membershipColumns)
    .from(members)
    .innerJoin(organizations, eq(organizations.id, members.organizationId))
    .where(and(eq(members.organizationId, workspaceId), eq(members.userId, userId)))
    .limit(1);
  return rows[0] ? toMembership(rows[0]) : null;
}

/** Every workspace the user belongs to, oldest membership first. */
export async function listMemberships(userId: string): Promise<Membership[]> {
  const rows = await getDb()
    .select(membershipColumns)
    .from(members)
    .innerJoin(organizations, eq(organizations.id, members.organizationId))
    .where(eq(members.userId, userId))
    .orderBy(asc(members.createdAt));
  return rows.map(toMembership);
}

export interface MemberRow {
  memberId: string;
  userId: string;
  name: string;
  email: string;
  role: string;
  joinedAt: Date;
}

/** Members of a workspace with their public profile (never credentials). */
export async function listMembers(workspaceId: string): Promise<MemberRow[]> {
  return getDb()
    .select({
      memberId: members.id,
      userId: users.id,
      name: users.name,
      email: users.email,
      role: members.role,
      joinedAt: members.createdAt,
    })
    .from(members)
    .innerJoin(users, eq(users.id, members.userId))
    .where(eq(members.organizationId, workspaceId))
    .orderBy(asc(users.email));
}
