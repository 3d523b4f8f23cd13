import { z } from "zod";
import type { CampaignStatus } from "@/db/schema/campaigns";
// The one helper, not the engine barrel: the campaign form ships this schema to the browser.
import { dayNumber } from "@/lib/sequential/day-number";

/** The holdout arm's key in every plan (the statistics engine looks for it). */
export const HOLDOUT_KEY = "holdout";

/** Arm keys: what the pipeline and the CSV name an arm by. */
export const ARM_KEY_PATTERN = /^[a-z0-9][a-z0-9_-]{0,63}$/;

export const MAX_CAMPAIGN_DAYS = 366;

/** A calendar day `YYYY-MM-DD` that exists (2026-02-30 does not). */
export const calendarDaySchema = z
  .string()
  .regex(/^\d{4}-\d{2}-\d{2}$/, "Use a date YYYY-MM-DD")
  .refine((value) => dayNumber(value) !== null, "Not a calendar day");

export const armSchema = z.object({
  key: z.string().trim().regex(ARM_KEY_PATTERN, "Lower-case letters, digits, - or _, at most 64"),
  name: z.string().trim().min(1, "Name the arm").max(80, "At most 80 characters"),
  share: z.number({ error: "Enter a share" }).gt(0, "A share is above 0").lt(1, "A share is below 1"),
});

export const metricSchema = z.object({
  kind: z.enum(["conversion", "mean"]),
  name: z.string().trim().min(1, "Name the metric").max(80, "At most 80 characters"),
  unit: z.string().trim().max(16, "At most 16 characters").optional(),
});

const planFields = {
  metric: metricSchema,
  /** Conversion metric: the holdout's expected rate in (0, 1). */
  baselineRate: z.number().gt(0, "Above 0").lt(1, "Below 1").optional(),
  /** Mean metric: the holdout's expected mean and standard deviation per unit. */
  baselineMean: z.number().refine((value) => value !== 0 && Number.isFinite(value), "A non-zero number").optional(),
  baselineSd: z.number().gt(0, "Above 0").optional(),
  minimumLift: z.number({ error: "Enter the minimum lift" }).gt(0, "Above 0").max(10, "At most 1000 %"),
  alpha: z.number({ error: "Enter α" }).gt(0, "Above 0").max(0.2, "At most 0.2"),
  power: z.number({ error: "Enter the power" }).min(0.5, "At least 0.5").lt(1, "Below 1"),
  sides: z.union([z.literal(1), z.literal(2)], { error: "1 or 2" }),
  arms: z.array(armSchema).min(2, "A holdout and at least one treatment").max(8, "At most 8 arms"),
};

type PlanShape = {
  metric: { kind: "conversion" | "mean" };
  baselineRate?: number;
  baselineMean?: number;
  baselineSd?: number;
  minimumLift: number;
  arms: { key: string; share: number }[];
};

/** Cross-field rules of a plan, shared by create and edit. */
function checkPlan(plan: PlanShape, context: z.RefinementCtx): void {
  if (plan.metric.kind === "conversion") {
    if (plan.baselineRate === undefined) {
      context.addIssue({ code: "custom", path: ["baselineRate"], message: "Enter the baseline conversion rate" });
    } else if (plan.baselineRate * (1 + plan.minimumLift) >= 1) {
      context.addIssue({ code: "custom", path: ["minimumLift"], message: "Baseline × (1 + lift) must stay below 100 %" });
    }
  } else {
    if (plan.baselineMean === undefined) context.addIssue({ code: "custom", path: ["baselineMean"], message: "Enter the baseline mean" });
    if (plan.baselineSd === undefined) context.addIssue({ code: "custom", path: ["baselineSd"], message: "Enter the standard deviation" });
  }
  const keys = plan.arms.map((arm) => arm.key);
  const holdouts = keys.filter((key) => key === HOLDOUT_KEY).length;
  if (holdouts !== 1) context.addIssue({ code: "custom", path: ["arms"], message: `Exactly one arm must have the key "${HOLDOUT_KEY}"` });
  keys.forEach((key, index) => {
    if (keys.indexOf(key) !== index) context.addIssue({ code: "custom", path: ["arms", index, "key"], message: "Arm keys must be unique" });
  });
  const total = plan.arms.reduce((sum, arm) => sum + arm.share, 0);
  if (Math.abs(total - 1) > 1e-6) {
    context.addIssue({ code: "custom", path: ["arms"], message: `Shares must add up to 100 % (now ${(total * 100).toFixed(1)} %)` });
  }
}

