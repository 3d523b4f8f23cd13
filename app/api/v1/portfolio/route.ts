import { listPortfolio } from "@/db/queries/portfolio";
import { authorizeRequest } from "@/lib/auth/guard";
import { toResponse } from "@/lib/http/problem";

export const dynamic = "force-dynamic";

/** Every campaign of the workspace with its call and latest statistics (the portfolio polls this). */
export async function GET(request: Request) {
  try {
    const caller = await authorizeRequest(request, { campaign: ["read"] }, { allowKey: true });
    return Response.json({ campaigns: await listPortfolio(caller.workspaceId) }, { headers: { "cache-control": "no-store" } });
  } catch (error) {
    return toResponse(error, "/api/v1/portfolio");
  }
}
