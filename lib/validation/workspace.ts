import { z } from "zod";

/** True when the runtime knows `value` as an IANA time zone (e.g. "Europe/Berlin", "UTC"). */
export function isTimeZone(value: string): boolean {
  try {
    new Intl.DateTimeFormat("en-US", { timeZone: value });
    return true;
  } catch {
    return false;
  }
}

/** Every IANA time zone the runtime offers, "UTC" first. */
export function listTimeZones(): string[] {
  const zones = typeof Intl.supportedValuesOf === "function" ? Intl.supportedValuesOf("timeZone") : [];
  return ["UTC", ...zones.filter((zone) => zone !== "UTC")];
}

export const workspaceSchema = z.object({
  name: z.string().trim().min(2, "Use at least 2 characters").max(60, "At most 60 characters"),
  timeZone: z.string().min(1, "Choose a time zone").refine(isTimeZone, "Choose a time zone from the list"),
});
export type WorkspaceInput = z.infer<typeof workspaceSchema>;

export const createWorkspaceSchema = workspaceSchema;
export type CreateWorkspaceInput = WorkspaceInput;
export const updateWorkspaceSchema = workspaceSchema;
export type UpdateWorkspaceInput = WorkspaceInput;

/** A URL slug for a new workspace: the name in kebab-case plus a short random suffix (slugs are unique). */
export function workspaceSlug(name: string, suffix: string): string {
  const base = name
    .normalize("NFKD")
    .replace(/[\u0300-\u036f]/g, "")
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, "-")
    .replace(/^-+|-+$/g, "")
    .slice(0, 40);
  return `${base || "workspace"}-${suffix}`;
}
