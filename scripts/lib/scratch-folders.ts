import { chmodSync, existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { stopCluster } from "./postgres-cluster";

const OWNER_FILE = "owner.pid";

function scratchBase(): string {
  return os.platform() === "linux" ? "/dev/shm" : os.tmpdir();
}

function isAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (error) {
    return (error as NodeJS.ErrnoException).code === "EPERM";
  }
}

/**
 * A new folder in memory (/dev/shm where there is one) for a throwaway cluster, readable by the
 * postgres user and marked with this process's id, so a later run can tell it was left behind.
 */
export function createScratchFolder(prefix: string): string {
  const root = mkdtempSync(path.join(scratchBase(), prefix));
  chmodSync(root, 0o755);
  writeFileSync(path.join(root, OWNER_FILE), String(process.pid));
  return root;
}

/**
 * Stops the cluster in, and removes, every scratch folder of `prefix` whose owning process is gone
 * (a run that was killed before its teardown). Folders of running processes are left alone.
 * @returns the folders removed
 */
export function reapScratchFolders(prefix: string): string[] {
  const reaped: string[] = [];
  for (const name of readdirSync(scratchBase())) {
    if (!name.startsWith(prefix)) continue;
    const root = path.join(scratchBase(), name);
    const ownerFile = path.join(root, OWNER_FILE);
    if (!existsSync(ownerFile)) continue;
    const owner = Number(readFileSync(ownerFile, "utf8"));
    if (!Number.isInteger(owner) || owner <= 0 || isAlive(owner)) continue;
    try {
      stopCluster(path.join(root, "pg"));
    } catch {
      // A half-created cluster cannot be stopped; removing its folder is all that is left to do.
    }
    rmSync(root, { recursive: true, force: true });
    reaped.push(root);
  }
  return reaped;
}
