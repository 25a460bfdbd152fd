import { defineConfig } from "vitest/config";

// Kept apart from vite.config.ts: the React Router plugin is not meant to run inside Vitest.
// Time limits only catch a hang: on two cores shared with other work a solve, a PDF or a started
// process takes many times its quiet-machine time, and speed is measured by `npm run bench` instead.
export default defineConfig({
  resolve: { tsconfigPaths: true },
  test: {
    projects: [
      {
        extends: true,
        test: { name: "unit", include: ["app/**/*.test.ts"], environment: "node", testTimeout: 30_000 },
      },
      {
        extends: true,
        test: {
          name: "integration",
          include: ["tests/integration/**/*.test.ts"],
          environment: "node",
          globalSetup: ["tests/setup/global-setup.ts"],
          setupFiles: ["tests/setup/setup-test-env.ts"],
          testTimeout: 120_000,
          hookTimeout: 180_000,
        },
      },
    ],
  },
});
