import { defineConfig } from "vitest/config";

// Separate from vite.config.ts: the React Router plugin must not run under Vitest.
// Two projects: `unit` runs anywhere (`npx vitest run --project unit`); `app` (integration
// and browser tests) needs the served build and the test database that `npm test` prepares.
export default defineConfig({
  resolve: { tsconfigPaths: true },
  test: {
    testTimeout: 30_000,
    hookTimeout: 120_000,
    projects: [
      {
        extends: true,
        test: { name: "unit", include: ["tests/unit/**/*.test.ts"], environment: "node" },
      },
      {
        extends: true,
        test: {
          name: "app",
          include: ["tests/integration/**/*.test.ts", "tests/e2e/**/*.test.ts"],
          environment: "node",
          globalSetup: ["tests/global-setup.ts"],
        },
      },
    ],
  },
});
