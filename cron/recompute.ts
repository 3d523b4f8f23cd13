import { createHash } from "node:crypto";
import type { Logger } from "pino";
import { getDb } from "@/db";
import {
  listCampaignsToRecompute,
  lockAnalysisInputs,
  markCampaignAnalyzed,
  replaceAnalysisDays,
  touchCampaignAnalyzed,
  type AnalysisInputs,
} from "@/db/queries/analysis";
import { queueAlert } from "@/db/queries/alerts";
import type { CallName, NewAnalysisDay } from "@/db/schema";
import { finiteOrNull, intervalOrNull, type AlertSnapshot } from "@/lib/alerts/snapshot";
import { createLogger } from "@/lib/logger";
import { analyzeCampaign, naivePeekingErrorByLook, lookFractions, type CampaignAnalysis, type DayResult } from "@/lib/sequential";
import { campaignPlan } from "./campaign-plan";
import { getWorkerEnv } from "./config";
import { withJobLock } from "./lock";

/** Bumped when the stored analysis changes shape or meaning: every campaign is then recomputed once. */
export const ANALYSIS_VERSION = 1;

export interface CampaignRecompute {
  campaignId: string;
  /** False when the inputs hash was unchanged (nothing rewritten) or the campaign is gone. */
  recomputed: boolean;
  days: number;
  call: CallName | null;
  previousCall: CallName | null;
  /** The queued alert, when the call changed. */
  alertId: string | null;
  durationMs: number;
}

export interface RecomputeSummary {
  /** False when another worker held the lock and this run skipped. */
  ran: boolean;
  processed: number;
  recomputed: number;
  unchanged: number;
  failed: number;
  alerts: number;
  campaigns: CampaignRecompute[];
}

/** SHA-256 of everything the analysis depends on: plan, arms and counts (in a fixed order), and the analysis version. */
export function analysisInputsHash(inputs: AnalysisInputs): string {
  const { campaign } = inputs;
  const canonical = {
    version: ANALYSIS_VERSION,
    plan: [campaign.metricKind, campaign.alpha, campaign.power, campaign.sides, campaign.baselineRate, campaign.baselineMean, campaign.baselineSd, campaign.minimumLift, campaign.tau, campaign.maxDays],
    arms: inputs.arms.map((arm) => [arm.key, arm.plannedShare, arm.position]),
    rows: inputs.rows.map((row) => [row.date, row.arm, row.n, row.sum, row.sumSq]),
  };
  return createHash("sha256").update(JSON.stringify(canonical)).digest("hex");
}

/**
 * Recomputes one campaign in one transaction: locks the campaign row, reads plan and counts, runs
 * `analyzeCampaign` (the same function as `peeksafe analyze`), replaces every analysis day, and
 * queues an alert when the call changed. Unchanged inputs are skipped unless `force`. A crash before
 * the commit leaves the previous analysis as it was.
 */
