import { getCampaign } from "@/db/queries/campaigns";
import { getSubscriptionState, setSubscription } from "@/db/queries/subscriptions";
import { authorizeRequest } from "@/lib/auth/guard";
import { NotFoundError, UnauthorizedError } from "@/lib/errors";
import { toResponse } from "@/lib/http/problem";
import { campaignReferenceSchema } from "@/lib/validation/campaigns";

export const dynamic = "force-dynamic";

type Context = { params: Promise<{ id: string }> };

/** The signed-in member and the campaign of the URL (in their active workspace). */
async function resolve(request: Request, context: Context) {
  const caller = await authorizeRequest(request, { subscription: ["self"] });
  if (caller.kind !== "user") throw new UnauthorizedError("Sign in to manage your own alerts.");
  const campaign = await getCampaign(caller.workspaceId, campaignReferenceSchema.parse((await context.params).id));
  if (!campaign) throw new NotFoundError("No such campaign in this workspace.");
  return { caller, campaignId: campaign.id };
}

async function answer(workspaceId: string, campaignId: string, userId: string): Promise<Response> {
  const state = await getSubscriptionState(workspaceId, campaignId, userId);
  if (!state) throw new NotFoundError("No such campaign in this workspace.");
  return Response.json(state, { headers: { "cache-control": "no-store" } });
}

/** Whether the signed-in member gets this campaign's alerts, and why. */
export async function GET(request: Request, context: Context) {
  try {
    const { caller, campaignId } = await resolve(request, context);
    return await answer(caller.workspaceId, campaignId, caller.userId);
  } catch (error) {
    return toResponse(error, new URL(request.url).pathname);
  }
}

/** Subscribes the signed-in member to this campaign's alerts. */
export async function PUT(request: Request, context: Context) {
  try {
    const { caller, campaignId } = await resolve(request, context);
    await setSubscription(campaignId, caller.userId, true);
    return await answer(caller.workspaceId, campaignId, caller.userId);
  } catch (error) {
    return toResponse(error, new URL(request.url).pathname);
  }
}

/** Unsubscribes the signed-in member (also from alerts they would get as creator or default recipient). */
export async function DELETE(request: Request, context: Context) {
  try {
    const { caller, campaignId } = await resolve(request, context);
    await setSubscription(campaignId, caller.userId, false);
    return await answer(caller.workspaceId, campaignId, caller.userId);
  } catch (error) {
    return toResponse(error, new URL(request.url).pathname);
  }
}
