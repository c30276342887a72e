/**
 * The environment variable that makes a diff match and combine its versions the general way even where
 * NEW's load read it as OLD with known changes (src/diff/direct-combine.ts): `1` does; the output is the
 * same either way, which the tests check by it.
 */
export const GENERAL_DIFF_ENV = "ESPALIER_DIFF_GENERAL";

/** Whether {@link GENERAL_DIFF_ENV} asks for the general path. */
export function generalDiff(env: Readonly<Record<string, string | undefined>>): boolean {
  return env[GENERAL_DIFF_ENV] === "1";
}
