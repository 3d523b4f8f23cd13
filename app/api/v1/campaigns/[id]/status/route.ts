import { createHash } from "node:crypto";
import { getStatusSource } from "@/db/queries/status";
import { authorizeRequest } from "@/lib/auth/guard";
import { statusFromStored } from "@/lib/campaigns/campaign-status";
import { NotFoundError } from "@/lib/errors";
import { toResponse } from "@/lib/http/problem";
import { campaignReferenceSchema } from "@/lib/validation/campaigns";

export const dynamic = "force-dynamic";

// Polls revalidate every time (no-cache) but get a bodiless 304 while the answer is unchanged.
const CACHE_CONTROL = "private, no-cache";

function etagMatches(header: string | null, etag: string): boolean {
  if (!header) return false;
  return header.split(",").some((candidate) => candidate.trim().replace(/^W\//, "") === etag || candidate.trim() === "*");
}

export async function GET(request: Request, context: { params: Promise<{ id: string }> }) {
  const instance = new URL(request.url).pathname;
  try {
    const caller = await authorizeRequest(request, { campaign: ["read"] }, { allowKey: true });
    const source = await getStatusSource(caller.workspaceId, campaignReferenceSchema.parse((await context.params).id));
    if (!source) throw new NotFoundError("No such campaign in this workspace.");
    const body = JSON.stringify(statusFromStored(source.campaign, source.stored));
    const etag = `"${createHash("sha256").update(body).digest("base64url").slice(0, 27)}"`;
    const headers = { "cache-control": CACHE_CONTROL, etag, vary: "authorization, x-api-key, cookie" };
    if (etagMatches(request.headers.get("if-none-match"), etag)) return new Response(null, { status: 304, headers });
    return new Response(body, { headers: { ...headers, "content-type": "application/json" } });
  } catch (error) {
    return toResponse(error, instance);
  }
}