export async function recomputeCampaign(
  campaignId: string,
  options: { force?: boolean; holdMs?: number; logger?: Logger } = {},
): Promise<CampaignRecompute> {
  const logger = options.logger ?? createLogger("recompute");
  const started = performance.now();
  const result = await getDb().transaction(async (tx) => {
    const inputs = await lockAnalysisInputs(tx, campaignId);
    if (!inputs) return { recomputed: false, days: 0, call: null, previousCall: null, alertId: null };
    const inputsHash = analysisInputsHash(inputs);
    const previousCall = inputs.campaign.currentCall;
    if (!options.force && inputs.campaign.analysisInputsHash === inputsHash) {
      await touchCampaignAnalyzed(tx, campaignId);
      return { recomputed: false, days: -1, call: previousCall, previousCall, alertId: null };
    }
    const plan = campaignPlan(inputs.campaign, inputs.arms);
    const analysis = analyzeCampaign(plan, inputs.rows);
    const rows = analysisRows(campaignId, analysis, inputsHash, plan.sides);
    await replaceAnalysisDays(tx, campaignId, rows);
    const last = analysis.days.at(-1);
    const call: CallName = last?.call ?? "collecting";
    let alertId: string | null = null;
    if (call !== previousCall && last) {
      alertId = await queueAlert(tx, {
        campaignId,
        kind: call,
        fromCall: previousCall,
        day: last.date,
        snapshot: alertSnapshot(inputs, analysis, last, previousCall),
      });
    }
    await markCampaignAnalyzed(tx, campaignId, { call, inputsHash });
    if (options.holdMs && options.holdMs > 0) {
      logger.info({ campaignId, holdMs: options.holdMs }, "holding the recompute transaction open before commit");
      await new Promise((resolve) => setTimeout(resolve, options.holdMs));
    }
    return { recomputed: true, days: rows.length, call, previousCall, alertId };
  });
  const durationMs = Math.round(performance.now() - started);
  const outcome: CampaignRecompute = { campaignId, ...result, days: result.days < 0 ? 0 : result.days, durationMs };
  logger.info(
    { campaignId, days: outcome.days, durationMs, call: outcome.call, recomputed: outcome.recomputed, alertQueued: outcome.alertId !== null },
    outcome.recomputed ? "campaign recomputed" : "campaign unchanged",
  );
  return outcome;
}

/**
 * The recompute job: every campaign marked for recompute (or, with `all`, every analysed campaign,
 * of `workspaceIds` when given), one transaction each, under the job's advisory lock. Safe to run
 * twice; a campaign that fails is logged and left for the next run.
 */
export async function runRecompute(
  options: { all?: boolean; workspaceIds?: string[]; wait?: boolean; logger?: Logger } = {},
): Promise<RecomputeSummary> {
  const logger = options.logger ?? createLogger("recompute");
  const env = getWorkerEnv();
  const wait = options.wait ?? env.WORKER_WAIT_FOR_LOCK === "true";
  const locked = await withJobLock("recompute", logger, { wait }, async () => {
    const ids = await listCampaignsToRecompute({ all: options.all, workspaceIds: options.workspaceIds });
    const campaigns: CampaignRecompute[] = [];
    let failed = 0;
    for (const id of ids) {
      try {
        campaigns.push(await recomputeCampaign(id, { holdMs: env.RECOMPUTE_HOLD_MS, logger }));
      } catch (error) {
        failed += 1;
        logger.error({ campaignId: id, err: error }, "campaign recompute failed; the previous analysis is kept");
      }
    }
    return { campaigns, failed };
  });
  if (!locked.ran) return { ran: false, processed: 0, recomputed: 0, unchanged: 0, failed: 0, alerts: 0, campaigns: [] };
  const { campaigns, failed } = locked.result;
  const summary: RecomputeSummary = {
    ran: true,
    processed: campaigns.length + failed,
    recomputed: campaigns.filter((c) => c.recomputed).length,
    unchanged: campaigns.filter((c) => !c.recomputed).length,
    failed,
    alerts: campaigns.filter((c) => c.alertId !== null).length,
    campaigns,
  };
  logger.info({ all: options.all ?? false, processed: summary.processed, recomputed: summary.recomputed, unchanged: summary.unchanged, failed, alerts: summary.alerts }, "recompute pass done");
  return summary;
}

/**
 * Cost of peeking so far for each day: the exact error of a naive test repeated on every look up to
 * that day (the engine's look rule: a day where every treatment arm has a z-test and new units).
 * The last day takes the engine's own value, so it equals the command line's `peekingCost`.
 */
