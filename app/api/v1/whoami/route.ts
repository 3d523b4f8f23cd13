import { authorizeRequest } from "@/lib/auth/guard";
import { toResponse } from "@/lib/http/problem";
import { keyPermissionNames } from "@/lib/validation/api-keys";

export const dynamic = "force-dynamic";

/** Who the caller is: lets a pipeline check its key, and a script its session, before sending data. */
export async function GET(request: Request) {
  try {
    const caller = await authorizeRequest(request, {}, { allowKey: true });
    if (caller.kind === "key") {
      return Response.json({ kind: "key", keyId: caller.keyId, workspaceId: caller.workspaceId, permissions: keyPermissionNames(caller.permissions) });
    }
    return Response.json({ kind: "user", userId: caller.userId, email: caller.email, workspaceId: caller.workspaceId, role: caller.role });
  } catch (error) {
    return toResponse(error, "/api/v1/whoami");
  }
}
