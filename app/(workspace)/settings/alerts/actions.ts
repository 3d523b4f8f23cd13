"use server";

import { revalidatePath } from "next/cache";
import { z } from "zod";
import { updateAlertRule, type AlertRuleSettings } from "@/db/queries/alert-rules";
import { requireRole, type WorkspaceContext } from "@/lib/auth/session";
import { ForbiddenError } from "@/lib/errors";
import { updateAlertRuleSchema } from "@/lib/validation/alert-rules";

export type ActionResult<T> = { ok: true; data: T } | { ok: false; error: string; fieldErrors?: Record<string, string[] | undefined> };

/** Saves the workspace's alert rules (admins and leads): session → role → zod → query → revalidate. */
export async function updateAlertRuleAction(input: unknown): Promise<ActionResult<AlertRuleSettings>> {
  let context: WorkspaceContext;
  try {
    context = await requireRole({ alertRule: ["update"] }); // redirects to sign-in when signed out
  } catch (error) {
    if (error instanceof ForbiddenError) return { ok: false, error: "Your role does not allow this: only admins and leads change the alert rules." };
    throw error;
  }
  const parsed = updateAlertRuleSchema.safeParse(input);
  if (!parsed.success) {
    return { ok: false, error: "Check the highlighted fields.", fieldErrors: z.flattenError(parsed.error).fieldErrors as Record<string, string[]> };
  }
  try {
    const data = await updateAlertRule({ workspaceId: context.membership.workspaceId, ...parsed.data });
    revalidatePath("/settings/alerts");
    return { ok: true, data };
  } catch (error) {
    console.error("alert rules not saved", error);
    return { ok: false, error: "Something went wrong. Try again." };
  }
}
