import type { ArmTotals, Call, CampaignPlan, DailyCountRow, Interval } from "./types";
import type { HealthIssue } from "./check-daily-counts";
import type { SampleSize } from "./sample-size-two-proportions";
import { alwaysValidSequenceArrays } from "./always-valid-sequence-arrays";
import { bonferroniLevel } from "./bonferroni-level";
import { checkDailyCounts } from "./check-daily-counts";
import { dayNumber } from "./day-number";
import { decideCall } from "./decide-call";
import { dirichletMultinomialLogBayesFactorUnchecked } from "./dirichlet-multinomial-log-bayes-factor-unchecked";
import { chiSquareSurvival } from "./chi-square-survival";
import { formatDay } from "./format-day";
import { lookFractions } from "./look-fractions";
import { naivePeekingError } from "./naive-peeking-error";
import { normalizeShares } from "./normalize-shares";
import { requireFinite } from "./require-finite";
import { requireProbability } from "./require-probability";
import { requireSides } from "./require-sides";
import { sampleRatioChiSquareStatistic } from "./sample-ratio-chi-square-unchecked";
import { tauFromPlan } from "./tau-from-plan";
import { createZTestScratch, twoSampleZTestUnchecked } from "./two-sample-z-test-unchecked";
import { armTotalsProblem } from "./arm-totals-problem";
import { normalQuantile } from "./normal-distribution";

/** The holdout arm's key in every plan. */
export const HOLDOUT_ARM = "holdout";

/** Defaults of the data-health gate. */
export const HEALTH_DEFAULTS = {
  /** Dirichlet prior strength of the anytime-valid SRM test (a product choice, not from the paper). */
  srmPriorStrength: 100,
  /** SRM gate: the anytime-valid SRM p-value below this makes the call `suspect` (Kohavi et al. 2020 gate on a small p; 0.001 is common practice, no source). */
  srmSignificanceLevel: 0.001,
} as const;

/** One treatment arm's statistics on one day. Null numbers: not estimable yet (too few units). */
export interface ArmDayResult {
  readonly lift: { readonly absolute: number | null; readonly relative: number | null };
  /** Fixed-horizon z-test: pooled z and p (the naive peek before the horizon), unpooled intervals at α/k. */
  readonly fixed: {
    readonly z: number | null;
    readonly p: number | null;
    readonly ci: Interval | null;
    readonly relativeCi: Interval | null;
    /** z with the unpooled standard error (its p is left to {@link twoSampleZTest}). */
    readonly zUnpooled: number | null;
  };
  /**
   * Always-valid at α/k: the mSPRT p-value of the absolute lift and the running-intersected confidence
   * sequences of the absolute lift and of the relative lift `m_T/m_C − 1` (null without a positive
   * baseline). The call agrees with both sequences (see {@link decideCall}).
   */
  readonly sequential: { readonly p: number; readonly cs: Interval; readonly relativeCs: Interval | null };
  readonly call: Call;
}

/** One calendar day of a campaign. */
export interface DayResult {
  readonly date: string;
  /** 1 on the first day of data. */
  readonly dayNumber: number;
  /** Cumulative totals per arm. */
  readonly arms: Record<string, ArmTotals>;
  readonly health: {
    readonly ok: boolean;
    /** Issues first affecting this day. */
    readonly issues: HealthIssue[];
    readonly srm: {
      readonly chiSquare: { readonly statistic: number; readonly p: number } | null;
      readonly sequential: { readonly bayesFactor: number; readonly p: number } | null;
    };
  };
  /**
   * The arm the campaign call rests on: among the treatment arms whose own call is the campaign's
   * call, the one with the smallest always-valid p (plan order on ties); the fields below are its.
   */
  readonly leadingArm: string;
  readonly lift: ArmDayResult["lift"];
  readonly fixed: ArmDayResult["fixed"];
  readonly sequential: ArmDayResult["sequential"];
  /** Campaign-level call: suspect > harm (any arm) > lift (any arm) > flat (every arm) > horizon > collecting. */
  readonly call: Call;
  readonly byArm: Record<string, ArmDayResult>;
}

/** The whole analysis of a campaign. */
export interface CampaignAnalysis {
  /** τ of the absolute-lift sequence (given or derived from the plan). */
  readonly tau: number;
  /** τ of the log-ratio sequence, τ/baseline; null without a positive baseline. */
  readonly tauRelative: number | null;
  readonly significanceLevel: number;
  /** α/k per treatment arm (Bonferroni). */
  readonly armSignificanceLevel: number;
  /** Fixed-horizon n* per treatment arm (against the holdout), null without a full plan. */
  readonly plannedSampleSize: Record<string, SampleSize> | null;
  readonly treatmentArms: string[];
  readonly issues: HealthIssue[];
  readonly days: DayResult[];
  /** Exact error of a naive daily test over the actual looks (computed once, for the last day), null without looks. */
  readonly peekingCost: number | null;
  readonly peekingLooks: number;
}

