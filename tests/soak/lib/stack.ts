import { startThrowawayStack, type ThrowawayStack } from "../../../scripts/lib/stack";

/** The build folder of the soak runs: apart from every other engineer's, the tests' and the benches'. */
export const SOAK_DIST_DIR = process.env.NEXT_DIST_DIR ?? ".next-soak";

export type SoakStack = ThrowawayStack;

function log(message: string): void {
  process.stderr.write(`[soak] ${message}\n`);
}

/**
 * A throwaway world for one soak run (see `startThrowawayStack`): PostgreSQL in /dev/shm, the mail
 * catcher and, with `app`, the production app built into `.next-soak` when a source is newer than that build (or
 * with `--rebuild`). Ctrl-C, SIGTERM and an uncaught error stop it all before the process ends.
 */
export async function startSoakStack(options: { app: boolean; fast?: boolean }): Promise<SoakStack> {
  const stack = await startThrowawayStack({
    app: options.app,
    fast: options.fast,
    distDir: SOAK_DIST_DIR,
    prefix: "peeksafe-soak-",
    rebuild: process.argv.includes("--rebuild"),
    // `--reuse-build`: serve the build folder as it is, even when a source is newer (a quick re-run while others edit).
    reuseBuild: process.argv.includes("--reuse-build"),
    log,
  });
  const stopAndExit = (code: number) => () => {
    void stack.stop().finally(() => process.exit(code));
  };
  const onSigint = stopAndExit(130);
  const onSigterm = stopAndExit(143);
  const onCrash = (error: unknown) => {
    console.error(error);
    stopAndExit(1)();
  };
  process.once("SIGINT", onSigint);
  process.once("SIGTERM", onSigterm);
  process.once("uncaughtException", onCrash);
  process.once("unhandledRejection", onCrash);
  return {
    ...stack,
    stop: async () => {
      process.off("SIGINT", onSigint);
      process.off("SIGTERM", onSigterm);
      process.off("uncaughtException", onCrash);
      process.off("unhandledRejection", onCrash);
      await stack.stop();
    },
  };
}
