import type { CallName } from "@/db/schema";

/**
 * Each call in words: the short phrase, what to do, and the one-line reason. Words first, never colour alone.
 * A stop rests on both printed sequences, relative and absolute (lib/sequential/decide-call.ts), and the words say so.
 */
export const CALL_WORDS: Record<CallName, { phrase: string; action: string; meaning: string }> = {
  lift: {
    phrase: "Lift proven",
    action: "Stop and ship",
    meaning: "Both always-valid confidence sequences, relative and absolute, lie above zero: the campaign lifts the metric, and this holds however often the results were looked at.",
  },
  harm: {
    phrase: "Harm proven",
    action: "Stop and roll back",
    meaning: "Both always-valid confidence sequences, relative and absolute, lie below zero: the campaign hurts the metric.",
  },
  flat: {
    phrase: "Not worth waiting",
    action: "Stop, not worth waiting",
    meaning: "The relative confidence sequence lies below the planned minimum lift, and the absolute one below that lift on the planned baseline: even if there is an effect, it is too small to matter.",
  },
  horizon: {
    phrase: "Horizon reached",
    action: "Horizon reached, read the fixed-horizon result",
    meaning: "The planned duration is over without a sequential call: the fixed-horizon test is now valid and decides.",
  },
  suspect: {
    phrase: "Check the data",
    action: "Data problem, do not decide",
    meaning: "A data-health check failed (for example a sample-ratio mismatch or impossible counts): no call is made until it is resolved.",
  },
  collecting: {
    phrase: "Collecting evidence",
    action: "Keep running",
    meaning: "No call yet: the always-valid confidence sequences do not both cross a boundary. Keep the campaign running and let the evidence build.",
  },
};

/** The assumptions every call rests on (DESIGN.md §1 and §3). */
export const CALL_ASSUMPTIONS = [
  "Units were assigned to the arms at random, in the planned shares.",
  "Units are independent of each other (one unit is counted in one arm only).",
  "The conversion window is stable: a unit's outcome is counted the same way every day.",
  "Variances are estimated from the data, so the always-valid guarantee holds for large samples.",
] as const;
