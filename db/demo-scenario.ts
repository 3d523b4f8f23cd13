// The demo scenario of Northwind Outfitters: invented campaigns with seeded daily counts, pushed
// through the ingest service (batches and revisions are real). Not a sample dataset from elsewhere.
import { getCampaign } from "@/db/queries/campaigns";
import { changeCampaign } from "@/lib/campaigns/change-campaign";
import { registerCampaign } from "@/lib/campaigns/create-campaign";
import { ingestBatch } from "@/lib/ingest/ingest-batch";
import { todayIn } from "@/lib/ingest/today-in";
import type { CreateCampaignInput } from "@/lib/validation/campaigns";
import type { IngestRow } from "@/lib/validation/ingest";

/** How one arm behaves day by day. */
interface ArmBehaviour {
  key: string;
  name: string;
  share: number;
  /** Conversion rate, or for a mean metric the chance that a unit buys at all. */
  rate: number;
  /** Mean metric: average order value of a unit that buys (log-normal, in the metric's unit). */
  orderValue?: number;
  /** Realised share of the traffic when it differs from the planned share (a sample-ratio mismatch). */
  actualShare?: number;
}

export interface DemoCampaignSpec {
  slug: string;
  name: string;
  hypothesis: string;
  metric: CreateCampaignInput["metric"];
  baselineRate?: number;
  baselineMean?: number;
  baselineSd?: number;
  minimumLift: number;
  maxDays: number;
  dailyUnits: number;
  /** Days of counts pushed so far (the campaign started this many days before today). */
  daysOfData: number;
  arms: ArmBehaviour[];
  /** A day whose counts the pipeline resends with corrected values (a real revision). */
  revisedDay?: number;
}

/** The Northwind Outfitters campaigns: one per situation the dashboards must show. */
export const DEMO_CAMPAIGNS: DemoCampaignSpec[] = [
  {
    slug: "trail-shoe-spring-e-mail",
    name: "Trail shoe spring e-mail",
    hypothesis: "The spring trail-shoe e-mail lifts first purchases among newsletter subscribers.",
    metric: { kind: "conversion", name: "First purchase" },
    baselineRate: 0.04,
    minimumLift: 0.1,
    maxDays: 42,
    dailyUnits: 24_000,
    daysOfData: 30,
    arms: [
      { key: "holdout", name: "Holdout", share: 0.1, rate: 0.04 },
      { key: "treatment", name: "Spring e-mail", share: 0.9, rate: 0.0492 },
    ],
    revisedDay: 3,
  },
  {
    slug: "winter-jacket-push-nudge",
    name: "Winter jacket push nudge",
    hypothesis: "A late-evening push reminder about winter jackets brings lapsed app users back to buy.",
    metric: { kind: "conversion", name: "Purchase within 7 days" },
    baselineRate: 0.06,
    minimumLift: 0.08,
    maxDays: 35,
    dailyUnits: 16_000,
    daysOfData: 26,
    arms: [
      { key: "holdout", name: "Holdout", share: 0.5, rate: 0.06 },
      { key: "treatment", name: "Evening push", share: 0.5, rate: 0.0525 },
    ],
  },
  {
    slug: "free-shipping-banner",
    name: "Free-shipping banner",
    hypothesis: "A site-wide free-shipping banner raises checkout completion by at least 10 %.",
    metric: { kind: "conversion", name: "Checkout completed" },
    baselineRate: 0.05,
    minimumLift: 0.1,
    maxDays: 56,
    dailyUnits: 30_000,
    daysOfData: 40,
    arms: [
      { key: "holdout", name: "Holdout", share: 0.5, rate: 0.05 },
      { key: "treatment", name: "Banner", share: 0.5, rate: 0.0501 },
    ],
  },
  {
    slug: "tent-weekend-promo-order-value",
    name: "Tent weekend promo order value",
    hypothesis: "The weekend tent promotion raises order value per recipient.",
    metric: { kind: "mean", name: "Order value per recipient", unit: "USD" },
    baselineMean: 4.2,
    baselineSd: 24,
    minimumLift: 0.1,
    maxDays: 42,
    dailyUnits: 6_000,
    daysOfData: 22,
    arms: [
      { key: "holdout", name: "Holdout", share: 0.1, rate: 0.05, orderValue: 84 },
      { key: "treatment", name: "Weekend promo", share: 0.9, rate: 0.051, orderValue: 85 },
    ],
  },
  {
    slug: "headlamp-bundle-onboarding",
    name: "Headlamp bundle onboarding",
    hypothesis: "Offering a headlamp bundle during onboarding lifts first orders of new accounts.",
    metric: { kind: "conversion", name: "First order" },
    baselineRate: 0.08,
    minimumLift: 0.1,
    maxDays: 35,
    dailyUnits: 10_000,
    daysOfData: 24,
    arms: [
      { key: "holdout", name: "Holdout", share: 0.5, rate: 0.08, actualShare: 0.47 },
      { key: "treatment", name: "Bundle offer", share: 0.5, rate: 0.082, actualShare: 0.53 },
    ],
  },
  {
    slug: "backpack-referral-offer",
    name: "Backpack referral offer",
    hypothesis: "A referral reward (10 % off or a free gift) gets customers to refer friends who buy a backpack.",
    metric: { kind: "conversion", name: "Referred purchase" },
    baselineRate: 0.03,
    minimumLift: 0.15,
    maxDays: 49,
    dailyUnits: 18_000,
    daysOfData: 21,
    arms: [
      { key: "holdout", name: "Holdout", share: 0.2, rate: 0.03 },
      { key: "treatment", name: "10 % off", share: 0.4, rate: 0.0312 },
      { key: "variant-b", name: "Free gift", share: 0.4, rate: 0.0306 },
    ],
  },
];

