/**
 * A small view of the start of a JSON or YAML document, for choosing how to read it: containers keep
 * their first members only (in document order), down to a few levels; scalars keep only that they are.
 */
export type Sample =
  | { readonly kind: "scalar" }
  | { readonly kind: "array"; readonly items: Sample[] }
  | { readonly kind: "object"; readonly entries: [string, Sample][] };

/** How many members of a container a sample keeps, by depth (the top level is depth 0). */
export function sampleWidth(depth: number): number {
  return depth <= 1 ? 64 : 8;
}

/** How deep a sample goes. */
export const SAMPLE_DEPTH = 4;

export const SCALAR: Sample = { kind: "scalar" };
