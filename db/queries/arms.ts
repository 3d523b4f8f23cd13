import { asc, inArray } from "drizzle-orm";
import { arms } from "@/db/schema";
import type { Executor } from "./campaigns";

export interface ArmRef {
  id: string;
  campaignId: string;
  key: string;
}

/** The arms of the given campaigns (the caller has already scoped the campaigns to a workspace). */
export async function listArmsOfCampaigns(executor: Executor, campaignIds: string[]): Promise<ArmRef[]> {
  if (campaignIds.length === 0) return [];
  return executor
    .select({ id: arms.id, campaignId: arms.campaignId, key: arms.key })
    .from(arms)
    .where(inArray(arms.campaignId, campaignIds))
    .orderBy(asc(arms.campaignId), asc(arms.position));
}