/** Mulberry32: a small seeded generator, uniform in [0, 1). */
export function seededRandom(seed: number): () => number {
  let state = seed >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

function standardNormal(random: () => number): number {
  const u = Math.max(random(), 1e-12);
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * random());
}

/** Binomial draw by its normal approximation (the demo's arms have hundreds of expected successes). */
function binomialDraw(random: () => number, n: number, p: number): number {
  const draw = Math.round(n * p + Math.sqrt(n * p * (1 - p)) * standardNormal(random));
  return Math.min(n, Math.max(0, draw));
}

function hashSeed(text: string, seed: number): number {
  let hash = seed >>> 0;
  for (let i = 0; i < text.length; i++) hash = Math.imul(hash ^ text.charCodeAt(i), 2654435761) >>> 0;
  return hash;
}

function addDays(day: string, offset: number): string {
  const date = new Date(`${day}T00:00:00Z`);
  date.setUTCDate(date.getUTCDate() + offset);
  return date.toISOString().slice(0, 10);
}

/** A weekly rhythm of traffic (weekends busier for an outdoor retailer), around 1. */
function weekdayFactor(day: string): number {
  const weekday = new Date(`${day}T00:00:00Z`).getUTCDay();
  return weekday === 0 || weekday === 6 ? 1.2 : 0.92;
}

/** The daily rows of one campaign, deterministic for a seed; `day` 0 is the start date. */
export function generateDemoRows(spec: DemoCampaignSpec, startDate: string, seed: number): IngestRow[] {
  const random = seededRandom(hashSeed(spec.slug, seed));
  const rows: IngestRow[] = [];
  for (let day = 0; day < spec.daysOfData; day++) {
    const date = addDays(startDate, day);
    const traffic = spec.dailyUnits * weekdayFactor(date) * (1 + 0.05 * standardNormal(random));
    for (const arm of spec.arms) {
      const units = Math.max(1, Math.round(traffic * (arm.actualShare ?? arm.share)));
      if (spec.metric.kind === "conversion") {
        rows.push({ campaign: spec.slug, arm: arm.key, date, units, conversions: binomialDraw(random, units, arm.rate) });
      } else {
        const buyers = binomialDraw(random, units, arm.rate);
        let sum = 0;
        let sumSquares = 0;
        for (let i = 0; i < buyers; i++) {
          // log-normal order value with the given mean and a coefficient of variation of about 0.6
          const value = Math.round(arm.orderValue! * Math.exp(0.55 * standardNormal(random) - 0.15) * 100) / 100;
          sum += value;
          sumSquares += value * value;
        }
        rows.push({ campaign: spec.slug, arm: arm.key, date, units, sum: Math.round(sum * 100) / 100, sumSquares: Math.round(sumSquares * 100) / 100 + 1 });
      }
    }
  }
  return rows;
}

