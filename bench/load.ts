/**
 * A bounded load run on loopback: `npm run bench:load [-- --seconds 60]`.
 *
 * Starts its own stack (see bench/lib/stack.ts), makes Northwind Outfitters with 50 pipeline keys
 * (one per pipeline; their per-minute quota switched off, as in every bench), then for `--seconds`:
 *   - 50 pipelines each push distinct 1,000-row batches back to back (each re-sends its two campaigns'
 *     250 days × 2 arms with new values, so every acknowledged row is either the stored count or one
 *     kept revision);
 *   - 100 status pollers read GET /api/v1/campaigns/:id/status over keep-alive connections (autocannon).
 * Prints batches/s, rows/s, polls/s, p50/p99 per kind, errors by status and rows lost (acknowledged
 * minus stored counts and revisions); writes bench/results/load.json; exits non-zero on any error or
 * lost row.
 */
import { parseArgs } from "node:util";
import { runLoad } from "../tests/faults/lib/load";
import { createBenchWorkspace, machineLine, printTable, processCpuMs, startBenchStack, writeResults } from "./lib/stack";

const { values } = parseArgs({
  options: {
    seconds: { type: "string", default: "60" },
    pipelines: { type: "string", default: "50" },
    pollers: { type: "string", default: "100" },
    rebuild: { type: "boolean", default: false },
    "reuse-build": { type: "boolean", default: false },
  },
  strict: true,
});
const SECONDS = Math.min(600, Math.max(1, Number(values.seconds)));
const PIPELINES = Number(values.pipelines);
const POLLERS = Number(values.pollers);
const BATCH_ROWS = 1_000;

async function main(): Promise<void> {
  const stack = await startBenchStack({ app: true });
  try {
    const workspace = await createBenchWorkspace(stack.appUrl!, stack.databaseUrl, PIPELINES);
    const appPid = stack.app!.child.pid;
    const appCpuBefore = processCpuMs(appPid);
    const result = await runLoad({
      appUrl: stack.appUrl!,
      databaseUrl: stack.databaseUrl,
      workspace,
      pipelines: PIPELINES,
      batchRows: BATCH_ROWS,
      pollers: POLLERS,
      seconds: SECONDS,
      log: (message) => process.stderr.write(`[bench] ${message}\n`),
    });
    const appCpuShare = Math.round(((processCpuMs(appPid) - appCpuBefore) / (SECONDS * 1000)) * 100) / 100;
    const machine = machineLine();
    console.log(`\nLoad: ${PIPELINES} pipelines × ${BATCH_ROWS}-row batches and ${POLLERS} status pollers for ${SECONDS} s, loopback`);
    console.log(`machine: ${machine.cpus} CPUs, load average ${machine.loadAverage.join(" / ")}, Node ${machine.node}; app CPU ${appCpuShare} cores\n`);
    printTable([
      {
        kind: "ingest batches",
        sent: result.batches.sent,
        "ok/s": result.batches.perSecond,
        "rows/s": result.batches.rowsPerSecond,
        "p50 ms": result.batches.latencyMs.p50,
        "p99 ms": result.batches.latencyMs.p99,
        "max ms": result.batches.latencyMs.max,
        errors: JSON.stringify(result.batches.errorsByStatus),
      },
      {
        kind: "status polls",
        sent: result.polls.sent,
        "ok/s": result.polls.perSecond,
        "rows/s": "-",
        "p50 ms": result.polls.latencyMs.p50,
        "p99 ms": result.polls.latencyMs.p99,
        "max ms": result.polls.latencyMs.max,
        errors: JSON.stringify(result.polls.errorsByStatus),
      },
    ]);
    console.log(`\nrows acknowledged ${result.rows.acknowledged}, in the database ${result.rows.inDatabase} (counts + revisions), lost ${result.rows.lost}, wrong values ${result.rows.wrongValues}`);
    const held = result.errors === 0 && result.rows.lost === 0 && result.rows.wrongValues === 0;
    const file = writeResults("load", { bench: "load", ranAt: new Date().toISOString(), machine, keys: `${PIPELINES} keys, one per pipeline, quota off`, appCpuShare, held, ...result });
    console.log(`${held ? "load held: zero errors, zero lost rows" : "LOAD NOT HELD"}; wrote ${file}`);
    if (!held) process.exitCode = 1;
  } finally {
    await stack.stop();
  }
}

main().catch((error) => {
  console.error(error);
  process.exitCode = 1;
});
