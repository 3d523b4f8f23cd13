import { spawnSync } from "node:child_process";
import { existsSync, rmSync, writeFileSync } from "node:fs";
import path from "node:path";
import { afterEach, describe, expect, it } from "vitest";
import { createScratchFolder, reapScratchFolders } from "@/scripts/lib/scratch-folders";

const PREFIX = `peeksafe-reap-check-${process.pid}-`;
const made: string[] = [];

afterEach(() => {
  for (const folder of made.splice(0)) rmSync(folder, { recursive: true, force: true });
});

function deadPid(): number {
  const child = spawnSync(process.execPath, ["-e", "process.stdout.write(String(process.pid))"], { encoding: "utf8" });
  return Number(child.stdout);
}

describe("scratch folders of killed runs", () => {
  it("removes a folder whose owning process is gone and keeps the folders of running processes", () => {
    const mine = createScratchFolder(PREFIX);
    const orphan = createScratchFolder(PREFIX);
    const unmarked = createScratchFolder(PREFIX);
    made.push(mine, orphan, unmarked);
    writeFileSync(path.join(orphan, "owner.pid"), String(deadPid()));
    rmSync(path.join(unmarked, "owner.pid"));

    expect(reapScratchFolders(PREFIX)).toEqual([orphan]);
    expect(existsSync(orphan)).toBe(false);
    expect(existsSync(mine)).toBe(true);
    expect(existsSync(unmarked)).toBe(true);
  });
});