function peekingCostByDay(analysis: CampaignAnalysis, sides: 1 | 2): (number | null)[] {
  const lookDay: number[] = [];
  const units: number[] = [];
  analysis.days.forEach((day, index) => {
    if (!analysis.treatmentArms.every((arm) => day.byArm[arm]?.fixed.z !== null)) return;
    const total = Object.values(day.arms).reduce((sum, totals) => sum + totals.n, 0);
    if (total > (units.at(-1) ?? 0)) {
      lookDay.push(index);
      units.push(total);
    }
  });
  const costs: (number | null)[] = analysis.days.map(() => null);
  if (units.length > 0) {
    const fractions = lookFractions(units);
    const byLook = naivePeekingErrorByLook(fractions, { significanceLevel: analysis.armSignificanceLevel, sides });
    let look = -1;
    for (let d = 0; d < analysis.days.length; d++) {
      while (look + 1 < lookDay.length && lookDay[look + 1] <= d) look++;
      costs[d] = look >= 0 ? byLook[look] : null;
    }
  }
  if (costs.length > 0) costs[costs.length - 1] = analysis.peekingCost;
  return costs;
}

function analysisRows(campaignId: string, analysis: CampaignAnalysis, inputsHash: string, sides: 1 | 2): NewAnalysisDay[] {
  const costs = peekingCostByDay(analysis, sides);
  return analysis.days.map((day, index) => ({
    campaignId,
    day: day.date,
    daysRun: day.dayNumber,
    call: day.call,
    liftAbsolute: day.lift.absolute,
    liftRelative: day.lift.relative,
    sequenceLow: day.sequential.cs[0],
    sequenceHigh: day.sequential.cs[1],
    intervalLow: day.fixed.ci?.[0] ?? null,
    intervalHigh: day.fixed.ci?.[1] ?? null,
    fixedZ: day.fixed.z,
    fixedP: day.fixed.p,
    sequentialP: day.sequential.p,
    srmP: day.health.srm.chiSquare?.p ?? null,
    srmSequentialP: day.health.srm.sequential?.p ?? null,
    peekingCost: costs[index],
    health: { issues: day.health.issues.map((issue) => ({ code: issue.rule, message: issue.message })) },
    detail: jsonSafe({
      ok: day.health.ok,
      leadingArm: day.leadingArm,
      arms: day.arms,
      srm: day.health.srm,
      issues: day.health.issues,
      byArm: day.byArm,
      relativeSequence: day.sequential.relativeCs,
      fixed: day.fixed,
    }),
    inputsHash,
  }));
}

/** JSON has no ±Infinity: an open interval end is stored as null, as the command line prints it. */
function jsonSafe(value: unknown): unknown {
  return JSON.parse(JSON.stringify(value, (_key, item) => (typeof item === "number" && !Number.isFinite(item) ? null : item)));
}

function alertSnapshot(inputs: AnalysisInputs, analysis: CampaignAnalysis, day: DayResult, fromCall: CallName): AlertSnapshot {
  const arm = inputs.arms.find((candidate) => candidate.key === day.leadingArm);
  return {
    campaignName: inputs.campaign.name,
    metricKind: inputs.campaign.metricKind,
    metricName: inputs.campaign.metricName,
    metricUnit: inputs.campaign.metricUnit,
    call: day.call,
    fromCall,
    day: day.date,
    daysRun: day.dayNumber,
    maxDays: inputs.campaign.maxDays,
    leadingArm: day.leadingArm,
    leadingArmName: arm?.name ?? day.leadingArm,
    liftAbsolute: finiteOrNull(day.lift.absolute),
    liftRelative: finiteOrNull(day.lift.relative),
    sequence: intervalOrNull(day.sequential.cs),
    relativeSequence: intervalOrNull(day.sequential.relativeCs),
    fixedInterval: intervalOrNull(day.fixed.ci),
    fixedP: finiteOrNull(day.fixed.p),
    sequentialP: finiteOrNull(day.sequential.p),
    significanceLevel: analysis.significanceLevel,
    minimumLift: inputs.campaign.minimumLift,
    healthIssues: analysis.issues.filter((issue) => issue.date === null || issue.date <= day.date).map((issue) => issue.message),
  };
}
