/**
 * Speed of the statistics engine, measured in one run (`npm run bench:sequential`); prints figures,
 * it is not a timed test. Targets (issue 3): 10,000 campaigns × 90 days × 2 arms with every daily
 * statistic under 1 s on one core; the 100-look peeking cost under 40 ms; 20-look spending
 * boundaries under 50 ms. Every figure is also given as a ratio to the bare mSPRT update over the
 * same 10,000 × 90 campaign-days, measured in this run, so machines of different speed compare.
 */
import { analyzeCampaign, dayNumber, equalFractions, formatDay, naivePeekingError, spendingBoundaries, type CampaignPlan, type DailyCountRow } from "../lib/sequential";

const CAMPAIGNS = 10_000;
const DAYS = 90;
const plan: CampaignPlan = {
  metric: "conversion",
  significanceLevel: 0.05,
  power: 0.8,
  sides: 2,
  baselineRate: 0.1,
  minimumLift: 0.1,
  maxDays: DAYS,
  arms: [
    { key: "holdout", share: 0.5 },
    { key: "treatment", share: 0.5 },
  ],
};

let state = 20260301;
const uniform = () => {
  state = (state + 0x6d2b79f5) >>> 0;
  let t = state;
  t = Math.imul(t ^ (t >>> 15), t | 1);
  t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
  return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
};
const normal = () => Math.sqrt(-2 * Math.log(1 - uniform())) * Math.cos(2 * Math.PI * uniform());

// Seeded synthetic counts: 200–2,000 units a day per arm, 10 % baseline, true lifts between −5 % and +15 %.
const start = dayNumber("2026-01-01")!;
const dates = Array.from({ length: DAYS }, (_, d) => formatDay(start + d));
const campaigns: DailyCountRow[][] = [];
const units = new Float64Array(CAMPAIGNS * DAYS * 2);
const conversions = new Float64Array(CAMPAIGNS * DAYS * 2);
for (let c = 0; c < CAMPAIGNS; c++) {
  const perDay = 200 + Math.floor(uniform() * 1800);
  const lift = -0.05 + 0.2 * uniform();
  const rows: DailyCountRow[] = [];
  for (let d = 0; d < DAYS; d++) {
    for (let a = 0; a < 2; a++) {
      const rate = a === 0 ? 0.1 : 0.1 * (1 + lift);
      const x = Math.max(0, Math.min(perDay, Math.round(perDay * rate + Math.sqrt(perDay * rate * (1 - rate)) * normal())));
      rows.push({ date: dates[d], arm: a === 0 ? "holdout" : "treatment", n: perDay, sum: x, sumSq: x });
      units[(c * DAYS + d) * 2 + a] = perDay;
      conversions[(c * DAYS + d) * 2 + a] = x;
    }
  }
  campaigns.push(rows);
}

/** The bare mSPRT update: cumulative sums, Δ, V, log Λ and the running minimum p, nothing else. */
function bareMsprt(tau: number): number {
  const tauSquared = tau * tau;
  let checksum = 0;
  for (let c = 0; c < CAMPAIGNS; c++) {
    let nT = 0, xT = 0, nC = 0, xC = 0, p = 1;
    for (let d = 0; d < DAYS; d++) {
      const i = (c * DAYS + d) * 2;
      nC += units[i]; xC += conversions[i]; nT += units[i + 1]; xT += conversions[i + 1];
      const mT = xT / nT, mC = xC / nC;
      const variance = (mT * (1 - mT)) / nT + (mC * (1 - mC)) / nC;
      const lift = mT - mC;
      const logRatio = -0.5 * Math.log1p(tauSquared / variance) + (tauSquared * lift * lift) / (2 * variance * (variance + tauSquared));
      p = Math.min(p, Math.exp(-logRatio));
    }
    checksum += p;
  }
  return checksum;
}

/** Wall-clock and CPU time (user + system, all threads of this process, so GC helpers count) of one call. */
function time<T>(work: () => T): { ms: number; cpuMs: number; value: T } {
  const cpu = process.cpuUsage();
  const begin = performance.now();
  const value = work();
  const used = process.cpuUsage(cpu);
  return { ms: performance.now() - begin, cpuMs: (used.user + used.system) / 1000, value };
}

const tau = analyzeCampaign(plan, campaigns[0], { peekingCost: false }).tau;
// Warm-up, so every figure is optimized code (the worker runs all day): the bare loop twice, the
// engine on 500 campaigns — one call is not enough for V8 to reach its optimizing tier.
bareMsprt(tau);
bareMsprt(tau);
for (let c = 0; c < 500; c++) analyzeCampaign(plan, campaigns[c], { peekingCost: false });
const bare = time(() => bareMsprt(tau));
const analyzeAll = () => {
  let calls = 0;
  for (const rows of campaigns) if (analyzeCampaign(plan, rows, { peekingCost: false }).days[DAYS - 1].call !== "collecting") calls++;
  return calls;
};
// The first pass still pays for V8's tiering on fresh data; the second is the worker's steady state.
const firstPass = time(analyzeAll);
const engine = time(analyzeAll);
naivePeekingError(equalFractions(100));
// The engine remembers curves by their exact inputs: a level 1e-15 apart per call makes each one compute.
let peekingCalls = 0;
const peeking = time(() => naivePeekingError(equalFractions(100), { significanceLevel: 0.05 + ++peekingCalls * 1e-15 }));
spendingBoundaries({ informationFractions: equalFractions(20), significanceLevel: 0.05, spending: "obf" });
const boundaries = time(() => spendingBoundaries({ informationFractions: equalFractions(20), significanceLevel: 0.05, spending: "obf" }));
const withPeeking = time(() => {
  for (let c = 0; c < 100; c++) analyzeCampaign(plan, campaigns[c]);
});

const line = (label: string, figure: { ms: number; cpuMs: number }, target: string, divisor = 1) =>
  console.log(
    `${label.padEnd(58)} ${(figure.ms / divisor).toFixed(1).padStart(8)} ms wall ${(figure.cpuMs / divisor).toFixed(1).padStart(8)} ms cpu` +
      `  ${(figure.ms / bare.ms).toFixed(2).padStart(6)}× bare  (${target})`,
  );
console.log(`Peeksafe statistics bench — node ${process.version}, one run after a warm-up (engine: 500 campaigns); load average ${(await import("node:os")).loadavg()[0].toFixed(1)}`);
line(`bare mSPRT update, ${CAMPAIGNS.toLocaleString("en")} campaigns × ${DAYS} days × 2 arms`, bare, "reference, about 100 ms");
line("analyzeCampaign, every daily statistic, first pass", firstPass, "includes JIT tiering on fresh data");
line("analyzeCampaign, every daily statistic, second pass", engine, "target < 1000 ms");
line("naive peeking cost, 100 equally spaced looks", peeking, "target < 40 ms");
line("spending boundaries, 20 looks, O'Brien–Fleming type", boundaries, "target < 50 ms");
line("analyzeCampaign + final-day peeking cost, per campaign", withPeeking, "once per analysis; mean of 100", 100);
console.log(
  `(${engine.value.toLocaleString("en")} of ${CAMPAIGNS.toLocaleString("en")} campaigns end with a call other than collecting; ` +
    `100-look peeking cost ${peeking.value.toFixed(4)}; last 20-look boundary z ${boundaries.value.z.at(-1)!.toFixed(4)})`,
);
