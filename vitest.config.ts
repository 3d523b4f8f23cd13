import path from "node:path";
import { defineConfig } from "vitest/config";

const alias = { "@": path.resolve(__dirname) };

export default defineConfig({
  resolve: { alias },
  test: {
    projects: [
      {
        resolve: { alias },
        test: {
          name: "unit",
          include: ["tests/sequential/**/*.test.ts", "tests/cli/**/*.test.ts", "tests/lib/**/*.test.ts"],
          environment: "node",
        },
      },
    ],
  },
});
