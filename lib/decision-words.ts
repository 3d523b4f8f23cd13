import type { DecisionOutcome } from "@/db/schema/decisions";

/** Words for each decision, shown beside it everywhere (exhaustive over the schema's outcomes). */
export const DECISION_LABELS: Record<DecisionOutcome, string> = {
  ship: "Ship",
  roll_back: "Roll back",
  extend: "Extend",
  stop: "Stop",
};

/** Every outcome, in the order the form offers them; free of the schema and of zod so the browser bundle stays small. */
export const DECISION_CHOICES = Object.keys(DECISION_LABELS) as [DecisionOutcome, ...DecisionOutcome[]];

/** Outcomes that end the campaign; `extend` keeps it running. */
export const ENDING_OUTCOMES: readonly DecisionOutcome[] = ["ship", "roll_back", "stop"];
