import { headers } from "next/headers";
import { forbidden, redirect } from "next/navigation";
import { cache } from "react";
import { getMembership, listMemberships, type Membership } from "@/db/queries/members";
import { ForbiddenError } from "@/lib/errors";
import { roleAllows, type Permission } from "./permissions";
import { getAuth } from "./server";

/** The signed-in session of this request, or null (cached per request). */
export const getSession = cache(async () => {
  return getAuth().api.getSession({ headers: await headers() });
});

export type SignedIn = NonNullable<Awaited<ReturnType<typeof getSession>>>;

/** The signed-in user; redirects to sign-in for pages. */
export async function requireUser(): Promise<SignedIn> {
  const session = await getSession();
  if (!session) redirect("/sign-in");
  return session;
}

export interface WorkspaceContext {
  session: SignedIn;
  membership: Membership;
}

/** The user's active workspace (or first one); redirects to onboarding when there is none. */
export const requireWorkspace = cache(async (): Promise<WorkspaceContext> => {
  const session = await requireUser();
  const activeId = session.session.activeOrganizationId;
  let membership = activeId ? await getMembership(activeId, session.user.id) : null;
  if (!membership) membership = (await listMemberships(session.user.id))[0] ?? null;
  if (!membership) redirect("/workspaces/new");
  return { session, membership };
});

/** Throws ForbiddenError unless the active workspace role grants `permission` (server actions and pages). */
export async function requireRole(permission: Permission): Promise<WorkspaceContext> {
  const context = await requireWorkspace();
  if (!roleAllows(context.membership.role, permission)) throw new ForbiddenError();
  return context;
}

/** For pages: renders the "not for your role" screen (app/forbidden.tsx) unless the role grants `permission`. */
export async function requirePageRole(permission: Permission): Promise<WorkspaceContext> {
  const context = await requireWorkspace();
  if (!roleAllows(context.membership.role, permission)) forbidden();
  return context;
}
