/**
 * A small view of the start of a JSON or YAML document, for choosing how to read it: containers keep
 * their first members only (in document order), down to a few levels; scalars keep only that they are.
 */
export type Sample =
  | { readonly kind: "scalar" }
  | { readonly kind: "array"; readonly items: Sample[] }
  | { readonly kind: "object"; readonly entries: [string, Sample][] };

/**
 * How many members of a container a sample keeps, by depth (the top level is depth 0). A child record
 * (depth 2) keeps as many as the top level: a package manager's long listing puts a dozen manifest
 * fields before each package's `dependencies`, and the children field is found by that key.
 */
export function sampleWidth(depth: number): number {
  return depth <= 2 ? 64 : 8;
}

/** The most members a sample of a parsed document keeps in all (the JSON sample is bounded by its bytes). */
export const SAMPLE_MEMBERS = 65536;

/** How deep a sample goes. */
export const SAMPLE_DEPTH = 4;

export const SCALAR: Sample = { kind: "scalar" };
