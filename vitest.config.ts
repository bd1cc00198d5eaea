import { defineConfig } from "vitest/config";
import { fileURLToPath } from "node:url";

// Kept apart from vite.config.ts: the React Router plugin must not run under vitest.
export default defineConfig({
  resolve: {
    alias: { "~": fileURLToPath(new URL("./app", import.meta.url)) },
  },
  test: {
    include: ["app/**/*.test.ts", "server/**/*.test.ts", "grammar/**/*.test.ts", "tests/**/*.test.ts"],
    testTimeout: 30_000,
    hookTimeout: 120_000,
    globalSetup: ["tests/support/global-setup.ts"],
    // An unexpected console.error fails the test that printed it (see the module).
    setupFiles: ["tests/support/console-guard.ts"],
  },
});
