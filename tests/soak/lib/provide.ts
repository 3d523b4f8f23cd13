import type { ProvidedContext } from "vitest";

/**
 * Lets the test factories (which read the app's address with vitest's `inject`) run in a soak script
 * outside vitest: `inject` reads the worker state's `providedContext`, so a script sets that global.
 */
export function provideTestContext(context: ProvidedContext): void {
  const state = globalThis as unknown as { __vitest_worker__?: { providedContext: ProvidedContext } };
  state.__vitest_worker__ = { providedContext: context };
}
