import { defineConfig } from "vitest/config";

export default defineConfig({
  resolve: { tsconfigPaths: true },
  test: {
    include: ["app/**/*.test.{ts,tsx}", "tests/integration/**/*.test.{ts,tsx}", "tests/unit/**/*.test.{ts,tsx}", "tools/**/*.test.ts", "seeds/**/*.test.ts", "scripts/**/*.test.ts"],
    environment: "node",
    setupFiles: ["./tests/setup/vitest-setup.ts"],
    testTimeout: 20000,
    hookTimeout: 60000,
    pool: "forks",
  },
});
