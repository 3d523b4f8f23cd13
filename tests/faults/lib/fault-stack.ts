import { WORKER_V8_FLAGS } from "../../../cron/config";
import { spawn, type ChildProcess } from "node:child_process";
import { startApp, type RunningApp } from "../../../scripts/lib/app-server";
import { startMailCatcher, type MailCatcher } from "../../../scripts/lib/mail-catcher";
import { startCluster, stopCluster } from "../../../scripts/lib/postgres-cluster";
import { startThrowawayStack, type ThrowawayStack } from "../../../scripts/lib/stack";

/**
 * The throwaway stack with handles to break it: PostgreSQL with fsync and synchronous commit on
 * (an acknowledged batch must outlive a restart), stopped and started again on the same port and data
 * folder; the app killed and started again on the same port; the mail catcher's SMTP taken down.
 */
export interface FaultStack {
  stack: ThrowawayStack;
  databaseUrl: string;
  appUrl: string;
  env: NodeJS.ProcessEnv;
  /** The app process now serving (changes after {@link FaultStack.restartApp}). */
  app(): RunningApp;
  mail(): MailCatcher;
  stopPostgres(mode: "fast" | "immediate"): void;
  startPostgres(): Promise<void>;
  /** SIGKILLs the app (no shutdown of any kind) and waits for it to be gone. */
  killApp(): Promise<void>;
  startAppAgain(): Promise<void>;
  stopSmtp(): Promise<void>;
  startSmtp(): Promise<void>;
  /** Starts a worker process (`cron/index.ts`) against this stack; stopped with the stack. */
  spawnWorker(args: string[], env?: Record<string, string>): WorkerProcess;
  stop(): Promise<void>;
}

export interface WorkerProcess {
  child: ChildProcess;
  lines: Record<string, unknown>[];
  exited: Promise<number | null>;
  stderr(): string;
}

export async function startFaultStack(options: { distDir: string; reuseBuild?: boolean; log?: (message: string) => void }): Promise<FaultStack> {
  const stack = await startThrowawayStack({ app: true, fast: false, distDir: options.distDir, reuseBuild: options.reuseBuild, prefix: "peeksafe-faults-", log: options.log });
  const appPort = Number(new URL(stack.appUrl!).port);
  const mailPorts = { smtpPort: stack.mail.smtpPort, httpPort: stack.mail.httpPort };
  let app = stack.app!;
  let mail: MailCatcher | null = stack.mail;
  const workers: WorkerProcess[] = [];

  const stopWorkers = async () => {
    for (const worker of workers) {
      if (worker.child.exitCode === null && worker.child.signalCode === null) worker.child.kill("SIGKILL");
      await worker.exited;
    }
  };

  return {
    stack,
    databaseUrl: stack.databaseUrl,
    appUrl: stack.appUrl!,
    env: stack.env,
    app: () => app,
    mail: () => {
      if (!mail) throw new Error("the mail catcher is down");
      return mail;
    },
    stopPostgres: (mode) => stopCluster(stack.cluster.root, mode),
    startPostgres: async () => {
      await startCluster({ root: stack.cluster.root, port: stack.cluster.port, database: "peeksafe", fast: false });
    },
    killApp: async () => {
      const child = app.child;
      if (child.exitCode !== null || child.signalCode !== null) return;
      const gone = new Promise((resolve) => child.once("exit", resolve));
      child.kill("SIGKILL");
      await gone;
    },
    startAppAgain: async () => {
      app = await startApp({ port: appPort, env: stack.env, quiet: true });
    },
    stopSmtp: async () => {
      await mail?.stop();
      mail = null;
    },
    startSmtp: async () => {
      mail ??= await startMailCatcher(mailPorts);
    },
    spawnWorker: (args, env = {}) => {
      const worker = spawnWorkerProcess(args, { ...stack.env, LOG_LEVEL: "info", ...env });
      workers.push(worker);
      return worker;
    },
    stop: async () => {
      await stopWorkers();
      if (app !== stack.app) await app.stop();
      // The stack stops what it started itself; a catcher we started again is ours to stop.
      if (mail && mail !== stack.mail) await mail.stop();
      if (mail !== stack.mail) stack.mail.stop = async () => {};
      await stack.stop();
    },
  };
}

/** One process (node with the tsx loader), so a SIGKILL really kills the worker and its connections. */
function spawnWorkerProcess(args: string[], env: NodeJS.ProcessEnv): WorkerProcess {
  const clean = Object.fromEntries(Object.entries(env).filter(([name]) => name !== "TEST" && !name.startsWith("VITEST"))) as NodeJS.ProcessEnv;
  const child: ChildProcess = spawn(process.execPath, [...WORKER_V8_FLAGS, "--import", "tsx", "cron/index.ts", ...args], { env: clean, stdio: ["ignore", "pipe", "pipe"] });
  const lines: Record<string, unknown>[] = [];
  let buffer = "";
  child.stdout!.on("data", (chunk: Buffer) => {
    buffer += chunk.toString();
    const parts = buffer.split("\n");
    buffer = parts.pop()!;
    for (const part of parts) {
      if (!part.trim()) continue;
      try {
        lines.push(JSON.parse(part) as Record<string, unknown>);
      } catch {
        lines.push({ msg: part });
      }
    }
  });
  let stderr = "";
  child.stderr!.on("data", (chunk: Buffer) => (stderr += chunk));
  const exited = new Promise<number | null>((resolve) => child.once("exit", (code: number | null) => resolve(code)));
  return { child, lines, exited, stderr: () => stderr };
}

/** Polls `predicate` every 50 ms; throws naming `what` after `timeoutMs`. */
export async function waitFor(what: string, predicate: () => boolean | Promise<boolean>, timeoutMs = 30_000): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (!(await predicate())) {
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await new Promise((resolve) => setTimeout(resolve, 50));
  }
}
