import { defineConfig } from "vitest/config";

// Unit tests: pure modules only, no database, no network.
export default defineConfig({
  test: {
    include: ["tests/unit/**/*.test.ts"],
    environment: "node",
    setupFiles: ["tests/support/loud-console.ts"],
  },
});
