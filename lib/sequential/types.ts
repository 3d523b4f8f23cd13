/**
 * Shared types of the statistics engine. Pure data, no behaviour.
 */

/** Sidedness of a test: 1 = one-sided (treatment > holdout), 2 = two-sided. */
export type Sides = 1 | 2;

/** A conversion metric (outcome 0/1, so sum = sumSq = conversions) or a mean metric (e.g. revenue per unit). */
export type MetricKind = "conversion" | "mean";

/** The daily call, in precedence order suspect > harm > lift > flat > horizon > collecting. */
export type Call = "collecting" | "lift" | "harm" | "flat" | "horizon" | "suspect";

/**
 * Sufficient statistics of one arm: `n` units, `sum` of the outcome, `sumSq` of the squared outcome.
 * A conversion metric has `sum = sumSq = conversions`.
 */
export interface ArmTotals {
  readonly n: number;
  readonly sum: number;
  readonly sumSq: number;
}

/** A closed interval `[lower, upper]`; a one-sided bound uses ±Infinity for the open end. */
export type Interval = [lower: number, upper: number];

/** One row of daily counts: that day's new (not cumulative) totals for one arm. */
export interface DailyCountRow {
  /** ISO 8601 day, `YYYY-MM-DD`. */
  readonly date: string;
  /** Arm key: `holdout` or a treatment key. */
  readonly arm: string;
  readonly n: number;
  readonly sum: number;
  readonly sumSq: number;
}

/** One arm of a plan. */
export interface PlannedArm {
  readonly key: string;
  /** Planned share of the units, in (0, 1); the shares of a plan sum to 1. */
  readonly share: number;
}

/** The campaign plan the engine needs; everything else about a campaign is not statistics. */
export interface CampaignPlan {
  readonly metric: MetricKind;
  /** Overall α in (0, 1), split by Bonferroni across treatment arms. */
  readonly significanceLevel: number;
  /** Planned power in (0, 1); needed with baselineRate and minimumLift for a planned horizon. */
  readonly power?: number;
  readonly sides: Sides;
  /** Baseline conversion rate (or baseline mean of a mean metric). */
  readonly baselineRate?: number;
  /** Minimum lift worth having, relative: 0.10 = +10 %. */
  readonly minimumLift?: number;
  /** Planned standard deviation of the outcome per unit (mean metric only). */
  readonly standardDeviation?: number;
  /** Mixing standard deviation τ of the mSPRT on the absolute lift; derived from the plan when absent. */
  readonly tau?: number;
  /** Planned maximum duration in days; `horizon` is called on that day. */
  readonly maxDays?: number;
  /** The arms with planned shares; the holdout key is `holdout`. */
  readonly arms: readonly PlannedArm[];
}
