// Timing check for the group-sequential numerics (not a test): npx tsx bench/group-sequential.ts
import { equalFractions } from "../lib/sequential/equal-fractions";
import { naivePeekingError } from "../lib/sequential/naive-peeking-error";
import { obrienFlemingConstant } from "../lib/sequential/obrien-fleming-constant";
import { pocockConstant } from "../lib/sequential/pocock-constant";
import { crossingProbabilities } from "../lib/sequential/recursive-integration-crossing";
import { spendingBoundaries } from "../lib/sequential/spending-boundaries";

function time(label: string, budgetMs: number | undefined, run: () => unknown, repeats = 5): void {
  // CPU time of this process as well as wall time: on a busy machine the wall time mostly measures the others.
  const cpuMs = () => {
    const usage = process.cpuUsage();
    return (usage.user + usage.system) / 1000;
  };
  const first = performance.now();
  run();
  const cold = performance.now() - first;
  const times: number[] = [];
  const cpu: number[] = [];
  for (let i = 0; i < repeats; i += 1) {
    const start = performance.now();
    const startCpu = cpuMs();
    run();
    cpu.push(cpuMs() - startCpu);
    times.push(performance.now() - start);
  }
  const median = (values: number[]) => [...values].sort((a, b) => a - b)[Math.floor(values.length / 2)];
  const wall = median(times);
  const verdict = budgetMs === undefined ? "" : wall <= budgetMs ? ` (budget ${budgetMs} ms: ok)` : ` (budget ${budgetMs} ms: OVER)`;
  console.log(
    `${label.padEnd(50)} cold ${cold.toFixed(1).padStart(6)} ms  median ${wall.toFixed(1).padStart(6)} ms  cpu ${median(cpu).toFixed(1).padStart(6)} ms${verdict}`,
  );
}

for (const looks of [10, 30, 100, 365]) {
  time(`naivePeekingError, ${looks} equal looks`, looks === 100 ? 40 : undefined, () => naivePeekingError(equalFractions(looks)));
}
for (const spending of ["obf", "pocock"] as const) {
  time(`spendingBoundaries ${spending}, 20 looks, two-sided`, 50, () =>
    spendingBoundaries({ informationFractions: equalFractions(20), significanceLevel: 0.05, spending }),
  );
}
time("spendingBoundaries hsd(−4), 20 looks, one-sided", 50, () =>
  spendingBoundaries({ informationFractions: equalFractions(20), significanceLevel: 0.025, sides: 1, spending: "hsd", gamma: -4 }),
);
time("pocockConstant(5, 0.05)", undefined, () => pocockConstant(5, 0.05), 3);
time("obrienFlemingConstant(5, 0.05)", undefined, () => obrienFlemingConstant(5, 0.05), 3);

// Accuracy of the 100-look peeking cost against a much finer grid (r = 48, Richardson from 48 and 96).
const fractions = equalFractions(100);
const fine = crossingProbabilities(fractions, fractions.map(() => 1.959963984540054), "symmetric", 48).total[99];
console.log(`100-look peeking cost ${naivePeekingError(fractions).toFixed(10)}, finer grid ${fine.toFixed(10)}, difference ${(naivePeekingError(fractions) - fine).toExponential(2)}`);
