import nextVitals from "eslint-config-next/core-web-vitals";
import nextTypescript from "eslint-config-next/typescript";
import drizzle from "eslint-plugin-drizzle";

const config = [
  ...nextVitals,
  ...nextTypescript,
  {
    ignores: [".next/**", ".next-*/**", "node_modules/**", ".data/**", "drizzle/**", "next-env.d.ts", "coverage/**", "bench/results/**"],
  },
  {
    plugins: { drizzle },
    rules: {
      "drizzle/enforce-delete-with-where": ["error", { drizzleObjectName: ["db", "tx"] }],
      "drizzle/enforce-update-with-where": ["error", { drizzleObjectName: ["db", "tx"] }],
    },
  },
];

export default config;
