import { normalDensity } from "./normal-distribution";
import { integrationGrid, type IntegrationGrid } from "./recursive-integration-grid";

/**
 * The sub-density of the z statistic at one look over the paths that stayed inside the
 * continuation region at every look so far, held on that look's integration grid.
 */
export interface ContinuationDensity {
  /** information fraction (or any information level, same units for every look) of this look */
  readonly fraction: number;
  /** grid nodes on the z scale, ascending */
  readonly points: Float64Array;
  /** Simpson weight × sub-density at each node; the sum is the probability of continuing */
  readonly weightedDensity: Float64Array;
  /** true when the region and the density are symmetric about 0 (two-sided design, no effect) */
  readonly symmetric: boolean;
}

/** Kernel terms beyond this many standard deviations are below e^(−32) of the peak and skipped. */
const KERNEL_REACH = 8;

/**
 * One-look-at-a-time update of the recursive numerical integration for group-sequential tests:
 * from the continuation sub-density of the z statistic at look k − 1, the sub-density at look k
 * over its continuation region (lower, upper), under no effect.
 *
 * With information fractions t, the score S = Z·√t is Brownian motion, so
 * h_k(z) = ∫ h_{k−1}(u) · √(t_k/Δ) · φ((z√t_k − u√t_{k−1})/√Δ) du with Δ = t_k − t_{k−1}, evaluated
 * by Simpson's rule on the previous grid. The first look starts from φ(z). When the region is
 * symmetric and so is the previous density, only half of the nodes are computed and the other
 * half mirrored.
 *
 * Reference: Armitage, McPherson & Rowe (1969), *JRSS A* 132, 235–244; Jennison & Turnbull (2000),
 * *Group Sequential Methods with Applications to Clinical Trials*, ch. 19 (§19.2). Assumes
 * independent normal increments with known variance (the canonical joint distribution).
 * Complexity: O(m_k · w) time, m_k nodes at this look and w ≤ m_{k−1} previous nodes within reach
 * of the kernel, with two exps per run of equally spaced nodes (the kernel is updated by products
 * along a run, in two interleaved chains); grids and their runs are shared by the looks of a pass
 * with the same region and resolution; O(m_k) memory.
 *
 * @param previous - the result at look k − 1, or undefined for the first look
 * @param fraction - information fraction of look k, finite and > 0, above previous.fraction
 * @param lower - lower end of the continuation region on the z scale (−Infinity for none)
 * @param upper - upper end of the continuation region (+Infinity for none), above lower
 * @param resolution - grid parameter r of {@link integrationGrid}, an integer ≥ 2
 * @param into - optional storage for the result's weightedDensity, at least as long as this look's
 *   grid and not the storage of `previous` (a recursion alternates two, so a pass allocates none)
 * @returns the continuation sub-density at look k (its weightedDensity a view of `into` when given)
 * @throws RangeError when fraction is not finite, ≤ 0 or not above previous.fraction; when `into`
 *   is too short or shares storage with previous; and as {@link integrationGrid}
 * @example
 * const first = continuationDensity(undefined, 0.5, -1.96, 1.96, 16);
 * first.weightedDensity.reduce((s, v) => s + v, 0) // ≈ 0.95
 */
