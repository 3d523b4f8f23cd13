import type { Sides } from "./types";

/**
 * Argument guard: throws unless `sides` is 1 or 2.
 *
 * Reference: none (input validation). Complexity: O(1).
 *
 * @param functionName - the public function whose rule is broken, named in the message
 * @param sides - the sidedness to check
 * @returns nothing
 * @throws RangeError("<functionName> requires sides 1 or 2, got …")
 * @example requireSides("twoSampleZTest", 2) // passes
 */
export function requireSides(functionName: string, sides: number): asserts sides is Sides {
  if (sides !== 1 && sides !== 2) {
    throw new RangeError(`${functionName} requires sides 1 or 2, got ${String(sides)}`);
  }
}
