import { rmSync } from "node:fs";
import path from "node:path";
import type { TestProject } from "vitest/node";
import { buildApp, buildIsStale, startApp } from "../../scripts/lib/app-server";
import { startMailCatcher } from "../../scripts/lib/mail-catcher";
import { migrateDatabase } from "../../scripts/lib/migrate";
import { freePort, startCluster } from "../../scripts/lib/postgres-cluster";
import { createScratchFolder, reapScratchFolders } from "../../scripts/lib/scratch-folders";
import { throwawayEnv } from "../../scripts/lib/stack";

declare module "vitest" {
  export interface ProvidedContext {
    appUrl: string;
    databaseUrl: string;
    mailUrl: string;
    smtpUrl: string;
    authSecret: string;
  }
}

/**
 * One throwaway world per test run: PostgreSQL in /dev/shm (no fsync), the mail catcher and the
 * production build of the app, all on loopback ports picked at random; torn down at the end.
 */
export default async function setup(project: TestProject) {
  for (const folder of reapScratchFolders("peeksafe-test-")) console.error(`[tests] removed ${folder}, left behind by a killed run`);
  const root = createScratchFolder("peeksafe-test-");
  const cluster = await startCluster({ root: path.join(root, "pg"), port: await freePort(), database: "peeksafe", fast: true });
  await migrateDatabase(cluster.url);

  const mail = await startMailCatcher({ smtpPort: await freePort(), httpPort: await freePort() });
  const appPort = await freePort();
  const env = throwawayEnv({ databaseUrl: cluster.url, appPort, mail });
  // REUSE_BUILD=1 serves the build folder as it is: a quick re-run of a few files while others edit sources.
  if (process.env.REUSE_BUILD !== "1" && buildIsStale()) buildApp(env);
  const app = await startApp({ port: appPort, env, quiet: true });

  project.provide("appUrl", app.url);
  project.provide("databaseUrl", cluster.url);
  project.provide("mailUrl", env.MAIL_CATCHER_URL!);
  project.provide("smtpUrl", env.SMTP_URL!);
  project.provide("authSecret", env.BETTER_AUTH_SECRET!);

  return async () => {
    await app.stop();
    await mail.stop();
    cluster.stop();
    rmSync(root, { recursive: true, force: true });
  };
}
