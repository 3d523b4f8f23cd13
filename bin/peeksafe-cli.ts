import { parseArgs } from "node:util";
import { z } from "zod";
import { parseCountsCsv } from "../lib/counts-csv";
import {
  analyzeCampaign,
  durationDays,
  equalFractions,
  fisherExactTest,
  HEALTH_DEFAULTS,
  HOLDOUT_ARM,
  naivePeekingError,
  sampleRatioChiSquare,
  spendingBoundaries,
  tauFromPlan,
  twoSampleZTest,
  dirichletMultinomialLogBayesFactor,
  type CampaignPlan,
} from "../lib/sequential";

/** What one run of the command line produced. */
export interface CliResult {
  readonly exitCode: 0 | 1 | 2;
  readonly stdout: string;
  readonly stderr: string;
}

/** A bad-input error: printed as one line on stderr, exit code 2. */
class InputError extends Error {}

export const USAGE =
  "usage: peeksafe <ztest|plan|analyze|boundaries|peeking-cost|srm> [options] (see bin/peeksafe.ts for each command's options)";

const probability = (name: string) =>
  z.coerce.number({ error: `--${name} must be a number` }).gt(0, `--${name} must be in (0, 1)`).lt(1, `--${name} must be in (0, 1)`);
const positive = (name: string) => z.coerce.number({ error: `--${name} must be a number` }).positive(`--${name} must be > 0`);
const sides = z.enum(["1", "2"], { error: "--sides must be 1 or 2" }).default("2").transform((value) => Number(value) as 1 | 2);
const numberList = (name: string) =>
  z.string({ error: `--${name} is required` }).transform((text, context) => {
    const values = text.split(",").map((part) => (part.trim() === "" ? NaN : Number(part.trim())));
    if (values.some((value) => !Number.isFinite(value))) {
      context.addIssue({ code: "custom", message: `--${name} must be numbers separated by commas, got "${text}"` });
      return z.NEVER;
    }
    return values;
  });
const ratio = (name: string) =>
  z
    .string({ error: `--${name} is required, as conversions/units (e.g. 120/1000)` })
    .regex(/^\d+\/\d+$/, `--${name} must be conversions/units, e.g. 120/1000`)
    .transform((text) => text.split("/").map(Number))
    .refine(([x, n]) => n >= 1 && x <= n, `--${name} needs units ≥ 1 and conversions ≤ units`)
    .transform(([x, n]) => ({ n, sum: x, sumSq: x }));

const schemas = {
  ztest: z.object({ treatment: ratio("treatment"), holdout: ratio("holdout"), sides, alpha: probability("alpha").default(0.05) }),
  plan: z.object({
    baseline: probability("baseline"),
    mde: z.coerce.number({ error: "--mde must be a number" }).refine((value) => Number.isFinite(value) && value !== 0, "--mde must be a non-zero relative lift, e.g. 0.1"),
    alpha: probability("alpha").default(0.05),
    power: probability("power").default(0.8),
    sides,
    "holdout-share": probability("holdout-share").default(0.5),
    "daily-units": positive("daily-units").optional(),
  }),
  analyze: z.object({
    counts: z.string({ error: "--counts FILE.csv is required" }).min(1),
    alpha: probability("alpha").default(0.05),
    tau: positive("tau").optional(),
    baseline: positive("baseline").optional(),
    mde: z.coerce.number({ error: "--mde must be a number" }).positive("--mde must be > 0").optional(),
    power: probability("power").optional(),
    sd: positive("sd").optional(),
    sides,
    "max-days": z.coerce.number({ error: "--max-days must be a number" }).int("--max-days must be a whole number").positive("--max-days must be ≥ 1").optional(),
    "holdout-share": probability("holdout-share").optional(),
  }),
  boundaries: z.object({
    fractions: numberList("fractions"),
    alpha: probability("alpha"),
    sides,
    spending: z.enum(["obf", "pocock", "hsd"], { error: "--spending must be obf, pocock or hsd" }),
    gamma: z.coerce.number({ error: "--gamma must be a number" }).optional(),
  }),
  "peeking-cost": z
    .object({
      looks: z.coerce.number({ error: "--looks must be a number" }).int("--looks must be a whole number").min(1, "--looks must be ≥ 1").max(10000, "--looks must be ≤ 10000").optional(),
      fractions: numberList("fractions").optional(),
      alpha: probability("alpha").default(0.05),
    })
    .refine((value) => (value.looks === undefined) !== (value.fractions === undefined), "give exactly one of --looks K or --fractions F1,...,1"),
  srm: z.object({
    counts: numberList("counts"),
    shares: numberList("shares"),
    "prior-strength": positive("prior-strength").default(HEALTH_DEFAULTS.srmPriorStrength),
  }),
} as const;