export function continuationDensity(
  previous: ContinuationDensity | undefined,
  fraction: number,
  lower: number,
  upper: number,
  resolution: number,
  into?: Float64Array,
): ContinuationDensity {
  if (!(Number.isFinite(fraction) && fraction > 0)) {
    throw new RangeError(`continuationDensity requires a finite fraction > 0, got ${fraction}`);
  }
  if (previous !== undefined && !(fraction > previous.fraction)) {
    throw new RangeError(
      `continuationDensity requires a fraction above the previous look's ${previous.fraction}, got ${fraction}`,
    );
  }
  const grid = cachedGrid(lower, upper, resolution);
  const { points, weights } = grid;
  const count = points.length;
  const symmetric = lower === -upper && (previous === undefined || previous.symmetric);
  if (into !== undefined && (into.length < count || (previous !== undefined && into.buffer === previous.weightedDensity.buffer))) {
    throw new RangeError(`continuationDensity requires storage of ${count} values apart from the previous look's`);
  }
  const weightedDensity = into === undefined ? new Float64Array(count) : into.subarray(0, count);
  const computed = symmetric ? (count + 1) >> 1 : count;

  if (previous === undefined) {
    for (let j = 0; j < computed; j += 1) weightedDensity[j] = weights[j] * normalDensity(points[j]);
  } else {
    const increment = fraction - previous.fraction;
    const rootIncrement = Math.sqrt(increment);
    const rootFraction = Math.sqrt(fraction);
    const halfInverseIncrement = 0.5 / increment;
    const scale = rootFraction / (rootIncrement * Math.sqrt(2 * Math.PI));
    const reach = KERNEL_REACH * rootIncrement;
    const previousCount = previous.points.length;
    const scores = scoresOf(previous, scratch(0, previousCount));
    const runEnd = cachedRuns(previous.points);
    const mass = previous.weightedDensity;
    // ρ = e^(−2·gap²/(2Δ)) depends only on the run, not on the node it is summed for.
    const decays = scratch(1, previousCount);
    for (let i = 0; i + 1 < previousCount; i += 1) {
      const gap = scores[i + 1] - scores[i];
      decays[i] = Math.exp(-2 * gap * gap * halfInverseIncrement);
    }
    let start = 0;
    let end = 0;
    for (let j = 0; j < computed; j += 1) {
      const score = points[j] * rootFraction;
      while (start < previousCount && scores[start] < score - reach) start += 1;
      if (end < start) end = start;
      while (end < previousCount && scores[end] <= score + reach) end += 1;
      let sum = 0;
      let i = start;
      while (i < end) {
        // Along equally spaced nodes the Gaussian kernel follows e_{i+1} = e_i·q_i, q_{i+1} = q_i·ρ:
        // two exps per run instead of one per node.
        const stop = Math.min(end, runEnd[i]);
        const difference = score - scores[i];
        const kernel = Math.exp(-difference * difference * halfInverseIncrement);
        sum += mass[i] * kernel;
        if (i + 1 < stop) {
          const gap = scores[i + 1] - scores[i];
          const ratio = Math.exp((2 * difference * gap - gap * gap) * halfInverseIncrement);
          const decay = decays[i];
          // Two interleaved chains (nodes m and m + 1, each stepping by two) halve the multiply latency.
          let odd = kernel * ratio;
          let ratioEven = ratio * ratio * decay;
          let ratioOdd = ratioEven * decay * decay;
          const decayTwo = decay * decay * decay * decay;
          let m = i + 1;
          let even = kernel;
          for (; m + 1 < stop; m += 2) {
            even *= ratioEven;
            sum += mass[m] * odd + mass[m + 1] * even;
            odd *= ratioOdd;
            ratioEven *= decayTwo;
            ratioOdd *= decayTwo;
          }
          if (m < stop) sum += mass[m] * odd;
        }
        i = stop;
      }
      weightedDensity[j] = weights[j] * scale * sum;
    }
  }
  if (symmetric) {
    for (let j = computed; j < count; j += 1) weightedDensity[j] = weightedDensity[count - 1 - j];
  }
  return { fraction, points, weightedDensity, symmetric };
}

const gridCache = new Map<string, IntegrationGrid>();
const runCache = new WeakMap<Float64Array, Int32Array>();
let lastGrid: { lower: number; upper: number; resolution: number; grid: IntegrationGrid } | undefined;

/** Every look of a pass with the same region and resolution shares one grid (read-only arrays). */
function cachedGrid(lower: number, upper: number, resolution: number): IntegrationGrid {
  const last = lastGrid;
  if (last !== undefined && last.lower === lower && last.upper === upper && last.resolution === resolution) return last.grid;
  const key = `${lower}|${upper}|${resolution}`;
  let grid = gridCache.get(key);
  if (grid === undefined) {
    if (gridCache.size >= 64) gridCache.clear();
    grid = integrationGrid(lower, upper, resolution);
    gridCache.set(key, grid);
  }
  lastGrid = { lower, upper, resolution, grid };
  return grid;
}

/** Runs of equal spacing do not change when the nodes are scaled by √t, so they are kept per grid. */
function cachedRuns(points: Float64Array): Int32Array {
  let runs = runCache.get(points);
  if (runs === undefined) {
    runs = equalSpacingRuns(points);
    runCache.set(points, runs);
  }
  return runs;
}

/** Score-scale nodes S = z·√t of a density, ascending like its z nodes, written into `into`. */
function scoresOf(density: ContinuationDensity, into: Float64Array): Float64Array {
  const root = Math.sqrt(density.fraction);
  for (let i = 0; i < density.points.length; i += 1) into[i] = density.points[i] * root;
  return into;
}

// Per-call working arrays (scores, run decays), reused so a pass allocates only its densities.
const scratchArrays: Float64Array[] = [new Float64Array(256), new Float64Array(256)];

function scratch(slot: number, length: number): Float64Array {
  if (scratchArrays[slot].length < length) scratchArrays[slot] = new Float64Array(Math.max(length, 2 * scratchArrays[slot].length));
  return scratchArrays[slot];
}

/**
 * For each node i, one past the last node of the run of equal spacing that starts at i (runs
 * partition the nodes; a Simpson interval's three nodes are always one run).
 */
function equalSpacingRuns(nodes: Float64Array): Int32Array {
  const count = nodes.length;
  const runEnd = new Int32Array(count);
  let runStart = 0;
  while (runStart < count) {
    let next = runStart + 1;
    if (next < count) {
      const gap = nodes[next] - nodes[runStart];
      while (next + 1 < count && Math.abs(nodes[next + 1] - nodes[next] - gap) <= 1e-9 * gap) next += 1;
    }
    const stop = Math.min(count, next + 1);
    for (let i = runStart; i < stop; i += 1) runEnd[i] = stop;
    runStart = stop;
  }
  return runEnd;
}