/** The plan part of a campaign: what is locked once counts exist. */
export const campaignPlanSchema = z.object(planFields).superRefine(checkPlan);
export type CampaignPlanInput = z.infer<typeof campaignPlanSchema>;

/** Register a campaign: the form and `POST /api/v1/campaigns` parse with this one schema. */
export const createCampaignSchema = z
  .object({
    name: z.string().trim().min(1, "Name the campaign").max(120, "At most 120 characters"),
    hypothesis: z.string().trim().max(2000, "At most 2000 characters").default(""),
    ...planFields,
    startDate: calendarDaySchema,
    maxDays: z.number({ error: "Enter the maximum duration" }).int("Whole days").min(1, "At least 1 day").max(MAX_CAMPAIGN_DAYS, `At most ${MAX_CAMPAIGN_DAYS} days`),
    dailyUnits: z.number().int("Whole units").min(1, "At least 1 a day").max(1_000_000_000, "At most 10⁹ a day").nullable().optional(),
  })
  .strict()
  .superRefine(checkPlan);
export type CreateCampaignInput = z.infer<typeof createCampaignSchema>;

// The statuses are spelled here, not imported from db/schema (drizzle would follow this schema into the
// campaign form's browser bundle); tsc checks that both lists name the same statuses.
const CAMPAIGN_STATUSES = ["draft", "running", "paused", "ended", "archived"] as const satisfies readonly CampaignStatus[];
const everyStatusListed: Exclude<CampaignStatus, (typeof CAMPAIGN_STATUSES)[number]> extends never ? true : false = true;
void everyStatusListed;

/** A lifecycle move. */
export const campaignStatusSchema = z.enum(CAMPAIGN_STATUSES);

/**
 * `PATCH /api/v1/campaigns/:id`: a lifecycle move, details, or a new plan. A plan change once counts
 * exist needs an admin and a written `reason`.
 */
export const updateCampaignSchema = z
  .object({
    status: campaignStatusSchema.optional(),
    name: z.string().trim().min(1, "Name the campaign").max(120, "At most 120 characters").optional(),
    hypothesis: z.string().trim().max(2000, "At most 2000 characters").optional(),
    plan: campaignPlanSchema.optional(),
    startDate: calendarDaySchema.optional(),
    maxDays: z.number().int("Whole days").min(1, "At least 1 day").max(MAX_CAMPAIGN_DAYS).optional(),
    dailyUnits: z.number().int("Whole units").min(1).max(1_000_000_000).nullable().optional(),
    reason: z.string().trim().min(10, "Explain the change in at least 10 characters").max(2000).optional(),
  })
  .strict()
  .refine((value) => Object.keys(value).some((key) => key !== "reason"), "Nothing to change");
export type UpdateCampaignInput = z.infer<typeof updateCampaignSchema>;

export const listCampaignsQuerySchema = z.object({
  status: campaignStatusSchema.optional(),
});

/** A campaign is named in URLs and ingest rows by its id (uuid) or its slug. */
export const campaignReferenceSchema = z
  .string()
  .trim()
  .min(1)
  .max(140)
  // PostgreSQL refuses a NUL in text with an error, not "no such row": stop control characters here.
  .regex(/^[^\u0000-\u001f\u007f]*$/, "A campaign id or slug has no control characters");

export const UUID_PATTERN = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;
