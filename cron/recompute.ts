import { createHash } from "node:crypto";
import { drizzle } from "drizzle-orm/node-postgres";
import type { Logger } from "pino";
import { getPool } from "@/db";
import { listCampaignsToRecompute, type AnalysisInputs } from "@/db/queries/analysis";
import { queueAlert } from "@/db/queries/alerts";
import {
  AnalysisDaysCopyText,
  lockAnalysisInputsBatch,
  markCampaignsAnalyzed,
  replaceAnalysisDaysBatch,
  touchCampaignsAnalyzed,
  type AnalysisDayColumns,
} from "@/db/queries/recompute-batch";
import * as schema from "@/db/schema";
import type { CallName } from "@/db/schema";
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

/** Campaigns per transaction in a pass: bounded memory (their rows and analyses), few round trips. */
const GROUP_SIZE = 20;

/** Groups in flight at once: one computes while PostgreSQL reads or writes the other. */
const LANES = 2;

/**
 * Recomputes one campaign in one transaction: locks the campaign row, reads plan and counts, runs
 * `analyzeCampaign` (the same function as `peeksafe analyze`), replaces every analysis day, and
 * queues an alert when the call changed. Unchanged inputs are skipped unless `force`. A crash before
 * the commit leaves the previous analysis as it was. Throws when the analysis or the write fails.
 */
export async function recomputeCampaign(
  campaignId: string,
  options: { force?: boolean; holdMs?: number; logger?: Logger } = {},
): Promise<CampaignRecompute> {
  const { outcomes, failures } = await recomputeGroup([campaignId], { ...options, logger: options.logger ?? createLogger("recompute") });
  if (failures.length > 0) throw failures[0].error;
  return outcomes[0];
}

interface GroupResult {
  outcomes: CampaignRecompute[];
  failures: { campaignId: string; error: unknown }[];
}

/**
 * Recomputes a group of campaigns in one transaction: locks their rows (id order), reads their
 * inputs in three queries, analyses each, then replaces their analysis days with one delete and one
 * COPY. A campaign whose analysis throws is left out (its previous analysis and marks are kept);
 * a database error rolls the whole group back and is thrown.
 */
async function recomputeGroup(campaignIds: string[], options: { force?: boolean; holdMs?: number; logger: Logger }): Promise<GroupResult> {
  const { logger } = options;
  const started = performance.now();
  const client = await getPool().connect();
  let computeMs = 0;
  const computed: { outcome: Omit<CampaignRecompute, "durationMs">; ms: number }[] = [];
  const failures: GroupResult["failures"] = [];
  try {
    await drizzle(client, { schema }).transaction(async (tx) => {
      const inputsById = await lockAnalysisInputsBatch(tx, client, campaignIds);
      const unchanged: string[] = [];
      const written: string[] = [];
      const copyText = new AnalysisDaysCopyText();
      const marks: { campaignId: string; call: CallName; inputsHash: string }[] = [];
      const alerts: { at: number; day: string; call: CallName; fromCall: CallName; snapshot: AlertSnapshot }[] = [];
      for (const campaignId of campaignIds) {
        const inputs = inputsById.get(campaignId);
        if (!inputs) {
          computed.push({ outcome: { campaignId, recomputed: false, days: 0, call: null, previousCall: null, alertId: null }, ms: 0 });
          continue;
        }
        const begun = performance.now();
        try {
          const inputsHash = analysisInputsHash(inputs);
          const previousCall = inputs.campaign.currentCall;
          if (!options.force && inputs.campaign.analysisInputsHash === inputsHash) {
            unchanged.push(campaignId);
            computed.push({ outcome: { campaignId, recomputed: false, days: 0, call: previousCall, previousCall, alertId: null }, ms: performance.now() - begun });
            continue;
          }
          const plan = campaignPlan(inputs.campaign, inputs.arms);
          const analysis = analyzeCampaign(plan, inputs.rows, { peekingCost: false });
          const rows = analysisRows(campaignId, analysis, inputsHash, plan.sides);
          const last = analysis.days.at(-1);
          const call: CallName = last?.call ?? "collecting";
          copyText.append(rows);
          written.push(campaignId);
          marks.push({ campaignId, call, inputsHash });
          // The snapshot now, not the analysis: the group keeps only its rows until the COPY.
          if (call !== previousCall && last) alerts.push({ at: computed.length, day: last.date, call, fromCall: previousCall, snapshot: alertSnapshot(inputs, analysis, last, previousCall) });
          computed.push({ outcome: { campaignId, recomputed: true, days: rows.length, call, previousCall, alertId: null }, ms: performance.now() - begun });
        } catch (error) {
          failures.push({ campaignId, error });
        } finally {
          computeMs += performance.now() - begun;
        }
      }
      await replaceAnalysisDaysBatch(client, written, copyText.chunks());
      copyText.release();
      for (const { at, day, call, fromCall, snapshot } of alerts) {
        const { outcome } = computed[at];
        outcome.alertId = await queueAlert(tx, { campaignId: outcome.campaignId, kind: call, fromCall, day, snapshot });
      }
      await markCampaignsAnalyzed(client, marks);
      await touchCampaignsAnalyzed(client, unchanged);
      if (options.holdMs && options.holdMs > 0) {
        for (const campaignId of written) logger.info({ campaignId, holdMs: options.holdMs }, "holding the recompute transaction open before commit");
        await new Promise((resolve) => setTimeout(resolve, options.holdMs));
      }
    });
  } finally {
    client.release();
  }
  // A campaign's duration is its own analysis plus its share of the group's database time.
  const databaseShare = (performance.now() - started - computeMs) / Math.max(1, campaignIds.length);
  const outcomes = computed.map(({ outcome, ms }) => ({ ...outcome, durationMs: Math.round(ms + databaseShare) }));
  for (const outcome of outcomes) {
    logger.info(
      { campaignId: outcome.campaignId, days: outcome.days, durationMs: outcome.durationMs, call: outcome.call, recomputed: outcome.recomputed, alertQueued: outcome.alertId !== null },
      outcome.recomputed ? "campaign recomputed" : "campaign unchanged",
    );
  }
  return { outcomes, failures };
}

