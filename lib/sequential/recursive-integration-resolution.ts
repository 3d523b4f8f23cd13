/**
 * Kernel width (standard deviation of z_k given z_{k−1}) below which the grid is refined in
 * proportion, so that many closely spaced looks keep Simpson's rule accurate.
 */
const NARROW_KERNEL = 0.1;

/**
 * Refinement stops here (grid step 0.00075 in the middle), which resolves kernels down to a
 * width of about 0.0015: consecutive looks with Δt/t ≥ 2.3e-6. Closer looks lose accuracy.
 */
const FINEST_RESOLUTION = 1000;

/**
 * Grid parameter for one look of the recursive integration: the base parameter r, raised in
 * proportion when the Brownian-motion kernel to the next look, or from the previous one, is
 * narrower than 0.1 on the z scale (sd √(Δt/t)), so that the grid spacing keeps pace with it.
 *
 * Reference: the grid of Jennison & Turnbull (2000), *Group Sequential Methods with
 * Applications to Clinical Trials*, §19.2, spaced 1.5/r in the middle; Simpson's rule needs a
 * spacing small against the width of the integrand (our own rule, checked by grid refinement in
 * tests/sequential/naive-peeking-error.test.ts).
 * Complexity: O(1).
 *
 * @param resolution - the base grid parameter r, an integer ≥ 2
 * @param fractions - strictly increasing information fractions of every look
 * @param look - the 0-based index of the look whose grid is being built
 * @returns an integer ≥ resolution, raised at most to max(resolution, 1000)
 * @throws RangeError when look is not an index of fractions or resolution is not an integer ≥ 2
 * @example lookResolution(16, [0.5, 0.995, 1], 1) // 23: the next look is close
 */
export function lookResolution(resolution: number, fractions: readonly number[], look: number): number {
  if (!Number.isInteger(look) || look < 0 || look >= fractions.length) {
    throw new RangeError(`lookResolution requires a look index in [0, ${fractions.length - 1}], got ${look}`);
  }
  if (!Number.isInteger(resolution) || resolution < 2) {
    throw new RangeError(`lookResolution requires an integer resolution ≥ 2, got ${resolution}`);
  }
  const fraction = fractions[look];
  let increment = look + 1 < fractions.length ? fractions[look + 1] - fraction : fraction;
  if (look > 0) increment = Math.min(increment, fraction - fractions[look - 1]);
  const kernelWidth = Math.sqrt(increment / fraction);
  if (kernelWidth >= NARROW_KERNEL) return resolution;
  return Math.max(resolution, Math.min(FINEST_RESOLUTION, Math.ceil((resolution * NARROW_KERNEL) / kernelWidth)));
}
