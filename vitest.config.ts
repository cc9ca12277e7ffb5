import { defineConfig } from "vitest/config";

// Separate from vite.config.ts: the React Router plugin must not run under Vitest.
// Projects: `unit` runs anywhere (`npx vitest run --project unit`); `app` (integration
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
          // Records every /api/v1 answer for the contract check below.
          setupFiles: ["tests/support/api-recorder.ts"],
        },
      },
      {
        // After the integration tests: their recorded answers, checked against the OpenAPI document.
        extends: true,
        test: {
          name: "contract",
          include: ["tests/contract/**/*.test.ts"],
          environment: "node",
          globalSetup: ["tests/global-setup.ts"],
          sequence: { groupOrder: 1 },
        },
      },
      {
        // Tests that stop the database, kill app processes or lock tables: one file at a time,
        // after every other test has finished (groupOrder), so they cannot break them.
        extends: true,
        test: {
          name: "faults",
          include: ["tests/faults/**/*.test.ts"],
          environment: "node",
          globalSetup: ["tests/global-setup.ts"],
          sequence: { groupOrder: 2 },
          maxWorkers: 1,
          testTimeout: 240_000,
        },
      },
    ],
  },
});
