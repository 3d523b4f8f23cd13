import { z } from "zod";
import { CALLS } from "@/db/schema/campaigns";
import { ROLE_NAMES } from "@/lib/auth/permissions";

/** At most this many extra addresses get every campaign's alerts. */
export const MAX_EXTRA_RECIPIENTS = 20;

const emailSchema = z.string().email("Enter valid e-mail addresses").max(254);

/** The extra addresses as typed: one per line or separated by commas, spaces or semicolons; lower-cased, duplicates dropped. */
export function splitAddresses(text: string): string[] {
  return [...new Set(text.split(/[\s,;]+/).map((part) => part.trim().toLowerCase()).filter((part) => part !== ""))];
}

/**
 * The workspace's alert rules as the settings screen sends them: which calls alert, which roles get
 * every campaign's alerts, extra addresses (free text) and the daily digest.
 */
export const updateAlertRuleSchema = z
  .object({
    calls: z.array(z.enum(CALLS, { error: "Choose calls from the list" })).max(CALLS.length).transform((calls) => CALLS.filter((call) => calls.includes(call))),
    defaultRecipientRoles: z
      .array(z.enum(ROLE_NAMES, { error: "Choose roles from the list" }))
      .max(ROLE_NAMES.length)
      .transform((roles) => ROLE_NAMES.filter((role) => roles.includes(role))),
    extraRecipients: z
      .string()
      .max(6000, "At most 6000 characters")
      .transform(splitAddresses)
      .superRefine((addresses, context) => {
        const bad = addresses.filter((address) => !emailSchema.safeParse(address).success);
        if (bad.length > 0) context.addIssue({ code: "custom", message: `Not an e-mail address: ${bad.slice(0, 3).join(", ")}${bad.length > 3 ? " …" : ""}` });
        if (addresses.length > MAX_EXTRA_RECIPIENTS) context.addIssue({ code: "custom", message: `At most ${MAX_EXTRA_RECIPIENTS} extra addresses` });
      }),
    dailyDigest: z.boolean({ error: "Choose on or off" }),
  })
  .strict();

export type UpdateAlertRuleInput = z.input<typeof updateAlertRuleSchema>;
export type UpdateAlertRuleValues = z.output<typeof updateAlertRuleSchema>;
