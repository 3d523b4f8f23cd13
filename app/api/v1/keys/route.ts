import { createWorkspaceApiKey, listWorkspaceApiKeys } from "@/lib/api-keys";
import { authorizeRequest } from "@/lib/auth/guard";
import { UnauthorizedError } from "@/lib/errors";
import { readJson, toResponse } from "@/lib/http/problem";
import { createApiKeySchema } from "@/lib/validation/api-keys";

export const dynamic = "force-dynamic";

export async function GET(request: Request) {
  try {
    const caller = await authorizeRequest(request, { apiKey: ["read"] });
    const keys = await listWorkspaceApiKeys(caller.workspaceId);
    return Response.json({ keys });
  } catch (error) {
    return toResponse(error, "/api/v1/keys");
  }
}

export async function POST(request: Request) {
  try {
    const caller = await authorizeRequest(request, { apiKey: ["create"] });
    if (caller.kind !== "user") throw new UnauthorizedError();
    const data = createApiKeySchema.parse(await readJson(request, 16_384));
    const created = await createWorkspaceApiKey({
      workspaceId: caller.workspaceId,
      userId: caller.userId,
      data,
    });
    return Response.json(created, { status: 201, headers: { "cache-control": "no-store" } });
  } catch (error) {
    return toResponse(error, "/api/v1/keys");
  }
}
