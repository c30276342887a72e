import { EspalierError } from "../errors.js";

/** Names of fields seen on node objects, kept while a loader reads: the first few, of the first nodes. */
export class FieldsSeen {
  private readonly names = new Set<string>();

  /** Whether node `node`'s keys are still sampled (the first 1,000 nodes, up to 40 names). */
  wants(node: number): boolean {
    return node < 1000 && this.names.size < 40;
  }

  add(name: string): void {
    this.names.add(name);
  }

  /** The names seen, in the order first seen. */
  list(): string[] {
    return [...this.names];
  }
}

/**
 * FIELD_MISSING for a field the user named that no record has: `--size-field` (a named size field
 * that no node carries a number in) or a kept field (`--label`, `--compare-field`). The message names
 * the fields the input does have, so the user can pick the right one; `seen` may be a sample.
 */
export function missingField(
  role: "size" | "kept",
  field: string,
  seen: readonly string[],
  sampled = false,
): EspalierError {
  const what =
    role === "size"
      ? `no record has a number in the size field ${JSON.stringify(field)} (--size-field)`
      : `no record has the field ${JSON.stringify(field)} asked to be kept (--label, --compare-field)`;
  const names = seen.map((name) => JSON.stringify(name)).join(", ");
  const have =
    seen.length === 0
      ? "; the records have no fields"
      : `; the ${sampled ? "fields seen on the first records" : "fields"} are ${names}`;
  return new EspalierError("FIELD_MISSING", `${what}${have}`, undefined, {
    ...(role === "size" ? { option: "--size-field" } : {}),
    field,
    fieldsSeen: [...seen],
  });
}

/**
 * FIELD_MISSING for a named `--size-field` on an input whose sizes come from elsewhere: a path list's
 * size column, or a document read as values (each value's bytes).
 */
export function sizeFieldNotApplicable(field: string, shape: "paths" | "values"): EspalierError {
  const why =
    shape === "paths"
      ? "a path list has no record fields: its sizes are the numbers before a tab"
      : "a document read as values is sized by each value's bytes";
  return new EspalierError(
    "FIELD_MISSING",
    `--size-field ${JSON.stringify(field)} does not apply: ${why}`,
    undefined,
    { option: "--size-field", field, fieldsSeen: [] },
  );
}

/** Whether an input must carry the size field: it was named, or differs from the default `size`. */
export function sizeFieldNamed(options: { sizeField: string; sizeFieldNamed?: boolean }): boolean {
  return options.sizeFieldNamed === true || options.sizeField !== "size";
}