/**
 * Analyses a campaign from its plan and daily counts: for every calendar day the cumulative arms,
 * the lift (absolute, relative), the fixed-horizon z-test (the naive peek), the always-valid mSPRT
 * p-value with confidence sequences for the absolute and the relative lift, data health (row checks,
 * SRM by chi-square and by the anytime-valid Dirichlet–multinomial test) and the call; per treatment
 * arm with Bonferroni α/k, plus a campaign-level aggregate. The cost of peeking of the actual look
 * schedule is computed once, for the last day (it is too costly for every day of every campaign).
 *
 * Rules (see {@link decideCall}): a failed health check (any issue dated on or before the day, or the
 * anytime-valid SRM p below 0.001) makes the day `suspect`. With a positive baseline the engine
 * runs two sequences per arm, each at α/k and running-intersected: the absolute lift `Δ` with τ, and
 * the log ratio log(m_T/m_C) (delta-method variance) with τ/baseline, reported as `m_T/m_C − 1`.
 * A stop needs both to agree: `harm` both upper ends < 0; `lift` p < α/k and both lower ends > 0;
 * `flat` ("the confidence sequence excludes the minimum lift worth having") the relative upper end
 * < `minimumLift` (the plan's relative minimum) and the absolute upper end < `baselineRate·minimumLift`.
 * So the call never contradicts an interval the product prints beside it, whatever the observed
 * holdout rate; each stop stays valid at α/k because it is a sub-event of a stop on one sequence.
 * Without a positive baseline only the absolute sequence decides (and there is no `flat`).
 * `horizon` is day `maxDays`, or without it the day every arm reaches n*. τ is `plan.tau` or
 * {@link tauFromPlan} for the first treatment arm at α/k. The campaign call is suspect > harm (any
 * arm) > lift (any arm) > flat (every arm) > horizon (any arm) > collecting, and the day's headline
 * numbers are those of an arm whose own call it is. The always-valid results are two-sided whatever
 * `sides` is (a conservative one-sided reading). With estimated variances the guarantee is
 * asymptotic (Waudby-Smith et al. 2024).
 * Reference: DESIGN.md §3; Johari, Koomen, Pekelis & Walsh (2022); Howard, Ramdas, McAuliffe &
 * Sekhon (2021); Lindon & Malek (2022); Armitage, McPherson & Rowe (1969). Complexity: O(days · arms) plus one peeking-cost recursion.
 *
 * @param plan - the {@link CampaignPlan}; arms must include `holdout` and at least one treatment
 * @param rows - daily new counts per arm (any order); bad rows are reported as health issues, not thrown
 * @param options.peekingCost - compute the peeking cost (default true)
 * @param options.srmPriorStrength - SRM Dirichlet prior strength, default 100
 * @param options.srmSignificanceLevel - SRM gate, default 0.001
 * @returns the {@link CampaignAnalysis}
 * @throws RangeError when the plan is invalid, or no τ is given and the plan cannot derive one
 * @example analyzeCampaign({ metric: "conversion", significanceLevel: 0.05, sides: 2, tau: 0.01, arms: [{ key: "holdout", share: 0.5 }, { key: "treatment", share: 0.5 }] }, [{ date: "2026-03-01", arm: "holdout", n: 1000, sum: 100, sumSq: 100 }, { date: "2026-03-01", arm: "treatment", n: 1000, sum: 130, sumSq: 130 }]).days[0].call // "collecting"
 */
