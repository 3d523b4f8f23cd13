import path from "node:path";
import { defineConfig } from "vitest/config";

const alias = { "@": path.resolve(import.meta.dirname) };

export default defineConfig({
  resolve: { alias },
  test: {
    projects: [
      {
        resolve: { alias },
        test: {
          name: "unit",
          sequence: { groupOrder: 0 },
          include: ["tests/sequential/**/*.test.ts", "tests/cli/**/*.test.ts", "tests/lib/**/*.test.ts"],
          environment: "node",
        },
      },
      {
        resolve: { alias },
        test: {
          name: "integration",
          // Runs after the unit project; its own worker limit keeps the shared app server unhurried.
          sequence: { groupOrder: 1 },
          include: [
            "tests/db/**/*.test.ts",
            "tests/api/**/*.test.ts",
            "tests/actions/**/*.test.ts",
            "tests/cron/**/*.test.ts",
            "tests/e2e/**/*.test.ts",
            "tests/faults/**/*.test.ts",
          ],
          environment: "node",
          globalSetup: ["tests/setup/global-setup.ts"],
          setupFiles: ["tests/setup/integration-env.ts"],
          testTimeout: 60_000,
          hookTimeout: 120_000,
          maxWorkers: 2,
        },
      },
    ],
  },
});
