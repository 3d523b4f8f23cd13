/** Quadrature nodes and Simpson weights on the z scale of one look, sorted ascending. */
export interface IntegrationGrid {
  /** the nodes z, ascending; odd positions are interval midpoints */
  readonly points: Float64Array;
  /** Simpson's-rule weight of each node, so that Σ weight·f(point) ≈ ∫ f over the region */
  readonly weights: Float64Array;
}

/**
 * Integration grid of Jennison & Turnbull for one look of a group-sequential design: nodes on the
 * z scale of that look, restricted to its continuation region (lower, upper), with the
 * composite Simpson's-rule weights.
 *
 * The base grid has 6·resolution − 1 points: log-spaced tails beyond ±3 out to
 * ±(3 + 4·log(resolution)) and equal steps of 1.5/resolution on [−3, 3], centred on the mean of
 * the z statistic (0 under no effect). Points outside (lower, upper) are dropped, the finite
 * bounds become end points, and the midpoint of every interval is added, so Simpson's rule
 * applies on each interval. A symmetric region with center 0 gives a grid that is an exact
 * mirror image about 0 (the symmetry the two-sided recursion relies on).
 *
 * Reference: Jennison & Turnbull (2000), *Group Sequential Methods with Applications to Clinical
 * Trials*, Chapman & Hall/CRC, §19.2 (grid and Simpson's rule). Assumes a normal z statistic
 * with unit variance at each look.
 * Complexity: O(resolution) time and memory.
 *
 * @param lower - lower end of the continuation region on the z scale (may be −Infinity)
 * @param upper - upper end of the continuation region (may be +Infinity); must exceed lower
 * @param resolution - the grid parameter r, an integer ≥ 2 (Jennison & Turnbull use 16–32)
 * @param center - the mean of the z statistic at this look, finite; 0 under no effect
 * @returns the nodes and Simpson weights; an odd number of nodes, at least 3
 * @throws RangeError when lower ≥ upper, a bound is NaN, resolution is not an integer ≥ 2 or center is not finite
 * @example integrationGrid(-1.96, 1.96, 16).points.length // 85 (−1.96 … 1.96)
 */
export function integrationGrid(lower: number, upper: number, resolution: number, center = 0): IntegrationGrid {
  if (Number.isNaN(lower) || Number.isNaN(upper) || !(lower < upper)) {
    throw new RangeError(`integrationGrid requires lower < upper, got (${lower}, ${upper})`);
  }
  if (!Number.isInteger(resolution) || resolution < 2) {
    throw new RangeError(`integrationGrid requires an integer resolution ≥ 2, got ${resolution}`);
  }
  if (!Number.isFinite(center)) {
    throw new RangeError(`integrationGrid requires a finite center, got ${center}`);
  }
  const r = resolution;
  // Base points closer to a bound than this are dropped, so no sliver interval is left.
  const sliver = 1e-9 / r;
  const inside = (x: number) => x > lower + sliver && x < upper - sliver;
  const base = (i: number): number => {
    if (i < r) return -3 - 4 * Math.log(r / i);
    if (i <= 5 * r) return -3 + (3 * (i - r)) / (2 * r);
    return 3 + 4 * Math.log(r / (6 * r - i));
  };
  let ends: number[] = [];
  if (center === 0 && lower === -upper) {
    // Built as a mirror image so that node j and node m − 1 − j are exact negatives.
    const half: number[] = [];
    for (let i = 3 * r + 1; i <= 6 * r - 1; i += 1) if (inside(base(i))) half.push(base(i));
    if (Number.isFinite(upper)) half.push(upper);
    ends = [...half.map((x) => -x).reverse(), 0, ...half];
  } else {
    if (Number.isFinite(lower)) ends.push(lower);
    for (let i = 1; i <= 6 * r - 1; i += 1) if (inside(base(i) + center)) ends.push(base(i) + center);
    if (Number.isFinite(upper)) ends.push(upper);
  }
  if (ends.length < 2) {
    // A region narrower than one step of the base grid: its own two ends.
    ends = [Number.isFinite(lower) ? lower : upper - 1, Number.isFinite(upper) ? upper : lower + 1];
  }
  const intervals = ends.length - 1;
  const points = new Float64Array(2 * intervals + 1);
  const weights = new Float64Array(2 * intervals + 1);
  for (let j = 0; j < intervals; j += 1) {
    const left = ends[j];
    const right = ends[j + 1];
    const width = right - left;
    points[2 * j] = left;
    points[2 * j + 1] = 0.5 * (left + right);
    weights[2 * j] += width / 6;
    weights[2 * j + 1] += (4 * width) / 6;
    weights[2 * j + 2] += width / 6;
  }
  points[2 * intervals] = ends[intervals];
  return { points, weights };
}
