import { z } from "zod";
import { DECISION_CHOICES } from "@/lib/decision-words";

export { DECISION_CHOICES, DECISION_LABELS, ENDING_OUTCOMES } from "@/lib/decision-words";

/** `POST /api/v1/campaigns/:id/decisions` and the decision form. */
export const recordDecisionSchema = z
  .object({
    outcome: z.enum(DECISION_CHOICES, { error: "Choose ship, roll back, extend or stop" }),
    note: z.string().trim().min(10, "Explain the decision in at least 10 characters").max(2000, "At most 2000 characters"),
  })
  .strict();
export type RecordDecisionInput = z.infer<typeof recordDecisionSchema>;
