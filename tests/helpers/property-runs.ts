import type { Parameters as PropertyParameters } from "fast-check";
import { vi } from "vitest";

// Opt-in shaking of the fast-check properties (docs/reliability.md, "Property tests on more seeds"):
// ESPALIER_PROPERTY_RUNS=N runs every fc.assert N times as many cases as it asks for (100 when it asks
// for no number); ESPALIER_PROPERTY_SEED=S starts every property that fixes no seed of its own at S, to
// replay the seed a failure reports. vitest.config.ts loads this file only when one of them is set, so
// the default suite keeps its run counts and its time.
vi.mock("fast-check", async (importOriginal) => {
  const fc = await importOriginal<typeof import("fast-check")>();
  const runsText = process.env.ESPALIER_PROPERTY_RUNS ?? "1";
  const factor = Number(runsText);
  if (!/^[0-9]+$/.test(runsText) || factor < 1)
    throw new Error(`ESPALIER_PROPERTY_RUNS must be a whole number of at least 1, not '${runsText}'`);
  const seedText = process.env.ESPALIER_PROPERTY_SEED;
  if (seedText !== undefined && !/^-?[0-9]+$/.test(seedText))
    throw new Error(
      `ESPALIER_PROPERTY_SEED must be a whole number (as a failure reports it), not '${seedText}'`,
    );
  const seed = seedText === undefined ? undefined : Number(seedText);
  const assert = ((property: Parameters<typeof fc.assert>[0], params?: PropertyParameters<unknown>) =>
    fc.assert(property, {
      ...params,
      numRuns: factor * (params?.numRuns ?? fc.readConfigureGlobal().numRuns ?? 100),
      seed: params?.seed ?? seed,
    })) as typeof fc.assert;
  return { ...fc, assert, default: { ...fc.default, assert } };
});
