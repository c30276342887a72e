import { defineConfig } from "vitest/config";

// ESPALIER_PROPERTY_RUNS=N / ESPALIER_PROPERTY_SEED=S shake the fast-check properties (more cases, or a
// reported seed replayed: tests/helpers/property-runs.ts, docs/reliability.md); unset, nothing changes.
const shaking =
  process.env.ESPALIER_PROPERTY_RUNS !== undefined || process.env.ESPALIER_PROPERTY_SEED !== undefined;
const runsFactor = Math.max(1, Math.floor(Number(process.env.ESPALIER_PROPERTY_RUNS ?? "1")) || 1);

export default defineConfig({
  test: {
    include: ["tests/**/*.test.ts"],
    // tests/package rebuilds dist/ through `npm pack`: it runs alone, see vitest.package.config.ts.
    exclude: ["tests/package/**", "**/node_modules/**"],
    setupFiles: ["tests/helpers/setup.ts", ...(shaking ? ["tests/helpers/property-runs.ts"] : [])],
    globalSetup: ["tests/helpers/temp-root.ts"],
    // N times the cases may take N times as long.
    testTimeout: 60_000 * runsFactor,
    hookTimeout: 60_000,
  },
});
