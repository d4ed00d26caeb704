import { defineConfig } from "vitest/config";

// Three projects so each side runs with its own environment and setup.
export default defineConfig({
  test: {
    projects: [
      {
        test: {
          name: "shared",
          include: ["shared/**/*.test.ts", "tests/lint/*.test.ts"],
          testTimeout: 60000,
          environment: "node",
        },
      },
      {
        test: {
          name: "server",
          include: ["server/**/*.test.ts"],
          environment: "node",
          setupFiles: ["tests/setup/server-setup.ts"],
          fileParallelism: true,
          testTimeout: 30000,
          hookTimeout: 60000,
        },
      },
      {
        test: {
          name: "e2e",
          include: ["tests/e2e/**/*.test.ts"],
          environment: "node",
          fileParallelism: false,
          testTimeout: 90000,
          hookTimeout: 120000,
        },
      },
    ],
  },
});
