import type { CampaignStatus } from "@/db/schema/campaigns";

/** The moves a campaign may make: draft → running ⇄ paused → ended → archived (a draft may be archived unused). */
export const LIFECYCLE_MOVES: Record<CampaignStatus, readonly CampaignStatus[]> = {
  draft: ["running", "archived"],
  running: ["paused", "ended"],
  paused: ["running", "ended"],
  ended: ["archived"],
  archived: [],
};

export function canMove(from: CampaignStatus, to: CampaignStatus): boolean {
  return LIFECYCLE_MOVES[from].includes(to);
}

/** Words for each status, shown beside it everywhere. */
export const STATUS_LABELS: Record<CampaignStatus, string> = {
  draft: "Draft",
  running: "Running",
  paused: "Paused",
  ended: "Ended",
  archived: "Archived",
};