type Command = keyof typeof schemas;

/**
 * Runs the `peeksafe` command line on `argv` (without node and the script) and returns what it
 * printed: one JSON object on stdout and exit 0; on bad input one line on stderr and exit 2.
 * A thin shell over lib/sequential — `analyze` is exactly {@link analyzeCampaign}.
 */
export function runCli(argv: readonly string[], readFile: (path: string) => string): CliResult {
  try {
    const [command, ...rest] = argv;
    if (command === undefined || command === "--help" || command === "help") return { exitCode: command ? 0 : 2, stdout: command ? `${USAGE}\n` : "", stderr: command ? "" : `${USAGE}\n` };
    if (!(command in schemas)) throw new InputError(`unknown command "${command}"; ${USAGE}`);
    const values = readOptions(command as Command, rest);
    const output = execute(command as Command, values, readFile);
    return { exitCode: 0, stdout: `${JSON.stringify(output, finiteOrNull)}\n`, stderr: "" };
  } catch (error) {
    if (error instanceof InputError || error instanceof RangeError) return { exitCode: 2, stdout: "", stderr: `peeksafe: ${oneLine(error.message)}\n` };
    return { exitCode: 1, stdout: "", stderr: `peeksafe: unexpected error: ${oneLine(error instanceof Error ? error.message : String(error))}\n` };
  }
}

const OPTION_NAMES: Record<Command, readonly string[]> = {
  ztest: ["treatment", "holdout", "sides", "alpha"],
  plan: ["baseline", "mde", "alpha", "power", "sides", "holdout-share", "daily-units"],
  analyze: ["counts", "alpha", "tau", "baseline", "mde", "power", "sd", "sides", "max-days", "holdout-share"],
  boundaries: ["fractions", "alpha", "sides", "spending", "gamma"],
  "peeking-cost": ["looks", "fractions", "alpha"],
  srm: ["counts", "shares", "prior-strength"],
};

function readOptions(command: Command, rest: readonly string[]): Record<string, unknown> {
  const allowed = OPTION_NAMES[command];
  let parsed;
  try {
    parsed = parseArgs({
      args: [...rest],
      options: Object.fromEntries(allowed.map((name) => [name, { type: "string" as const }])),
      strict: true,
      allowPositionals: false,
    });
  } catch (error) {
    throw new InputError(`${command}: ${error instanceof Error ? error.message.split("\n")[0] : String(error)}`);
  }
  const result = schemas[command].safeParse(parsed.values);
  if (!result.success) {
    const issue = result.error.issues[0];
    throw new InputError(`${command}: ${issue.message}`);
  }
  return result.data as Record<string, unknown>;
}

