// `npm test`: lint, typecheck, then every vitest project (unit, integration with its own
// PostgreSQL, mail catcher, app build and Chromium). Installs what a fresh machine lacks.
import { spawnSync } from "node:child_process";
import { existsSync, statSync } from "node:fs";

const isRoot = typeof process.getuid === "function" && process.getuid() === 0;

function run(label, command, args, options = {}) {
  const started = Date.now();
  console.error(`\n[test] ${label}`);
  const result = spawnSync(command, args, { stdio: "inherit", ...options });
  const seconds = ((Date.now() - started) / 1000).toFixed(1);
  if (result.status !== 0) {
    console.error(`[test] ${label} failed after ${seconds} s`);
    process.exit(result.status ?? 1);
  }
  console.error(`[test] ${label} passed in ${seconds} s`);
}

const installed = "node_modules/.package-lock.json";
if (!existsSync(installed) || statSync("package-lock.json").mtimeMs > statSync(installed).mtimeMs) {
  run("install dependencies (npm ci)", "npm", ["ci", "--no-audit", "--no-fund"]);
}
const missing = [
  ["/usr/bin/chromium", "chromium"],
  ["/usr/lib/postgresql", "postgresql"],
].filter(([file]) => !existsSync(file)).map(([, pkg]) => pkg);
if (missing.length > 0) {
  if (!isRoot) {
    console.error(`[test] missing Debian packages: run  sudo apt-get install -y ${missing.join(" ")}`);
    process.exit(1);
  }
  run("apt-get update", "apt-get", ["update", "-qq"]);
  run(`install ${missing.join(", ")}`, "apt-get", ["install", "-y", "-qq", ...missing], {
    env: { ...process.env, DEBIAN_FRONTEND: "noninteractive" },
  });
}

const started = Date.now();
run("lint (eslint)", "node_modules/.bin/eslint", ["--max-warnings", "0", "."]);
run("typecheck (tsc)", "node_modules/.bin/tsc", ["--noEmit"]);
run("tests (vitest: unit and integration)", "node_modules/.bin/vitest", ["run", ...process.argv.slice(2)], {
  env: { ...process.env, NEXT_TELEMETRY_DISABLED: "1" },
});
console.error(`\n[test] everything passed in ${((Date.now() - started) / 1000).toFixed(0)} s`);