export interface SeedDemoOptions {
  /** The member the campaigns are registered by (a marketer): they receive the alerts. */
  createdBy: string;
  /** An admin who moves the campaigns to running. */
  adminUserId: string;
  /** Seed of the generator; the same seed gives the same counts. */
  seed?: number;
  /** The workspace's time zone: "today" is taken there (UTC by default). */
  timeZone?: string;
  /** Today, `YYYY-MM-DD`, to pin the dates (tests); defaults to today in `timeZone`. */
  today?: string;
}

export interface SeededDemoCampaign {
  slug: string;
  id: string;
  created: boolean;
  rows: number;
}

/**
 * Registers the demo campaigns of a workspace, starts them and pushes their seeded daily counts
 * (dates relative to today in the workspace time zone, up to yesterday) through the ingest service.
 * A campaign that already exists is left as it is, so a second run adds nothing.
 */
export async function seedDemoCampaigns(workspaceId: string, options: SeedDemoOptions): Promise<SeededDemoCampaign[]> {
  const seed = options.seed ?? 20_260_301;
  const today = options.today ?? todayIn(options.timeZone ?? "UTC");
  const seeded: SeededDemoCampaign[] = [];
  for (const spec of DEMO_CAMPAIGNS) {
    const found = await getCampaign(workspaceId, spec.slug);
    if (found) {
      seeded.push({ slug: spec.slug, id: found.id, created: false, rows: 0 });
      continue;
    }
    const startDate = addDays(today, -spec.daysOfData);
    const input: CreateCampaignInput = {
      name: spec.name,
      hypothesis: spec.hypothesis,
      metric: spec.metric,
      baselineRate: spec.baselineRate,
      baselineMean: spec.baselineMean,
      baselineSd: spec.baselineSd,
      minimumLift: spec.minimumLift,
      alpha: 0.05,
      power: 0.8,
      sides: 2,
      arms: spec.arms.map((arm) => ({ key: arm.key, name: arm.name, share: arm.share })),
      startDate,
      maxDays: spec.maxDays,
      dailyUnits: spec.dailyUnits,
    };
    const registered = await registerCampaign(workspaceId, options.createdBy, input);
    if (registered.slug !== spec.slug) throw new Error(`demo campaign "${spec.name}" got the slug ${registered.slug}, expected ${spec.slug}`);
    await changeCampaign(workspaceId, registered.id, { userId: options.adminUserId, role: "admin" }, { status: "running" });
    const rows = generateDemoRows(spec, startDate, seed);
    const weeks = Math.ceil(spec.daysOfData / 7);
    for (let week = 0; week < weeks; week++) {
      const first = addDays(startDate, week * 7);
      const last = addDays(startDate, week * 7 + 6);
      const batch = rows.filter((row) => row.date >= first && row.date <= last);
      await ingestBatch({ workspaceId, source: "api", idempotencyKey: `demo:${spec.slug}:${first}`, rows: batch, userId: null });
    }
    if (spec.revisedDay !== undefined) {
      const date = addDays(startDate, spec.revisedDay);
      const corrected = rows
        .filter((row) => row.date === date)
        .map((row) => ({ ...row, units: row.units + 40, ...(row.conversions !== undefined ? { conversions: row.conversions + 2 } : {}) }));
      await ingestBatch({ workspaceId, source: "api", idempotencyKey: `demo:${spec.slug}:${date}:late-events`, rows: corrected, userId: null });
    }
    seeded.push({ slug: spec.slug, id: registered.id, created: true, rows: rows.length });
  }
  return seeded;
}
