import { z } from "zod";
import { revokeWorkspaceApiKey } from "@/lib/api-keys";
import { authorizeRequest } from "@/lib/auth/guard";
import { UnauthorizedError } from "@/lib/errors";
import { toResponse } from "@/lib/http/problem";
import { recordIdSchema } from "@/lib/validation/members";

export const dynamic = "force-dynamic";

const paramsSchema = z.object({ id: recordIdSchema });

export async function DELETE(request: Request, context: { params: Promise<{ id: string }> }) {
  try {
    const caller = await authorizeRequest(request, { apiKey: ["delete"] });
    if (caller.kind !== "user") throw new UnauthorizedError();
    const { id } = paramsSchema.parse(await context.params);
    await revokeWorkspaceApiKey({ workspaceId: caller.workspaceId, userId: caller.userId, keyId: id });
    return new Response(null, { status: 204 });
  } catch (error) {
    return toResponse(error, "/api/v1/keys");
  }
}
