import { defineConfig } from "vitest/config";

// The installable-package test runs on its own (`npm run test:package`): `npm pack` runs the `prepare`
// script, which deletes and rebuilds dist/ while other test files run bin/espalier.js from it.
export default defineConfig({
  test: {
    include: ["tests/package/**/*.test.ts"],
    setupFiles: ["tests/helpers/setup.ts"],
    globalSetup: ["tests/helpers/temp-root.ts"],
    testTimeout: 180_000,
    hookTimeout: 60_000,
  },
});
