"use server";

import { revalidatePath } from "next/cache";
import { z } from "zod";
import type { CampaignDto } from "@/db/queries/campaigns";
import { requireRole } from "@/lib/auth/session";
import { changeCampaign } from "@/lib/campaigns/change-campaign";
import { registerCampaign } from "@/lib/campaigns/create-campaign";
import { DomainError, ValidationError } from "@/lib/errors";
import { campaignStatusSchema, createCampaignSchema } from "@/lib/validation/campaigns";

export type ActionResult<T> = { ok: true; data: T } | { ok: false; error: string; fieldErrors?: Record<string, string[]> };

function failure(error: unknown): ActionResult<never> {
  if (error instanceof ValidationError) {
    const fieldErrors: Record<string, string[]> = {};
    for (const problem of error.errors) (fieldErrors[problem.pointer.replace(/^\//, "").replaceAll("/", ".")] ??= []).push(problem.message);
    return { ok: false, error: error.message, fieldErrors };
  }
  if (error instanceof DomainError) return { ok: false, error: error.message };
  throw error;
}

/** Registers a campaign from the plan form (marketer or admin); the same schema as POST /api/v1/campaigns. */
export async function createCampaignAction(input: unknown): Promise<ActionResult<Pick<CampaignDto, "id" | "slug">>> {
  try {
    const { session, membership } = await requireRole({ campaign: ["create"] });
    const parsed = createCampaignSchema.safeParse(input);
    if (!parsed.success) {
      const flat = z.flattenError(parsed.error);
      return { ok: false, error: "Check the highlighted fields.", fieldErrors: flat.fieldErrors as Record<string, string[]> };
    }
    const campaign = await registerCampaign(membership.workspaceId, session.user.id, parsed.data);
    revalidatePath("/campaigns");
    return { ok: true, data: { id: campaign.id, slug: campaign.slug } };
  } catch (error) {
    return failure(error);
  }
}

/** Moves a campaign through its lifecycle (marketer or admin). */
export async function moveCampaignAction(campaignId: string, status: unknown): Promise<ActionResult<{ status: string }>> {
  try {
    const { session, membership } = await requireRole({ campaign: ["lifecycle"] });
    const parsed = campaignStatusSchema.safeParse(status);
    if (!parsed.success) return { ok: false, error: "Unknown status." };
    const campaign = await changeCampaign(membership.workspaceId, z.string().min(1).parse(campaignId), { userId: session.user.id, role: membership.role }, { status: parsed.data });
    revalidatePath(`/campaigns/${campaign.id}`);
    revalidatePath("/campaigns");
    return { ok: true, data: { status: campaign.status } };
  } catch (error) {
    return failure(error);
  }
}
