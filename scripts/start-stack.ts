// The whole product on loopback: PostgreSQL, migrations, demo data, mail catcher, worker and app.
import { spawn, type ChildProcess } from "node:child_process";
import { randomBytes } from "node:crypto";
import { existsSync, mkdirSync, readFileSync, writeFileSync } from "node:fs";
import path from "node:path";
import { WORKER_V8_FLAGS } from "../cron/config";
import { buildApp, buildIsStale, startApp, type RunningApp } from "./lib/app-server";
import { startMailCatcher, type MailCatcher } from "./lib/mail-catcher";
import { migrateDatabase } from "./lib/migrate";
import { startCluster, stopCluster } from "./lib/postgres-cluster";

const dataDir = path.resolve(process.env.PEEKSAFE_DATA_DIR ?? ".data");
const appPort = Number(process.env.PORT ?? 3000);
const log = (message: string) => process.stderr.write(`[start] ${message}\n`);

function authSecret(): string {
  if (process.env.BETTER_AUTH_SECRET) return process.env.BETTER_AUTH_SECRET;
  const file = path.join(dataDir, "auth-secret");
  if (!existsSync(file)) {
    mkdirSync(dataDir, { recursive: true });
    writeFileSync(file, randomBytes(32).toString("base64url"), { mode: 0o600 });
    log(`generated a signing secret in ${file}`);
  }
  return readFileSync(file, "utf8").trim();
}

async function main() {
  const started = Date.now();
  const ownDatabase = !process.env.DATABASE_URL;
  const ownMail = !process.env.SMTP_URL;
  const demo = process.env.PEEKSAFE_DEMO ? process.env.PEEKSAFE_DEMO !== "0" : ownDatabase || ownMail;
  const pgRoot = path.join(dataDir, "postgres");

  const databaseUrl = ownDatabase
    ? (await startCluster({ root: pgRoot, port: Number(process.env.PEEKSAFE_PG_PORT ?? 54329), database: "peeksafe" })).url
    : process.env.DATABASE_URL!;
  await migrateDatabase(databaseUrl);
  log("migrations applied");

  let catcher: MailCatcher | undefined;
  const env: NodeJS.ProcessEnv = {
    ...process.env,
    DATABASE_URL: databaseUrl,
    BETTER_AUTH_SECRET: authSecret(),
    APP_URL: process.env.APP_URL ?? `http://127.0.0.1:${appPort}`,
  };
  if (ownMail) {
    const smtpPort = Number(process.env.PEEKSAFE_SMTP_PORT ?? 1025);
    const httpPort = Number(process.env.PEEKSAFE_MAIL_HTTP_PORT ?? 1080);
    catcher = await startMailCatcher({ smtpPort, httpPort });
    env.SMTP_URL = `smtp://127.0.0.1:${smtpPort}`;
    env.MAIL_CATCHER_URL = `http://127.0.0.1:${httpPort}`;
    log(`mail catcher on 127.0.0.1:${smtpPort}`);
  }
  Object.assign(process.env, env);

  if (demo) {
    const { seedDemo, DEMO_USERS, DEMO_PASSWORD } = await import("../db/seed");
    const { closeDb } = await import("../db");
    await seedDemo();
    await closeDb();
    log(`demo data ready; sign in with any of (password ${DEMO_PASSWORD}):`);
    for (const user of DEMO_USERS) log(`  ${user.role.padEnd(8)} ${user.email}`);
  }

  if (buildIsStale()) {
    log("building the app (next build)");
    buildApp(env);
  }

  let stopping = false;
  let worker: ChildProcess | undefined;
  let restarts = 0;
  // The worker is supervised: if it dies (database away, a bad schedule), say so and start it again.
  const startWorker = () => {
    worker = spawn(process.execPath, [...WORKER_V8_FLAGS, "--import", "tsx", "cron/index.ts"], { env, stdio: "inherit" });
    const startedAt = Date.now();
    worker.on("exit", (code, signal) => {
      if (stopping) return;
      if (Date.now() - startedAt > 60_000) restarts = 0;
      restarts += 1;
      const delay = Math.min(30_000, 1000 * 2 ** Math.min(restarts, 5));
      log(`worker exited (${signal ?? `code ${code}`}); restarting in ${delay / 1000} s — analyses and alerts wait until it is back`);
      setTimeout(() => !stopping && startWorker(), delay).unref();
    });
  };
  if (existsSync("cron/index.ts")) {
    startWorker();
    log("worker started");
  }
  const app: RunningApp = await startApp({ port: appPort, env });
  log(`Peeksafe is up at ${app.url} (${((Date.now() - started) / 1000).toFixed(1)} s)`);
  if (catcher) log(`local mailbox: ${app.url}/mailbox`);

  const stopWorker = () =>
    new Promise<void>((resolve) => {
      if (!worker || worker.exitCode !== null || worker.signalCode !== null) return resolve();
      worker.once("exit", () => resolve());
      worker.kill("SIGTERM");
      setTimeout(() => worker?.kill("SIGKILL"), 10_000).unref();
    });
  const stop = async (code: number) => {
    if (stopping) return;
    stopping = true;
    log("stopping");
    await Promise.all([stopWorker(), app.stop()]);
    await catcher?.stop();
    if (ownDatabase) stopCluster(pgRoot);
    process.exit(code);
  };
  process.on("SIGINT", () => void stop(0));
  process.on("SIGTERM", () => void stop(0));
  app.child.on("exit", (code) => void stop(code ?? 1));
}

main().catch((error: unknown) => {
  console.error("[start] failed:", error instanceof Error ? error.message : error);
  process.exit(1);
});