/** A group, or when its transaction fails, each of its campaigns alone (so one bad campaign costs only itself). */
async function recomputeGroupOrEach(campaignIds: string[], options: { holdMs?: number; logger: Logger }): Promise<GroupResult> {
  try {
    return await recomputeGroup(campaignIds, options);
  } catch (error) {
    if (campaignIds.length === 1) return { outcomes: [], failures: [{ campaignId: campaignIds[0], error }] };
    options.logger.warn({ campaigns: campaignIds.length, err: error }, "group recompute failed; recomputing its campaigns one by one");
    const result: GroupResult = { outcomes: [], failures: [] };
    for (const campaignId of campaignIds) {
      try {
        const one = await recomputeGroup([campaignId], options);
        result.outcomes.push(...one.outcomes);
        result.failures.push(...one.failures);
      } catch (failure) {
        result.failures.push({ campaignId, error: failure });
      }
    }
    return result;
  }
}

/**
 * The recompute job: every campaign marked for recompute (or, with `all`, every analysed campaign,
 * of `workspaceIds` when given), in groups of campaigns, one transaction each and two groups in
 * flight, under the job's advisory lock. Safe to run twice; a campaign that fails is logged and left
 * for the next run.
 */
export async function runRecompute(
  options: { all?: boolean; workspaceIds?: string[]; wait?: boolean; logger?: Logger } = {},
): Promise<RecomputeSummary> {
  const logger = options.logger ?? createLogger("recompute");
  const env = getWorkerEnv();
  const wait = options.wait ?? env.WORKER_WAIT_FOR_LOCK === "true";
  const locked = await withJobLock("recompute", logger, { wait }, async () => {
    const ids = await listCampaignsToRecompute({ all: options.all, workspaceIds: options.workspaceIds });
    const groups: string[][] = [];
    for (let start = 0; start < ids.length; start += GROUP_SIZE) groups.push(ids.slice(start, start + GROUP_SIZE));
    const results: GroupResult[] = new Array(groups.length);
    let next = 0;
    const lane = async () => {
      while (next < groups.length) {
        const index = next++;
        results[index] = await recomputeGroupOrEach(groups[index], { holdMs: env.RECOMPUTE_HOLD_MS, logger });
      }
    };
    await Promise.all(Array.from({ length: Math.min(LANES, groups.length) }, lane));
    const campaigns: CampaignRecompute[] = [];
    let failed = 0;
    for (const result of results) {
      campaigns.push(...result.outcomes);
      for (const { campaignId, error } of result.failures) {
        failed += 1;
        logger.error({ campaignId, err: error }, "campaign recompute failed; the previous analysis is kept");
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
 * One recursion gives every look; its last value is the engine's `peekingCost` (the command line's).
 */
function peekingCostByDay(analysis: CampaignAnalysis, sides: 1 | 2): (number | null)[] {
  const lookDay: number[] = [];
  const units: number[] = [];
  analysis.days.forEach((day, index) => {
    if (!analysis.treatmentArms.every((arm) => day.byArm[arm]?.fixed.z !== null)) return;
    let total = 0;
    for (const key in day.arms) total += day.arms[key].n;
    if (total > (units.at(-1) ?? 0)) {
      lookDay.push(index);
      units.push(total);
    }
  });
  const costs: (number | null)[] = analysis.days.map(() => null);
  if (units.length > 0) {
    const byLook = naivePeekingErrorByLook(lookFractions(units), { significanceLevel: analysis.armSignificanceLevel, sides });
    let look = -1;
    for (let d = 0; d < analysis.days.length; d++) {
      while (look + 1 < lookDay.length && lookDay[look + 1] <= d) look++;
      costs[d] = look >= 0 ? byLook[look] : null;
    }
  }
  return costs;
}

function analysisRows(campaignId: string, analysis: CampaignAnalysis, inputsHash: string, sides: 1 | 2): AnalysisDayColumns[] {
  const costs = peekingCostByDay(analysis, sides);
  return analysis.days.map((day, index) => ({
    campaignId,
    day: day.date,
    daysRun: day.dayNumber,
    call: day.call,
    numbers: [
      day.lift.absolute,
      day.lift.relative,
      day.sequential.cs[0],
      day.sequential.cs[1],
      day.fixed.ci?.[0] ?? null,
      day.fixed.ci?.[1] ?? null,
      day.fixed.z,
      day.fixed.p,
      day.sequential.p,
      day.health.srm.chiSquare?.p ?? null,
      day.health.srm.sequential?.p ?? null,
      costs[index],
    ],
    healthJson: JSON.stringify({ issues: day.health.issues.map((issue) => ({ code: issue.rule, message: issue.message })) }),
    detailJson: jsonSafe({
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

/**
 * JSON text with no ±Infinity: an open interval end is stored as null, as the command line prints it.
 * JSON.stringify itself writes every non-finite number as null, and without a replacer it stays on its fast path.
 */
function jsonSafe(value: unknown): string {
  return JSON.stringify(value);
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
