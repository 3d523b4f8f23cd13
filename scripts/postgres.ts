import path from "node:path";
import { startCluster, stopCluster } from "./lib/postgres-cluster";

const root = path.resolve(process.env.PEEKSAFE_DATA_DIR ?? ".data", "postgres");
const port = Number(process.env.PEEKSAFE_PG_PORT ?? 54329);
const command = process.argv[2];

if (command === "start") {
  const cluster = await startCluster({ root, port, database: "peeksafe" });
  console.log(cluster.url);
} else if (command === "stop") {
  stopCluster(root);
  console.error("[postgres] stopped");
} else {
  console.error("usage: tsx scripts/postgres.ts start|stop");
  process.exit(2);
}
