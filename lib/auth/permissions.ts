import { createAccessControl } from "better-auth/plugins/access";
import { defaultStatements } from "better-auth/plugins/organization/access";

/**
 * Every resource and action of a Peeksafe workspace. Roles (DESIGN.md §2) grant subsets;
 * pipeline keys carry `ingest: ["write"]` only. Shared by the server and the client.
 */
export const statements = {
  ...defaultStatements,
  apiKey: ["create", "read", "update", "delete"],
  workspace: ["read", "settings"],
  campaign: ["read", "create", "update", "lifecycle", "upload", "recompute"],
  decision: ["record"],
  alertRule: ["update"],
  subscription: ["self"],
  ingest: ["write"],
} as const;

export const accessControl = createAccessControl(statements);

const viewerGrants = {
  workspace: ["read"],
  campaign: ["read"],
  subscription: ["self"],
} as const;

export const viewer = accessControl.newRole({ ...viewerGrants });

export const lead = accessControl.newRole({
  ...viewerGrants,
  campaign: ["read", "recompute"],
  decision: ["record"],
  alertRule: ["update"],
});

export const marketer = accessControl.newRole({
  ...viewerGrants,
  campaign: ["read", "create", "update", "lifecycle", "upload"],
});

export const admin = accessControl.newRole({
  organization: ["update", "delete"],
  member: ["create", "update", "delete"],
  invitation: ["create", "cancel"],
  team: ["create", "update", "delete"],
  ac: ["create", "read", "update", "delete"],
  apiKey: ["create", "read", "update", "delete"],
  workspace: ["read", "settings"],
  campaign: ["read", "create", "update", "lifecycle", "upload", "recompute"],
  decision: ["record"],
  alertRule: ["update"],
  subscription: ["self"],
});

export const roles = { admin, marketer, lead, viewer };

export const ROLE_NAMES = ["admin", "marketer", "lead", "viewer"] as const;
export type RoleName = (typeof ROLE_NAMES)[number];

export type Resource = keyof typeof statements;
export type Permission = { [R in Resource]?: (typeof statements)[R][number][] };

/** Permission names a pipeline key may carry, and what each grants. */
export const KEY_PERMISSIONS = {
  ingest: { ingest: ["write"] },
  read: { campaign: ["read"] },
} as const;
export type KeyPermissionName = keyof typeof KEY_PERMISSIONS;

/** Pure role check against the static role table (the server's single source of truth). */
export function roleAllows(role: string, permission: Permission): boolean {
  const entry = roles[role as RoleName];
  if (!entry) return false;
  const grants = entry.statements as Record<string, readonly string[] | undefined>;
  return Object.entries(permission).every(([resource, actions]) =>
    (actions ?? []).every((action) => grants[resource]?.includes(action) ?? false),
  );
}
