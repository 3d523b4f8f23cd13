// `npm start`: installs dependencies when they are missing or stale, then runs the whole stack.
import { spawn, spawnSync } from "node:child_process";
import { existsSync, statSync } from "node:fs";

const installed = "node_modules/.package-lock.json";
const stale = !existsSync(installed) || statSync("package-lock.json").mtimeMs > statSync(installed).mtimeMs;
if (stale) {
  console.error("[start] installing dependencies (npm ci)");
  const result = spawnSync("npm", ["ci", "--no-audit", "--no-fund"], { stdio: "inherit" });
  if (result.status !== 0) process.exit(result.status ?? 1);
}

const child = spawn("node_modules/.bin/tsx", ["scripts/start-stack.ts", ...process.argv.slice(2)], { stdio: "inherit" });
for (const signal of ["SIGINT", "SIGTERM"]) process.on(signal, () => child.kill(signal));
child.on("exit", (code, signal) => process.exit(code ?? (signal ? 1 : 0)));