export function analyzeCampaign(
  plan: CampaignPlan,
  rows: readonly DailyCountRow[],
  options: { peekingCost?: boolean; srmPriorStrength?: number; srmSignificanceLevel?: number } = {},
): CampaignAnalysis {
  const name = "analyzeCampaign";
  if (plan === null || typeof plan !== "object") throw new RangeError(`${name} requires a plan`);
  if (plan.metric !== "conversion" && plan.metric !== "mean") throw new RangeError(`${name} requires metric "conversion" or "mean", got ${String(plan.metric)}`);
  requireProbability(name, "significanceLevel", plan.significanceLevel);
  requireSides(name, plan.sides);
  if (!Array.isArray(plan.arms)) throw new RangeError(`${name} requires plan.arms`);
  const keys = plan.arms.map((arm) => arm.key);
  if (new Set(keys).size !== keys.length) throw new RangeError(`${name} requires unique arm keys`);
  if (!keys.includes(HOLDOUT_ARM)) throw new RangeError(`${name} requires an arm "${HOLDOUT_ARM}"`);
  const treatmentArms = keys.filter((key) => key !== HOLDOUT_ARM);
  if (treatmentArms.length === 0) throw new RangeError(`${name} requires at least one treatment arm`);
  const shares = normalizeShares(name, plan.arms.map((arm) => arm.share));
  if (!Array.isArray(rows)) throw new RangeError(`${name} requires rows to be an array`);
  if (plan.maxDays !== undefined && (!Number.isInteger(plan.maxDays) || plan.maxDays < 1)) {
    throw new RangeError(`${name} requires maxDays to be a positive integer, got ${plan.maxDays}`);
  }
  const srmPriorStrength = options.srmPriorStrength ?? HEALTH_DEFAULTS.srmPriorStrength;
  const srmSignificanceLevel = options.srmSignificanceLevel ?? HEALTH_DEFAULTS.srmSignificanceLevel;
  requireProbability(name, "srmSignificanceLevel", srmSignificanceLevel);

  const armSignificanceLevel = bonferroniLevel(plan.significanceLevel, treatmentArms.length);
  const holdoutShare = shares[keys.indexOf(HOLDOUT_ARM)];
  const canPlan = plan.baselineRate !== undefined && plan.minimumLift !== undefined && plan.power !== undefined;
  let plannedSampleSize: Record<string, SampleSize> | null = null;
  let tau = plan.tau;
  if (canPlan) {
    plannedSampleSize = {};
    for (const arm of treatmentArms) {
      const share = shares[keys.indexOf(arm)];
      const derived = tauFromPlan({
        metric: plan.metric,
        baselineRate: plan.baselineRate!,
        minimumLift: plan.minimumLift!,
        significanceLevel: armSignificanceLevel,
        power: plan.power!,
        sides: plan.sides,
        holdoutShare: holdoutShare / (holdoutShare + share),
        standardDeviation: plan.standardDeviation,
      });
      plannedSampleSize[arm] = derived.sampleSize;
      if (tau === undefined) tau = derived.tau;
    }
  }
  if (tau === undefined) throw new RangeError(`${name} requires tau, or baselineRate, minimumLift and power to derive it`);
  requireFinite(name, "tau", tau);
  if (tau <= 0) throw new RangeError(`${name} requires tau > 0, got ${tau}`);
  const tauRelative = plan.baselineRate !== undefined && plan.baselineRate > 0 ? tau / plan.baselineRate : null;
  const minimumAbsoluteLift =
    plan.baselineRate !== undefined && plan.minimumLift !== undefined && plan.baselineRate * plan.minimumLift > 0 ? plan.baselineRate * plan.minimumLift : null;
  const minimumRelativeLift = plan.minimumLift !== undefined && plan.minimumLift > 0 && Number.isFinite(plan.minimumLift) ? plan.minimumLift : null;

  const issues = checkDailyCounts(rows, { metric: plan.metric, arms: keys });
  const armIndex = new Map(keys.map((key, index) => [key, index]));
  const armCount = keys.length;
  const rowDays = new Float64Array(rows.length);
  const rowArms = new Int32Array(rows.length).fill(-1);
  let firstDay = Infinity;
  let lastDay = -Infinity;
  for (let r = 0; r < rows.length; r++) {
    const row = rows[r];
    const day = dayNumber(row?.date);
    const arm = armIndex.get(row?.arm);
    if (day === null || arm === undefined || !Number.isFinite(row.n) || !Number.isFinite(row.sum) || !Number.isFinite(row.sumSq)) continue;
    rowDays[r] = day;
    rowArms[r] = arm;
    if (day < firstDay) firstDay = day;
    if (day > lastDay) lastDay = day;
  }
  const dayCount = firstDay === Infinity ? 0 : lastDay - firstDay + 1;
  const dates: string[] = new Array(dayCount);
  const added = new Float64Array(dayCount * armCount * 3);
  for (let r = 0; r < rows.length; r++) {
    if (rowArms[r] < 0) continue;
    const d = rowDays[r] - firstDay;
    const offset = (d * armCount + rowArms[r]) * 3;
    added[offset] += rows[r].n;
    added[offset + 1] += rows[r].sum;
    added[offset + 2] += rows[r].sumSq;
    dates[d] = rows[r].date;
  }
  const issueDays = issues.map((issue) => (issue.date === null ? -Infinity : dayNumber(issue.date)! - firstDay));

  // Cumulative totals per day and arm, and whether they are valid (bad rows make them invalid, not thrown).
  const totalsByDay: ArmTotals[][] = new Array(dayCount);
  const valid = new Uint8Array(dayCount * armCount);
  const running = new Float64Array(armCount * 3);
  for (let d = 0; d < dayCount; d++) {
    const today: ArmTotals[] = new Array(armCount);
    for (let a = 0; a < armCount; a++) {
      const offset = (d * armCount + a) * 3;
      running[a * 3] += added[offset];
      running[a * 3 + 1] += added[offset + 1];
      running[a * 3 + 2] += added[offset + 2];
      today[a] = { n: running[a * 3], sum: running[a * 3 + 1], sumSq: running[a * 3 + 2] };
      valid[d * armCount + a] = armTotalsProblem(today[a], plan.metric) === null ? 1 : 0;
    }
    totalsByDay[d] = today;
  }
  const minimumUnits = plan.metric === "conversion" ? 1 : 2;
  const quantile = normalQuantile(1 - armSignificanceLevel / plan.sides);
  const holdoutIndex = armIndex.get(HOLDOUT_ARM)!;
  const scratch = createZTestScratch();

  const perArm = treatmentArms.map((arm) => {
    const index = armIndex.get(arm)!;
    const lifts: ArmDayResult["lift"][] = new Array(dayCount);
    const fixed: ArmDayResult["fixed"][] = new Array(dayCount);
    const estimates = new Float64Array(dayCount);
    const variances = new Float64Array(dayCount);
    const logRatios = new Float64Array(dayCount);
    const logRatioVariances = new Float64Array(dayCount);
    for (let d = 0; d < dayCount; d++) {
      const treatment = totalsByDay[d][index];
      const holdout = totalsByDay[d][holdoutIndex];
      if (!valid[d * armCount + index] || !valid[d * armCount + holdoutIndex] || treatment.n < minimumUnits || holdout.n < minimumUnits) {
        lifts[d] = NO_LIFT;
        fixed[d] = NO_FIXED;
        continue;
      }
      const test = twoSampleZTestUnchecked(scratch, treatment, holdout, plan.metric, plan.sides, quantile);
      lifts[d] = { absolute: test.absolute, relative: test.ratioDefined ? Math.expm1(test.logRatio) : null };
      fixed[d] = {
        z: test.zPooled,
        p: test.pPooled,
        ci: [test.lower, test.upper],
        relativeCi: test.ratioDefined ? [test.relativeLower, test.relativeUpper] : null,
        zUnpooled: test.zUnpooled,
      };
      if (test.variance > 0) {
        estimates[d] = test.absolute;
        variances[d] = test.variance;
      }
      if (test.ratioDefined && test.logRatioVariance > 0) {
        logRatios[d] = test.logRatio;
        logRatioVariances[d] = test.logRatioVariance;
      }
    }
    const sequence = alwaysValidSequenceArrays(estimates, variances, { tau: tau!, significanceLevel: armSignificanceLevel });
    const relativeSequence =
      tauRelative === null ? null : alwaysValidSequenceArrays(logRatios, logRatioVariances, { tau: tauRelative, significanceLevel: armSignificanceLevel });
    return { arm, index, fixed, lifts, sequence, relativeSequence };
  });

  const days: DayResult[] = new Array(dayCount);
  const counts: number[] = new Array(armCount);
  const calls: Call[] = new Array(perArm.length);
  const armResults: ArmDayResult[] = new Array(perArm.length);
  let srmP = 1;
  let issuePointer = 0;
  for (let d = 0; d < dayCount; d++) {
    const today = totalsByDay[d];
    let allValid = true;
    let anyUnits = false;
    const arms: Record<string, ArmTotals> = {};
    for (let a = 0; a < armCount; a++) {
      counts[a] = today[a].n;
      if (!valid[d * armCount + a]) allValid = false;
      if (today[a].n > 0) anyUnits = true;
      arms[keys[a]] = today[a];
    }
    let chiSquare: DayResult["health"]["srm"]["chiSquare"] = null;
    let sequentialSrm: DayResult["health"]["srm"]["sequential"] = null;
    if (allValid && anyUnits) {
      // Totals valid ⇒ counts are non-negative integers; shares were normalised above.
      const statistic = sampleRatioChiSquareStatistic(counts, shares);
      chiSquare = { statistic, p: chiSquareSurvival(statistic, armCount - 1) };
      const logBayesFactor = dirichletMultinomialLogBayesFactorUnchecked(counts, shares, srmPriorStrength);
      srmP = Math.min(srmP, Math.exp(-logBayesFactor));
      sequentialSrm = { bayesFactor: Math.exp(logBayesFactor), p: srmP };
    }
    let todaysIssues = NO_ISSUES;
    while (issuePointer < issues.length && issueDays[issuePointer] <= d) {
      if (issueDays[issuePointer] === d || (d === 0 && issueDays[issuePointer] < 0)) {
        if (todaysIssues === NO_ISSUES) todaysIssues = [];
        todaysIssues.push(issues[issuePointer]);
      }
      issuePointer++;
    }
    const healthy = issuePointer === 0 && srmP >= srmSignificanceLevel;
    const dayOfCampaign = d + 1;
    const byArm: Record<string, ArmDayResult> = {};
    for (let k = 0; k < perArm.length; k++) {
      const result = perArm[k];
      const p = result.sequence.p[d];
      const cs: Interval = [result.sequence.lower[d], result.sequence.upper[d]];
      const horizonReached =
        plan.maxDays !== undefined
          ? dayOfCampaign >= plan.maxDays
          : plannedSampleSize !== null &&
            today[result.index].n >= plannedSampleSize[result.arm].treatment &&
            today[holdoutIndex].n >= plannedSampleSize[result.arm].holdout;
      const relative = result.relativeSequence;
      // expm1 is increasing, so the running intersection on the log scale is the one on the ratio scale.
      const relativeCs: Interval | null = relative === null ? null : [Math.expm1(relative.lower[d]), Math.expm1(relative.upper[d])];
      const call = decideCall({ healthy, p, cs, relativeCs, significanceLevel: armSignificanceLevel, minimumAbsoluteLift, minimumRelativeLift, horizonReached });
      calls[k] = call;
      armResults[k] = { lift: result.lifts[d], fixed: result.fixed[d], sequential: { p, cs, relativeCs }, call };
      byArm[result.arm] = armResults[k];
    }
    const call = calls.length === 1 ? calls[0] : campaignCall(calls);
    // The campaign call is shown beside the leading arm's numbers, so that arm is one whose own call it is.
    let leading = -1;
    for (let k = 0; k < perArm.length; k++) {
      if (calls[k] === call && (leading < 0 || perArm[k].sequence.p[d] < perArm[leading].sequence.p[d])) leading = k;
    }
    const leadingResult = armResults[leading];
    days[d] = {
      date: dates[d] ?? formatDay(firstDay + d),
      dayNumber: dayOfCampaign,
      arms,
      health: { ok: healthy, issues: todaysIssues, srm: { chiSquare, sequential: sequentialSrm } },
      leadingArm: perArm[leading].arm,
      lift: leadingResult.lift,
      fixed: leadingResult.fixed,
      sequential: leadingResult.sequential,
      call,
      byArm,
    };
  }

  let peekingCost: number | null = null;
  let peekingLooks = 0;
  if (options.peekingCost !== false) {
    const units: number[] = [];
    for (let d = 0; d < dayCount; d++) {
      if (perArm.every((result) => result.fixed[d].z !== null)) units.push(totalsByDay[d].reduce((sum, totals) => sum + totals.n, 0));
    }
    const fractions = lookFractions(units);
    peekingLooks = fractions.length;
    if (fractions.length > 0) peekingCost = naivePeekingError(fractions, { significanceLevel: armSignificanceLevel, sides: plan.sides });
  }

  return {
    tau,
    tauRelative,
    significanceLevel: plan.significanceLevel,
    armSignificanceLevel,
    plannedSampleSize,
    treatmentArms,
    issues,
    days,
    peekingCost,
    peekingLooks,
  };
}

const NO_ISSUES: HealthIssue[] = Object.freeze([]) as unknown as HealthIssue[];
const NO_LIFT: ArmDayResult["lift"] = Object.freeze({ absolute: null, relative: null });
const NO_FIXED: ArmDayResult["fixed"] = Object.freeze({ z: null, p: null, ci: null, relativeCi: null, zUnpooled: null });

function campaignCall(calls: readonly Call[]): Call {
  if (calls.includes("suspect")) return "suspect";
  if (calls.includes("harm")) return "harm";
  if (calls.includes("lift")) return "lift";
  if (calls.every((call) => call === "flat")) return "flat";
  if (calls.includes("horizon")) return "horizon";
  return "collecting";
}
