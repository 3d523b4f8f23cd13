import { getSubscriptionCampaign, setSubscription } from "@/db/queries/subscriptions";
import { getEnv } from "@/lib/env";
import { problemResponse, toResponse } from "@/lib/http/problem";
import { verifyUnsubscribeToken } from "@/lib/unsubscribe-token";

export const dynamic = "force-dynamic";

const MAX_BODY = 4096;

async function tokenOf(request: Request): Promise<string | null> {
  const fromQuery = new URL(request.url).searchParams.get("token");
  if (fromQuery) return fromQuery;
  if (Number(request.headers.get("content-length") ?? "0") > MAX_BODY) return null;
  const type = request.headers.get("content-type") ?? "";
  if (type.includes("application/x-www-form-urlencoded") || type.includes("multipart/form-data")) {
    // A body that does not parse as the form it claims to be carries no token.
    const form = await request.formData().catch(() => null);
    const value = form?.get("token");
    return typeof value === "string" ? value : null;
  }
  return null;
}

/**
 * Unsubscribes the person the signed token names from its campaign's alerts: the page's button and
 * one-click mail clients (RFC 8058 List-Unsubscribe-Post) both post here. No session needed; a
 * tampered or foreign token is refused.
 */
export async function POST(request: Request) {
  try {
    const token = await tokenOf(request);
    const claim = verifyUnsubscribeToken(token);
    const campaign = claim ? await getSubscriptionCampaign(claim.campaignId) : null;
    if (!claim || !campaign) {
      return problemResponse({
        type: "https://peeksafe.local/problems/invalid-token",
        title: "Invalid token",
        status: 400,
        detail: "The unsubscribe link is incomplete or was changed.",
      });
    }
    await setSubscription(claim.campaignId, claim.userId, false);
    if ((request.headers.get("accept") ?? "").includes("text/html")) {
      const done = new URL("/unsubscribe", getEnv().APP_URL);
      done.searchParams.set("token", token!);
      done.searchParams.set("done", "1");
      return Response.redirect(done, 303);
    }
    return Response.json({ unsubscribed: true, campaignId: claim.campaignId });
  } catch (error) {
    return toResponse(error, "/unsubscribe/confirm");
  }
}
