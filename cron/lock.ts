import type { Logger } from "pino";
import { getPool } from "@/db";

/** Advisory lock keys, one per job: at most one process runs each job at a time (across machines sharing the database). */
export const JOB_LOCKS = {
  recompute: 7_305_101,
  mailer: 7_305_102,
  digest: 7_305_103,
} as const;

export type JobName = keyof typeof JOB_LOCKS;

export type LockedRun<T> = { ran: true; result: T } | { ran: false; result: null };

/**
 * Runs `job` while holding the job's session-level advisory lock on a dedicated connection. When
 * another process holds it, skips (or with `wait`, blocks until it is free) and logs which. A killed
 * process drops its connection, and PostgreSQL releases the lock with it.
 */
export async function withJobLock<T>(
  job: JobName,
  logger: Logger,
  options: { wait?: boolean },
  run: () => Promise<T>,
): Promise<LockedRun<T>> {
  const client = await getPool().connect();
  let held = false;
  // A checked-out client with no query running has no one to hand a dropped connection to: without a
  // listener its "error" would kill the worker (PostgreSQL restarting mid-job). The lock went with it.
  let lost: Error | undefined;
  const onError = (error: Error) => {
    lost = error;
    logger.warn({ job, lock: JOB_LOCKS[job], err: error }, "lost the lock's connection; this run finishes without the lock");
  };
  client.on("error", onError);
  try {
    if (options.wait) {
      const free = await client.query<{ ok: boolean }>("select pg_try_advisory_lock($1) as ok", [JOB_LOCKS[job]]);
      if (!free.rows[0].ok) {
        logger.info({ job, lock: JOB_LOCKS[job] }, "another worker holds the lock; waiting for it");
        await client.query("select pg_advisory_lock($1)", [JOB_LOCKS[job]]);
      }
      held = true;
    } else {
      const result = await client.query<{ ok: boolean }>("select pg_try_advisory_lock($1) as ok", [JOB_LOCKS[job]]);
      held = result.rows[0].ok;
      if (!held) {
        logger.info({ job, lock: JOB_LOCKS[job], skipped: true }, "another worker holds the lock; skipping this run");
        return { ran: false, result: null };
      }
    }
    return { ran: true, result: await run() };
  } finally {
    if (held && !lost) {
      await client.query("select pg_advisory_unlock($1)", [JOB_LOCKS[job]]).catch((error: Error) => {
        lost = error;
      });
    }
    client.removeListener("error", onError);
    // A broken connection is thrown away, not put back in the pool.
    client.release(lost);
  }
}
