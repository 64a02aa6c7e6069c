import { defineConfig } from "vitest/config";

// Integration and browser tests: a real MariaDB, the built server, the mail catcher and the S3
// fake, all started by scripts/test.ts. Files run one after another: they share one database.
export default defineConfig({
  test: {
    include: ["tests/integration/**/*.test.ts", "tests/e2e/**/*.test.ts"],
    environment: "node",
    fileParallelism: false,
    testTimeout: 60_000,
    hookTimeout: 120_000,
    setupFiles: ["tests/support/loud-console.ts"],
  },
});
