import { randomBytes } from "node:crypto";
import { rmSync } from "node:fs";
import path from "node:path";
import { buildApp, buildIsStale, startApp, type RunningApp } from "./app-server";
import { startMailCatcher, type MailCatcher } from "./mail-catcher";
import { migrateDatabase } from "./migrate";
import { freePort, startCluster, type RunningCluster } from "./postgres-cluster";
import { createScratchFolder, reapScratchFolders } from "./scratch-folders";

export interface ThrowawayStackOptions {
  /** Start the production build of the app too (else only PostgreSQL and the mail catcher). */
  app: boolean;
  /** No fsync and no full-page writes (default true): the data is thrown away anyway. */
  fast?: boolean;
  /** The Next build folder the app is built into and served from. */
  distDir: string;
  /** Prefix of the scratch folder in /dev/shm, e.g. `peeksafe-bench-`. */
  prefix: string;
  /** Build even when `distDir` already holds a build. */
  rebuild?: boolean;
  /** Serve `distDir` as it is, never building (tests: the run's global setup built it; a build under a running app breaks it). */
  reuseBuild?: boolean;
  log?: (message: string) => void;
}

export interface ThrowawayStack {
  databaseUrl: string;
  appUrl?: string;
  app?: RunningApp;
  cluster: RunningCluster;
  mail: MailCatcher;
  env: NodeJS.ProcessEnv;
  /** Stops what was started and removes the scratch folder; safe to call twice. */
  stop(): Promise<void>;
}

/** The app's environment on a throwaway stack: a fresh signing secret, loopback addresses, quiet logs, no sign-in limits. */
export function throwawayEnv(parts: { databaseUrl: string; appPort: number; mail: { smtpPort: number; httpPort: number } }): NodeJS.ProcessEnv {
  return {
    ...process.env,
    DATABASE_URL: parts.databaseUrl,
    BETTER_AUTH_SECRET: randomBytes(32).toString("base64url"),
    APP_URL: `http://127.0.0.1:${parts.appPort}`,
    SMTP_URL: `smtp://127.0.0.1:${parts.mail.smtpPort}`,
    MAIL_CATCHER_URL: `http://127.0.0.1:${parts.mail.httpPort}`,
    AUTH_RATE_LIMIT: "off",
    LOG_LEVEL: "warn",
  };
}

/**
 * A throwaway world for one long run (bench or soak): PostgreSQL in /dev/shm, migrated, the mail
 * catcher and, with `app`, the production app on a loopback port, built into `distDir` when a source is
 * newer than its build (or with `rebuild`), so a run never measures yesterday's code.
 */
export async function startThrowawayStack(options: ThrowawayStackOptions): Promise<ThrowawayStack> {
  const log = options.log ?? (() => {});
  for (const folder of reapScratchFolders(options.prefix)) log(`removed ${folder}, left behind by a killed run`);
  const root = createScratchFolder(options.prefix);
  const started: { cluster?: RunningCluster; mail?: MailCatcher; app?: RunningApp } = {};
  let stopped = false;
  const stop = async () => {
    if (stopped) return;
    stopped = true;
    await started.app?.stop();
    await started.mail?.stop();
    started.cluster?.stop();
    rmSync(root, { recursive: true, force: true });
  };
  try {
    const cluster = await startCluster({ root: path.join(root, "pg"), port: await freePort(), database: "peeksafe", fast: options.fast ?? true });
    started.cluster = cluster;
    await migrateDatabase(cluster.url);
    const mail = await startMailCatcher({ smtpPort: await freePort(), httpPort: await freePort() });
    started.mail = mail;
    const appPort = await freePort();
    const env: NodeJS.ProcessEnv = { ...throwawayEnv({ databaseUrl: cluster.url, appPort, mail }), NEXT_DIST_DIR: options.distDir };
    process.env.DATABASE_URL = cluster.url;
    if (options.app) {
      if (options.rebuild || (!options.reuseBuild && buildIsStale(process.cwd(), options.distDir))) {
        log(`building the app into ${options.distDir}`);
        buildApp(env);
      }
      started.app = await startApp({ port: appPort, env, quiet: true });
      log(`app on ${started.app.url} (pid ${started.app.child.pid}), PostgreSQL on 127.0.0.1:${cluster.port}`);
    }
    return { databaseUrl: cluster.url, appUrl: started.app?.url, app: started.app, cluster, mail, env, stop };
  } catch (error) {
    await stop();
    throw error;
  }
}
