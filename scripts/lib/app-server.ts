import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import { existsSync, readdirSync, statSync } from "node:fs";
import path from "node:path";

const SOURCE_FOLDERS = ["app", "components", "lib", "db", "public"];
const SOURCE_FILES = ["next.config.ts", "instrumentation-client.ts", "tailwind.config.ts", "postcss.config.mjs", "proxy.ts", "package-lock.json", "tsconfig.json"];

function newestMtime(target: string): number {
  if (!existsSync(target)) return 0;
  const stat = statSync(target);
  if (!stat.isDirectory()) return stat.mtimeMs;
  let newest = stat.mtimeMs;
  for (const entry of readdirSync(target)) newest = Math.max(newest, newestMtime(path.join(target, entry)));
  return newest;
}

/** True when `.next` is missing or older than any source the build reads. */
export function buildIsStale(root = process.cwd(), distDir = process.env.NEXT_DIST_DIR ?? ".next"): boolean {
  const buildId = path.join(root, distDir, "BUILD_ID");
  if (!existsSync(buildId)) return true;
  const built = statSync(buildId).mtimeMs;
  const sources = [...SOURCE_FOLDERS, ...SOURCE_FILES].map((name) => newestMtime(path.join(root, name)));
  return Math.max(...sources) > built;
}

/** Runs `next build` with the given environment; throws when it fails. */
export function buildApp(env: NodeJS.ProcessEnv): void {
  const result = spawnSync(path.resolve("node_modules/.bin/next"), ["build"], {
    stdio: "inherit",
    env: productionEnv(env),
  });
  if (result.status !== 0) throw new Error(`next build failed with exit code ${result.status}`);
}

export interface RunningApp {
  url: string;
  child: ChildProcess;
  stop(): Promise<void>;
}

/** The environment minus a test runner's markers (better-auth turns its origin checks off when TEST is set). */
export function productionEnv(env: NodeJS.ProcessEnv): NodeJS.ProcessEnv {
  const clean: Record<string, string | undefined> = {};
  for (const [name, value] of Object.entries(env)) {
    if (name === "TEST" || name.startsWith("VITEST")) continue;
    clean[name] = value;
  }
  return { ...clean, NODE_ENV: "production", NEXT_TELEMETRY_DISABLED: "1" };
}

/** Starts `next start` on 127.0.0.1 and waits until /api/health answers. */
export async function startApp(options: { port: number; env: NodeJS.ProcessEnv; quiet?: boolean }): Promise<RunningApp> {
  const url = `http://127.0.0.1:${options.port}`;
  const child = spawn(
    path.resolve("node_modules/.bin/next"),
    ["start", "--hostname", "127.0.0.1", "--port", String(options.port)],
    {
      env: { ...productionEnv(options.env), APP_URL: options.env.APP_URL ?? url },
      stdio: options.quiet ? ["ignore", "ignore", "inherit"] : ["ignore", "inherit", "inherit"],
    },
  );
  const deadline = Date.now() + 60_000;
  for (;;) {
    if (child.exitCode !== null) throw new Error(`next start exited with code ${child.exitCode}`);
    try {
      const response = await fetch(`${url}/api/health`);
      if (response.ok) break;
    } catch {
      // not listening yet
    }
    if (Date.now() > deadline) {
      child.kill("SIGTERM");
      throw new Error("next start did not answer /api/health within 60 s");
    }
    await new Promise((resolve) => setTimeout(resolve, 250));
  }
  return {
    url,
    child,
    stop: () =>
      new Promise<void>((resolve) => {
        // A process ended by a signal has no exit code, only a signal code; its "exit" has fired already.
        if (child.exitCode !== null || child.signalCode !== null) return resolve();
        child.once("exit", () => resolve());
        child.kill("SIGTERM");
        setTimeout(() => child.kill("SIGKILL"), 5000).unref();
      }),
  };
}
