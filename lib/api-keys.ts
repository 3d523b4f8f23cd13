import { createAuditEvent } from "@/db/queries/audit-events";
import { listApiKeys, revokeApiKey, type ApiKeySummary } from "@/db/queries/api-keys";
import { forgetApiKey } from "@/lib/auth/key-cache";
import { getAuth } from "@/lib/auth/server";
import { NotFoundError } from "@/lib/errors";
import { keyPermissionNames, keyStatements, type CreateApiKeyInput } from "@/lib/validation/api-keys";

export interface CreatedApiKey {
  id: string;
  name: string;
  key: string;
  permissions: string[];
  createdAt: string;
}

/** Creates a workspace-owned key; the secret appears only in this return value (it is stored hashed). */
export async function createWorkspaceApiKey(input: {
  workspaceId: string;
  userId: string;
  data: CreateApiKeyInput;
}): Promise<CreatedApiKey> {
  // A server call (no request headers): permissions are a server-only property of the key plugin.
  const created = await getAuth().api.createApiKey({
    body: {
      name: input.data.name,
      organizationId: input.workspaceId,
      userId: input.userId,
      permissions: keyStatements(input.data.permissions),
    },
  });
  await createAuditEvent({
    workspaceId: input.workspaceId,
    actorUserId: input.userId,
    action: "api_key.created",
    targetType: "api_key",
    targetId: created.id,
    detail: { name: input.data.name, permissions: input.data.permissions },
  });
  return {
    id: created.id,
    name: input.data.name,
    key: created.key,
    permissions: input.data.permissions,
    createdAt: new Date(created.createdAt).toISOString(),
  };
}

export interface ApiKeyView extends Omit<ApiKeySummary, "permissions"> {
  permissions: string[];
  status: "active" | "revoked";
}

export async function listWorkspaceApiKeys(workspaceId: string): Promise<ApiKeyView[]> {
  const keys = await listApiKeys(workspaceId);
  return keys.map((key) => ({
    ...key,
    permissions: keyPermissionNames(key.permissions),
    status: key.enabled ? "active" : "revoked",
  }));
}

/** Revokes a key: it stops working at once and stays listed as revoked, so batches keep their origin. */
export async function revokeWorkspaceApiKey(input: { workspaceId: string; userId: string; keyId: string }): Promise<void> {
  const revoked = await revokeApiKey(input.workspaceId, input.keyId);
  if (!revoked) throw new NotFoundError("No API key with this id in the workspace.");
  forgetApiKey(input.keyId);
  await createAuditEvent({
    workspaceId: input.workspaceId,
    actorUserId: input.userId,
    action: "api_key.revoked",
    targetType: "api_key",
    targetId: input.keyId,
  });
}