function execute(command: Command, values: Record<string, unknown>, readFile: (path: string) => string): unknown {
  switch (command) {
    case "ztest": {
      const v = values as z.infer<(typeof schemas)["ztest"]>;
      const test = twoSampleZTest(v.treatment, v.holdout, { sides: v.sides, significanceLevel: v.alpha });
      const fisher = fisherExactTest(
        [
          [v.treatment.sum, v.treatment.n - v.treatment.sum],
          [v.holdout.sum, v.holdout.n - v.holdout.sum],
        ],
        v.sides === 1 ? "greater" : "two-sided",
      );
      return { ...test, fisher };
    }
    case "plan": {
      const v = values as z.infer<(typeof schemas)["plan"]>;
      const planned = tauFromPlan({
        metric: "conversion",
        baselineRate: v.baseline,
        minimumLift: v.mde,
        significanceLevel: v.alpha,
        power: v.power,
        sides: v.sides,
        holdoutShare: v["holdout-share"],
      });
      const size = planned.sampleSize;
      return {
        perArm: { treatment: size.treatment, holdout: size.holdout },
        total: size.total,
        days: v["daily-units"] === undefined ? null : durationDays(size.total, v["daily-units"]),
        tau: planned.tau,
        horizonVariance: planned.horizonVariance,
      };
    }
    case "analyze":
      return analyze(values as z.infer<(typeof schemas)["analyze"]>, readFile);
    case "boundaries": {
      const v = values as z.infer<(typeof schemas)["boundaries"]>;
      return spendingBoundaries({ informationFractions: v.fractions, significanceLevel: v.alpha, sides: v.sides, spending: v.spending, gamma: v.gamma });
    }
    case "peeking-cost": {
      const v = values as { looks?: number; fractions?: number[]; alpha: number };
      const fractions = v.fractions ?? equalFractions(v.looks!);
      return { errorRate: naivePeekingError(fractions, { significanceLevel: v.alpha, sides: 2 }), looks: fractions.length, significanceLevel: v.alpha };
    }
    case "srm": {
      const v = values as z.infer<(typeof schemas)["srm"]>;
      const chiSquare = sampleRatioChiSquare(v.counts, v.shares);
      const logBayesFactor = dirichletMultinomialLogBayesFactor(v.counts, v.shares, v["prior-strength"]);
      return {
        chiSquare: { statistic: chiSquare.statistic, p: chiSquare.p, degreesOfFreedom: chiSquare.degreesOfFreedom },
        sequential: { bayesFactor: Math.exp(logBayesFactor), p: Math.min(1, Math.exp(-logBayesFactor)), priorStrength: v["prior-strength"] },
      };
    }
  }
}

function analyze(v: z.infer<(typeof schemas)["analyze"]>, readFile: (path: string) => string): unknown {
  let text: string;
  try {
    text = readFile(v.counts);
  } catch {
    throw new InputError(`analyze: cannot read ${v.counts}`);
  }
  const csv = parseCountsCsv(text);
  if (csv.errors.length > 0) {
    const more = csv.errors.length > 1 ? ` (and ${csv.errors.length - 1} more bad lines)` : "";
    throw new InputError(`analyze: ${v.counts} line ${csv.errors[0].line}: ${csv.errors[0].reason}${more}`);
  }
  if (csv.rows.length === 0) throw new InputError(`analyze: ${v.counts} has no rows`);
  const arms = [...new Set(csv.rows.map((row) => row.arm))];
  if (!arms.includes(HOLDOUT_ARM)) throw new InputError(`analyze: ${v.counts} has no rows for the arm "${HOLDOUT_ARM}"`);
  const treatments = arms.filter((arm) => arm !== HOLDOUT_ARM);
  if (treatments.length === 0) throw new InputError(`analyze: ${v.counts} has no treatment arm besides "${HOLDOUT_ARM}"`);
  const holdoutShare = v["holdout-share"] ?? 1 / arms.length;
  const hasPlan = v.baseline !== undefined && v.mde !== undefined;
  if (v.tau === undefined && !hasPlan) throw new InputError("analyze: give --tau, or --baseline and --mde (with --power, default 0.8) to derive it");
  if (csv.metric === "conversion" && v.baseline !== undefined && v.baseline >= 1) throw new InputError("analyze: --baseline must be a rate in (0, 1) for a conversion metric");
  if (csv.metric === "mean" && hasPlan && v.tau === undefined && v.sd === undefined) throw new InputError("analyze: a mean metric needs --sd (planned standard deviation) to derive tau, or --tau");
  const plan: CampaignPlan = {
    metric: csv.metric!,
    significanceLevel: v.alpha,
    sides: v.sides,
    power: hasPlan ? (v.power ?? 0.8) : v.power,
    baselineRate: v.baseline,
    minimumLift: v.mde,
    standardDeviation: v.sd,
    tau: v.tau,
    maxDays: v["max-days"],
    arms: [
      { key: HOLDOUT_ARM, share: holdoutShare },
      ...treatments.map((key) => ({ key, share: (1 - holdoutShare) / treatments.length })),
    ],
  };
  const rows = csv.rows.map(({ date, arm, n, sum, sumSq }) => ({ date, arm, n, sum, sumSq }));
  return analyzeCampaign(plan, rows);
}

/** JSON has no ±Infinity: an open interval end is printed as null. */
function finiteOrNull(_key: string, value: unknown): unknown {
  return typeof value === "number" && !Number.isFinite(value) ? null : value;
}

function oneLine(text: string): string {
  return text.replace(/\s+/g, " ").trim();
}
