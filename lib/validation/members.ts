import { z } from "zod";
import { ROLE_NAMES } from "@/lib/auth/permissions";

export const ROLE_DESCRIPTIONS: Record<(typeof ROLE_NAMES)[number], string> = {
  admin: "Admin: everything, plus members, roles, API keys and workspace settings",
  marketer: "Marketer: creates and runs campaigns, uploads counts",
  lead: "Lead: reads everything, records decisions, edits alert rules",
  viewer: "Viewer: reads dashboards, manages own alert subscriptions",
};

const role = z.enum(ROLE_NAMES, { message: "Choose one of admin, marketer, lead or viewer" });
/** A better-auth record id (member, invitation, API key); PostgreSQL answers a NUL in text with an error, so control characters stop here. */
export const recordIdSchema = z
  .string()
  .trim()
  .min(1, "Missing id")
  .max(100, "Not a valid id")
  .regex(/^[^\u0000-\u001f\u007f]*$/, "Not a valid id");
const id = recordIdSchema;

export const inviteMemberSchema = z.object({
  email: z.string().trim().toLowerCase().min(1, "Enter an e-mail address").email("Enter a valid e-mail address").max(254),
  role,
});
export type InviteMemberInput = z.infer<typeof inviteMemberSchema>;

export const updateMemberRoleSchema = z.object({ memberId: id, role });
export type UpdateMemberRoleInput = z.infer<typeof updateMemberRoleSchema>;

export const removeMemberSchema = z.object({ memberId: id });
export type RemoveMemberInput = z.infer<typeof removeMemberSchema>;

export const cancelInvitationSchema = z.object({ invitationId: id });
export type CancelInvitationInput = z.infer<typeof cancelInvitationSchema>;

export const revokeApiKeySchema = z.object({ keyId: id });
export type RevokeApiKeyInput = z.infer<typeof revokeApiKeySchema>;
