"use server";

import { revalidatePath } from "next/cache";
import { headers } from "next/headers";
import { z, type ZodType } from "zod";
import { listMembers } from "@/db/queries/members";
import { createWorkspaceApiKey, revokeWorkspaceApiKey, type CreatedApiKey } from "@/lib/api-keys";
import type { Permission } from "@/lib/auth/permissions";
import { getAuth } from "@/lib/auth/server";
import { requireRole, type WorkspaceContext } from "@/lib/auth/session";
import { listPendingInvitations } from "@/lib/members";
import { DomainError, ForbiddenError, NotFoundError } from "@/lib/errors";
import { createApiKeySchema } from "@/lib/validation/api-keys";
import {
  cancelInvitationSchema,
  inviteMemberSchema,
  removeMemberSchema,
  revokeApiKeySchema,
  updateMemberRoleSchema,
} from "@/lib/validation/members";
import { updateWorkspaceSchema } from "@/lib/validation/workspace";

export type ActionResult<T> = { ok: true; data: T } | { ok: false; error: string; fieldErrors?: Record<string, string[] | undefined> };

const AUTH_MESSAGES: Record<string, string> = {
  USER_IS_ALREADY_A_MEMBER_OF_THIS_ORGANIZATION: "This person is a member of the workspace already.",
  USER_IS_ALREADY_INVITED_TO_THIS_ORGANIZATION: "This address has a pending invitation already.",
  YOU_CANNOT_LEAVE_THE_ORGANIZATION_AS_THE_ONLY_OWNER: "A workspace needs at least one admin: make someone else admin first.",
  YOU_CANNOT_LEAVE_THE_ORGANIZATION_WITHOUT_AN_OWNER: "A workspace needs at least one admin: make someone else admin first.",
  MEMBER_NOT_FOUND: "No such member in this workspace.",
  INVITATION_NOT_FOUND: "No such invitation in this workspace.",
};

function messageOf(error: unknown): string {
  if (error instanceof DomainError) return error.message;
  // better-auth's APIError may come from another bundled copy of the class, so match its shape.
  const auth = error as { body?: { code?: string }; statusCode?: number };
  const code = auth?.body?.code;
  if (code && AUTH_MESSAGES[code]) return AUTH_MESSAGES[code];
  if (auth?.statusCode === 403) return "Your role does not allow this.";
  console.error("settings action failed", error);
  return "Something went wrong. Try again.";
}

/** session → role → zod → run → revalidate, with every failure returned as words. */
async function runGuarded<S extends ZodType, T>(
  permission: Permission,
  schema: S,
  input: unknown,
  run: (context: WorkspaceContext, data: z.output<S>) => Promise<T>,
): Promise<ActionResult<T>> {
  let context: WorkspaceContext;
  try {
    context = await requireRole(permission); // redirects to sign-in when signed out
  } catch (error) {
    if (error instanceof ForbiddenError) return { ok: false, error: "Your role does not allow this: only admins manage members, keys and workspace settings." };
    throw error;
  }
  const parsed = schema.safeParse(input);
  if (!parsed.success) {
    return { ok: false, error: "Check the highlighted fields.", fieldErrors: z.flattenError(parsed.error).fieldErrors as Record<string, string[]> };
  }
  try {
    const data = await run(context, parsed.data);
    revalidatePath("/settings");
    return { ok: true, data };
  } catch (error) {
    return { ok: false, error: messageOf(error) };
  }
}

async function requireMemberOfWorkspace(workspaceId: string, memberId: string) {
  const member = (await listMembers(workspaceId)).find((entry) => entry.memberId === memberId);
  if (!member) throw new NotFoundError("No such member in this workspace.");
  return member;
}

export async function inviteMemberAction(input: unknown): Promise<ActionResult<{ email: string }>> {
  return runGuarded({ invitation: ["create"] }, inviteMemberSchema, input, async ({ membership }, data) => {
    await getAuth().api.createInvitation({
      body: { email: data.email, role: data.role, organizationId: membership.workspaceId },
      headers: await headers(),
    });
    return { email: data.email };
  });
}

export async function cancelInvitationAction(input: unknown): Promise<ActionResult<null>> {
  return runGuarded({ invitation: ["cancel"] }, cancelInvitationSchema, input, async ({ membership }, data) => {
    const requestHeaders = await headers();
    const pending = await listPendingInvitations(membership.workspaceId, requestHeaders);
    if (!pending.some((invitation) => invitation.id === data.invitationId)) throw new NotFoundError("No such invitation in this workspace.");
    await getAuth().api.cancelInvitation({ body: { invitationId: data.invitationId }, headers: requestHeaders });
    return null;
  });
}

export async function updateMemberRoleAction(input: unknown): Promise<ActionResult<{ role: string }>> {
  return runGuarded({ member: ["update"] }, updateMemberRoleSchema, input, async ({ membership }, data) => {
    await requireMemberOfWorkspace(membership.workspaceId, data.memberId);
    await getAuth().api.updateMemberRole({
      body: { memberId: data.memberId, role: data.role, organizationId: membership.workspaceId },
      headers: await headers(),
    });
    return { role: data.role };
  });
}

export async function removeMemberAction(input: unknown): Promise<ActionResult<null>> {
  return runGuarded({ member: ["delete"] }, removeMemberSchema, input, async ({ membership, session }, data) => {
    const members = await listMembers(membership.workspaceId);
    const target = members.find((entry) => entry.memberId === data.memberId);
    if (!target) throw new NotFoundError("No such member in this workspace.");
    const admins = members.filter((entry) => entry.role === "admin");
    if (target.role === "admin" && admins.length <= 1) {
      throw new ForbiddenError(
        target.userId === session.user.id
          ? "You are the last admin: make someone else admin before you leave."
          : "A workspace needs at least one admin.",
      );
    }
    await getAuth().api.removeMember({
      body: { memberIdOrEmail: data.memberId, organizationId: membership.workspaceId },
      headers: await headers(),
    });
    return null;
  });
}

export async function createApiKeyAction(input: unknown): Promise<ActionResult<CreatedApiKey>> {
  return runGuarded({ apiKey: ["create"] }, createApiKeySchema, input, async ({ membership, session }, data) =>
    createWorkspaceApiKey({ workspaceId: membership.workspaceId, userId: session.user.id, data }),
  );
}

export async function revokeApiKeyAction(input: unknown): Promise<ActionResult<null>> {
  return runGuarded({ apiKey: ["delete"] }, revokeApiKeySchema, input, async ({ membership, session }, data) => {
    await revokeWorkspaceApiKey({ workspaceId: membership.workspaceId, userId: session.user.id, keyId: data.keyId });
    return null;
  });
}

export async function updateWorkspaceAction(input: unknown): Promise<ActionResult<{ name: string; timeZone: string }>> {
  return runGuarded({ organization: ["update"] }, updateWorkspaceSchema, input, async ({ membership }, data) => {
    await getAuth().api.updateOrganization({
      body: { data: { name: data.name, timeZone: data.timeZone }, organizationId: membership.workspaceId },
      headers: await headers(),
    });
    return data;
  });
}
