import { z } from "zod";
import { KEY_PERMISSIONS, type KeyPermissionName } from "@/lib/auth/permissions";

const permissionNames = Object.keys(KEY_PERMISSIONS) as [KeyPermissionName, ...KeyPermissionName[]];

export const createApiKeySchema = z.object({
  name: z.string().trim().min(1, "Give the key a name").max(32, "At most 32 characters"),
  permissions: z.array(z.enum(permissionNames)).min(1, "Choose at least one permission").default(["ingest"]),
});
export type CreateApiKeyInput = z.infer<typeof createApiKeySchema>;

/** The better-auth permission statements for a list of key permission names. */
export function keyStatements(names: readonly KeyPermissionName[]): Record<string, string[]> {
  const merged: Record<string, string[]> = {};
  for (const name of names) {
    for (const [resource, actions] of Object.entries(KEY_PERMISSIONS[name])) {
      merged[resource] = [...new Set([...(merged[resource] ?? []), ...actions])];
    }
  }
  return merged;
}

/** Key permission names from stored statements (inverse of keyStatements). */
export function keyPermissionNames(statements: Record<string, string[]>): KeyPermissionName[] {
  return permissionNames.filter((name) =>
    Object.entries(KEY_PERMISSIONS[name]).every(([resource, actions]) =>
      (actions as readonly string[]).every((action) => statements[resource]?.includes(action)),
    ),
  );
}
