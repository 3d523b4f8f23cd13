import { z } from "zod";
import type { DecisionOutcome } from "@/db/schema/decisions";

/** Words for each decision, shown beside it everywhere (exhaustive over the schema's outcomes). */
export const DECISION_LABELS: Record<DecisionOutcome, string> = {
  ship: "Ship",
  roll_back: "Roll back",
  extend: "Extend",
  stop: "Stop",
};

/** Every outcome, in the order the form offers them (kept free of the database schema so the browser bundle stays small). */
export const DECISION_CHOICES = Object.keys(DECISION_LABELS) as [DecisionOutcome, ...DecisionOutcome[]];

/** Outcomes that end the campaign; `extend` keeps it running. */
export const ENDING_OUTCOMES: readonly DecisionOutcome[] = ["ship", "roll_back", "stop"];

/** `POST /api/v1/campaigns/:id/decisions` and the decision form. */
export const recordDecisionSchema = z
  .object({
    outcome: z.enum(DECISION_CHOICES, { error: "Choose ship, roll back, extend or stop" }),
    note: z.string().trim().min(10, "Explain the decision in at least 10 characters").max(2000, "At most 2000 characters"),
  })
  .strict();
export type RecordDecisionInput = z.infer<typeof recordDecisionSchema>;
