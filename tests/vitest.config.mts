import { fileURLToPath } from "node:url";
import { defineConfig } from "vitest/config";

const root = fileURLToPath(new URL("..", import.meta.url));
const alias = { "@": root };

// Four projects: pure code (node), components (jsdom), integration against the
// real MariaDB, end-to-end in Debian's Chromium. The last two share one database
// per run, so their files run one at a time.
export default defineConfig({
  root,
  resolve: { alias },
  test: {
    projects: [
      {
        resolve: { alias },
        test: {
          name: "unit",
          environment: "node",
          include: ["tests/unit/**/*.test.ts", "tests/reference/**/*.test.ts"],
        },
      },
      {
        resolve: { alias },
        // tsconfig keeps JSX for Next; tests compile it with the automatic runtime.
        oxc: { jsx: { runtime: "automatic" } },
        test: {
          name: "component",
          environment: "jsdom",
          include: ["tests/unit/**/*.test.tsx"],
          setupFiles: ["tests/setup/component.ts"],
        },
      },
      {
        resolve: { alias },
        test: {
          name: "integration",
          environment: "node",
          setupFiles: ["tests/setup/local-env.ts"],
          include: ["tests/integration/**/*.test.ts"],
          fileParallelism: false,
          testTimeout: 30_000,
          hookTimeout: 60_000,
        },
      },
      {
        resolve: { alias },
        test: {
          name: "e2e",
          environment: "node",
          setupFiles: ["tests/setup/local-env.ts"],
          include: ["tests/e2e/**/*.test.ts"],
          fileParallelism: false,
          testTimeout: 60_000,
          hookTimeout: 120_000,
        },
      },
    ],
  },
});
