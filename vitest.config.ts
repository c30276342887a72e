import { defineConfig } from "vitest/config";

export default defineConfig({
  test: {
    include: ["tests/**/*.test.ts"],
    // tests/package rebuilds dist/ through `npm pack`: it runs alone, see vitest.package.config.ts.
    exclude: ["tests/package/**", "**/node_modules/**"],
    setupFiles: ["tests/helpers/setup.ts"],
    globalSetup: ["tests/helpers/temp-root.ts"],
    testTimeout: 60_000,
    hookTimeout: 60_000,
  },
});
