/**
 * The group-sequential numerics against R's rpact on the same machine, same run.
 *
 * `npm run bench:rpact` runs `bench/reference/rpact-timing.R` (median of 20 calls of
 * `getDesignGroupSequential(kMax = 20, alpha = 0.05, sided = 2, typeOfDesign = "asOF")` and of
 * `getGroupSequentialProbabilities` for a naive two-sided 1.96 test at 20 equal looks), times the
 * engine's `spendingBoundaries` (O'Brien–Fleming-type spending, 20 looks) and `naivePeekingError`
 * (20 and 100 looks) the same way, and prints the ratios with the largest difference in the values.
 * Prints one clear line and stops when Debian's r-cran-rpact is not installed.
 * Writes bench/results/rpact.json.
 */
import { spawnSync } from "node:child_process";
import { equalFractions } from "../lib/sequential/equal-fractions";
import { naivePeekingError } from "../lib/sequential/naive-peeking-error";
import { spendingBoundaries } from "../lib/sequential/spending-boundaries";
import { machineLine, printTable, writeResults } from "./lib/stack";

const TARGETS = { boundariesFasterThanRpact: true, peekingWithinFactorOfRpact: 2, hundredLooksMs: 40 };

function medianMs(run: () => unknown, repeats = 20): { wallMs: number; cpuMs: number } {
  run();
  const wall: number[] = [];
  const cpu: number[] = [];
  for (let i = 0; i < repeats; i++) {
    const startCpu = process.cpuUsage();
    const start = performance.now();
    run();
    wall.push(performance.now() - start);
    const used = process.cpuUsage(startCpu);
    cpu.push((used.user + used.system) / 1000);
  }
  const median = (values: number[]) => Math.round([...values].sort((a, b) => a - b)[Math.floor(values.length / 2)] * 1000) / 1000;
  return { wallMs: median(wall), cpuMs: median(cpu) };
}

const r = spawnSync("Rscript", ["bench/reference/rpact-timing.R"], { encoding: "utf8" });
if (r.error || r.status !== 0) {
  console.log(`rpact is not installed (Rscript: ${r.error?.message ?? r.stderr.trim().split("\n").at(-1)}); skipping the rpact comparison. Install Debian's r-cran-rpact to run it.`);
  process.exit(0);
}
const reference = JSON.parse(r.stdout.trim().split("\n").at(-1)!) as { rpact: string; designMs: number; probabilitiesMs: number; criticalValues: (number | null)[]; peekingError20: number; hundredLooks: string };

const fractions20 = equalFractions(20);
const boundaries = spendingBoundaries({ informationFractions: fractions20, significanceLevel: 0.05, spending: "obf" });
const boundaryTime = medianMs(() => spendingBoundaries({ informationFractions: fractions20, significanceLevel: 0.05, spending: "obf" }));
const peeking20 = naivePeekingError(fractions20);
// The engine remembers curves by their exact inputs; each timed call asks for a level 1e-15 apart, so every
// call computes its curve instead of returning a remembered one.
let calls = 0;
const freshLevel = () => ({ significanceLevel: 0.05 + ++calls * 1e-15 });
const peekingTime = medianMs(() => naivePeekingError(fractions20, freshLevel()));
const fractions100 = equalFractions(100);
const hundredTime = medianMs(() => naivePeekingError(fractions100, freshLevel()));
const finite = reference.criticalValues.map((value, index) => [value, boundaries.z[index]] as const).filter((pair): pair is readonly [number, number] => pair[0] !== null && Number.isFinite(pair[0]) && Number.isFinite(pair[1]));
const boundaryDifference = Math.max(...finite.map(([theirs, ours]) => Math.abs(theirs - ours)));

const machine = machineLine();
const results = {
  bench: "rpact",
  ranAt: new Date().toISOString(),
  machine,
  rpact: reference.rpact,
  targets: TARGETS,
  boundaries20: { oursMs: boundaryTime, rpactMs: reference.designMs, ratio: Math.round((boundaryTime.wallMs / reference.designMs) * 1000) / 1000, largestZDifference: boundaryDifference, meetsTarget: boundaryTime.wallMs < reference.designMs },
  peeking20: { oursMs: peekingTime, rpactMs: reference.probabilitiesMs, ratio: Math.round((peekingTime.wallMs / reference.probabilitiesMs) * 100) / 100, ours: peeking20, rpactValue: reference.peekingError20, difference: Math.abs(peeking20 - reference.peekingError20), meetsTarget: peekingTime.wallMs <= 2 * reference.probabilitiesMs },
  peeking100: { oursMs: hundredTime, rpactAnswer: reference.hundredLooks, meetsTarget: hundredTime.wallMs < TARGETS.hundredLooksMs },
};
console.log(`\nGroup-sequential numerics vs rpact ${reference.rpact} (Rscript, same machine; median of 20 calls each)`);
console.log(`machine: ${machine.cpus} CPUs, load average ${machine.loadAverage.join(" / ")}, Node ${machine.node}\n`);
printTable([
  { step: "20-look OBF-type spending boundaries", "ours ms": boundaryTime.wallMs, "ours CPU ms": boundaryTime.cpuMs, "rpact ms": reference.designMs, "ours/rpact": results.boundaries20.ratio, "max |Δ|": boundaryDifference.toExponential(2), target: "< rpact", met: results.boundaries20.meetsTarget ? "yes" : "NO" },
  { step: "20-look naive peeking error", "ours ms": peekingTime.wallMs, "ours CPU ms": peekingTime.cpuMs, "rpact ms": reference.probabilitiesMs, "ours/rpact": results.peeking20.ratio, "max |Δ|": results.peeking20.difference.toExponential(2), target: "≤ 2× rpact", met: results.peeking20.meetsTarget ? "yes" : "NO" },
  { step: "100-look naive peeking error", "ours ms": hundredTime.wallMs, "ours CPU ms": hundredTime.cpuMs, "rpact ms": "refused", "ours/rpact": "", "max |Δ|": "", target: "< 40 ms", met: results.peeking100.meetsTarget ? "yes" : "NO" },
]);
console.log(`\nrpact on 100 looks: ${reference.hundredLooks}`);
console.log(`wrote ${writeResults("rpact", results)}`);
