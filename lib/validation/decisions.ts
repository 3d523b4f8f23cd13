import { z } from "zod";
import { DECISION_OUTCOMES } from "@/db/schema/decisions";

/** Words for each decision, shown beside it everywhere. */
export const DECISION_LABELS: Record<(typeof DECISION_OUTCOMES)[number], string> = {
  ship: "Ship",
  roll_back: "Roll back",
  extend: "Extend",
  stop: "Stop",
};

/** Outcomes that end the campaign; `extend` keeps it running. */
export const ENDING_OUTCOMES: readonly (typeof DECISION_OUTCOMES)[number][] = ["ship", "roll_back", "stop"];

/** `POST /api/v1/campaigns/:id/decisions` and the decision form. */
export const recordDecisionSchema = z
  .object({
    outcome: z.enum(DECISION_OUTCOMES, { error: "Choose ship, roll back, extend or stop" }),
    note: z.string().trim().min(10, "Explain the decision in at least 10 characters").max(2000, "At most 2000 characters"),
  })
  .strict();
export type RecordDecisionInput = z.infer<typeof recordDecisionSchema>;
