import { defineConfig } from "vitest/config";
import path from "node:path";

// End-to-end: a real built web app (and the demo's processes) started once by the global setup,
// driven over HTTP and through Debian's Chromium.
export default defineConfig({
  resolve: { alias: { "@": path.resolve(import.meta.dirname) } },
  test: {
    include: ["tests/e2e/**/*.e2e.test.ts"],
    globalSetup: ["tests/e2e/global-setup.ts"],
    setupFiles: ["tests/e2e/secrets-setup.ts"],
    environment: "node",
    testTimeout: 90_000,
    hookTimeout: 120_000,
    fileParallelism: false,
  },
});
