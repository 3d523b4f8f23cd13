import type { ArmTotals, Call, CampaignPlan, DailyCountRow, Interval } from "./types";
import type { HealthIssue } from "./check-daily-counts";
import type { SampleSize } from "./sample-size-two-proportions";
import type { SequenceLook } from "./always-valid-sequence";
import { alwaysValidSequence } from "./always-valid-sequence";
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
import { twoSampleZTestUnchecked } from "./two-sample-z-test-unchecked";
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
  /** Fixed-horizon z-test: pooled z and p (the naive peek before the horizon), unpooled interval. */
  readonly fixed: {
    readonly z: number | null;
    readonly p: number | null;
    readonly ci: Interval | null;
    readonly relativeCi: Interval | null;
    readonly unpooled: { readonly z: number; readonly p: number } | null;
  };
  /** Always-valid: mSPRT p-value and running-intersected confidence sequences (absolute, relative). */
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
  /** The treatment arm with the smallest always-valid p (plan order on ties); the fields below are its. */
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
 * anytime-valid SRM p below 0.001) makes the day `suspect`; `flat` uses `baselineRate·minimumLift`;
 * `horizon` is day `maxDays`, or without it the day every arm reaches n*. τ is `plan.tau` or
 * {@link tauFromPlan} for the first treatment arm at α/k; the relative sequence runs the mSPRT on
 * log(m_T/m_C) with τ/baseline. The always-valid results are two-sided whatever `sides` is (a
 * conservative one-sided reading). With estimated variances the guarantee is asymptotic
 * (Waudby-Smith et al. 2024).
 * Reference: DESIGN.md §3; Johari, Koomen, Pekelis & Walsh (2022); Lindon & Malek (2022);
 * Armitage, McPherson & Rowe (1969). Complexity: O(days · arms) plus one peeking-cost recursion.
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

  const issues = checkDailyCounts(rows, { metric: plan.metric, arms: keys });
  const armIndex = new Map(keys.map((key, index) => [key, index]));
  let firstDay = Infinity;
  let lastDay = -Infinity;
  const parsed: { day: number; arm: number; row: DailyCountRow }[] = [];
  for (const row of rows) {
    const day = dayNumber(row?.date);
    const arm = armIndex.get(row?.arm);
    if (day === null || arm === undefined || !Number.isFinite(row.n) || !Number.isFinite(row.sum) || !Number.isFinite(row.sumSq)) continue;
    parsed.push({ day, arm, row });
    if (day < firstDay) firstDay = day;
    if (day > lastDay) lastDay = day;
  }
  const dayCount = parsed.length === 0 ? 0 : lastDay - firstDay + 1;
  const dates: string[] = new Array(dayCount);
  for (const { day, row } of parsed) dates[day - firstDay] = row.date;
  const armCount = keys.length;
  const added = new Float64Array(dayCount * armCount * 3);
  for (const { day, arm, row } of parsed) {
    const offset = ((day - firstDay) * armCount + arm) * 3;
    added[offset] += row.n;
    added[offset + 1] += row.sum;
    added[offset + 2] += row.sumSq;
  }
  const issueDays = issues.map((issue) => (issue.date === null ? -Infinity : dayNumber(issue.date)! - firstDay));

  const totalsByDay: ArmTotals[][] = [];
  const running = new Float64Array(armCount * 3);
  for (let d = 0; d < dayCount; d++) {
    const today: ArmTotals[] = [];
    for (let a = 0; a < armCount; a++) {
      const offset = (d * armCount + a) * 3;
      running[a * 3] += added[offset];
      running[a * 3 + 1] += added[offset + 1];
      running[a * 3 + 2] += added[offset + 2];
      today.push({ n: running[a * 3], sum: running[a * 3 + 1], sumSq: running[a * 3 + 2] });
    }
    totalsByDay.push(today);
  }
  const valid = totalsByDay.map((today) => today.map((totals) => totalsAreValid(totals, plan.metric)));
  const minimumUnits = plan.metric === "conversion" ? 1 : 2;
  const quantile = normalQuantile(1 - armSignificanceLevel / plan.sides);
  const holdoutIndex = armIndex.get(HOLDOUT_ARM)!;

  const perArm = treatmentArms.map((arm) => {
    const index = armIndex.get(arm)!;
    const fixed: ArmDayResult["fixed"][] = [];
    const lifts: ArmDayResult["lift"][] = [];
    const looks: SequenceLook[] = [];
    const relativeLooks: SequenceLook[] = [];
    for (let d = 0; d < dayCount; d++) {
      const treatment = totalsByDay[d][index];
      const holdout = totalsByDay[d][holdoutIndex];
      if (!valid[d][index] || !valid[d][holdoutIndex] || treatment.n < minimumUnits || holdout.n < minimumUnits) {
        fixed.push({ z: null, p: null, ci: null, relativeCi: null, unpooled: null });
        lifts.push({ absolute: null, relative: null });
        looks.push(null);
        relativeLooks.push(null);
        continue;
      }
      const test = twoSampleZTestUnchecked(treatment, holdout, plan.metric, plan.sides, quantile);
      fixed.push({ z: test.pooled.z, p: test.pooled.p, ci: test.ci.absolute, relativeCi: test.ci.relative, unpooled: test.unpooled });
      lifts.push({ absolute: test.absolute, relative: test.relative });
      const lift = test.lift;
      looks.push(lift.variance > 0 ? { estimate: lift.absolute, variance: lift.variance } : null);
      relativeLooks.push(
        tauRelative !== null && lift.logRatio !== null && lift.logRatioVariance !== null && lift.logRatioVariance > 0
          ? { estimate: lift.logRatio, variance: lift.logRatioVariance }
          : null,
      );
    }
    const sequence = alwaysValidSequence(looks, { tau: tau!, significanceLevel: armSignificanceLevel });
    const relativeSequence =
      tauRelative === null ? null : alwaysValidSequence(relativeLooks, { tau: tauRelative, significanceLevel: armSignificanceLevel });
    return { arm, index, fixed, lifts, sequence, relativeSequence };
  });

  const days: DayResult[] = [];
  let srmP = 1;
  let issuePointer = 0;
  for (let d = 0; d < dayCount; d++) {
    const today = totalsByDay[d];
    const counts = today.map((totals) => totals.n);
    let chiSquare: DayResult["health"]["srm"]["chiSquare"] = null;
    let sequentialSrm: DayResult["health"]["srm"]["sequential"] = null;
    if (valid[d].every(Boolean) && counts.some((count) => count > 0)) {
      // Totals valid ⇒ counts are non-negative integers; shares were normalised above.
      const statistic = sampleRatioChiSquareStatistic(counts, shares);
      chiSquare = { statistic, p: chiSquareSurvival(statistic, armCount - 1) };
      const logBayesFactor = dirichletMultinomialLogBayesFactorUnchecked(counts, shares, srmPriorStrength);
      srmP = Math.min(srmP, Math.exp(-logBayesFactor));
      sequentialSrm = { bayesFactor: Math.exp(logBayesFactor), p: srmP };
    }
    const arms: Record<string, ArmTotals> = {};
    for (let a = 0; a < armCount; a++) arms[keys[a]] = today[a];
    const todaysIssues: HealthIssue[] = [];
    while (issuePointer < issues.length && issueDays[issuePointer] <= d) {
      if (issueDays[issuePointer] === d || (d === 0 && issueDays[issuePointer] < 0)) todaysIssues.push(issues[issuePointer]);
      issuePointer++;
    }
    const healthy = issuePointer === 0 && srmP >= srmSignificanceLevel;
    const dayOfCampaign = d + 1;
    const byArm: Record<string, ArmDayResult> = {};
    let leading = perArm[0];
    const calls: Call[] = [];
    for (const result of perArm) {
      const step = result.sequence[d];
      const horizonReached =
        plan.maxDays !== undefined
          ? dayOfCampaign >= plan.maxDays
          : plannedSampleSize !== null &&
            today[result.index].n >= plannedSampleSize[result.arm].treatment &&
            today[holdoutIndex].n >= plannedSampleSize[result.arm].holdout;
      const call = decideCall({ healthy, p: step.p, cs: step.cs, significanceLevel: armSignificanceLevel, minimumAbsoluteLift, horizonReached });
      calls.push(call);
      byArm[result.arm] = {
        lift: result.lifts[d],
        fixed: result.fixed[d],
        sequential: { p: step.p, cs: step.cs, relativeCs: result.relativeSequence === null ? null : relativeInterval(result.relativeSequence[d].cs) },
        call,
      };
      if (step.p < leading.sequence[d].p) leading = result;
    }
    const leadingResult = byArm[leading.arm];
    days.push({
      date: dates[d] ?? formatDay(firstDay + d),
      dayNumber: dayOfCampaign,
      arms,
      health: { ok: healthy, issues: todaysIssues.length === 0 ? NO_ISSUES : todaysIssues, srm: { chiSquare, sequential: sequentialSrm } },
      leadingArm: leading.arm,
      lift: leadingResult.lift,
      fixed: leadingResult.fixed,
      sequential: leadingResult.sequential,
      call: campaignCall(calls),
      byArm,
    });
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

function totalsAreValid(totals: ArmTotals, metric: CampaignPlan["metric"]): boolean {
  return armTotalsProblem(totals, metric) === null;
}

function relativeInterval([lower, upper]: Interval): Interval {
  return [Math.expm1(lower), Math.expm1(upper)];
}

function campaignCall(calls: readonly Call[]): Call {
  if (calls.includes("suspect")) return "suspect";
  if (calls.includes("harm")) return "harm";
  if (calls.includes("lift")) return "lift";
  if (calls.every((call) => call === "flat")) return "flat";
  if (calls.includes("horizon")) return "horizon";
  return "collecting";
}
