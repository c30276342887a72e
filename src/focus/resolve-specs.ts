import { EspalierError, quoted, type SourcePos, say } from "../errors.js";
import type { PathIndex } from "../model/path-index.js";
import { pseudonym } from "../model/pseudonym.js";
import type { FocusSpec, ListedFocus, UnmatchedFoci } from "./focus-spec.js";
import { isGlob } from "./glob.js";
import { listedNode } from "./listed-node.js";
import { resolveFoci } from "./resolve.js";

/** The foci found, and the specs that matched nothing when those are left out. */
export interface ResolvedFoci {
  /** Node indices, sorted, without repeats. */
  foci: Int32Array;
  /**
   * The specs that matched no node, as written (each segment a keyed pseudonym with a pseudonym key),
   * in the order given; always empty when `unmatched` is "error".
   */
  unmatched: string[];
}

/**
 * Focus specs -> nodes. A string is resolved as `resolveFoci` does (path, id, glob). A listed line is
 * first a literal path ({@link listedNode}); when none matches, it is read as espalier prints paths
 * (RFC 6901 escapes, `~~N`, ids, pseudonyms: a list written by the interactive view), never as a
 * glob. A spec that matches nothing is FOCUS_NO_MATCH, or with `unmatched` "skip" is left out and
 * reported in `unmatched`.
 */
export function resolveSpecs(
  index: PathIndex,
  specs: readonly FocusSpec[],
  pseudonymKey?: string,
  unmatched: UnmatchedFoci = "error",
): ResolvedFoci {
  const found = new Set<number>();
  const missed: string[] = [];
  const plain = specs.filter((s): s is string => typeof s === "string");
  if (unmatched === "error") {
    for (const node of resolveFoci(index, plain, pseudonymKey)) found.add(node);
  } else {
    for (const spec of plain) {
      const nodes = orNoMatch(() => resolveFoci(index, [spec], pseudonymKey));
      if (nodes === null) missed.push(spec);
      else for (const node of nodes) found.add(node);
    }
  }
  for (const spec of specs) {
    if (typeof spec === "string") continue;
    const node = listedSpec(index, spec, pseudonymKey, unmatched);
    if (node >= 0) found.add(node);
    else missed.push(spec.listed);
  }
  return {
    foci: Int32Array.from([...found].sort((a, b) => a - b)),
    unmatched: pseudonymKey === undefined ? missed : missed.map((s) => hiddenPath(s, pseudonymKey)),
  };
}

/** The node of a listed line, or -1 when it matches nothing and unmatched foci are skipped. */
function listedSpec(
  index: PathIndex,
  spec: ListedFocus,
  pseudonymKey: string | undefined,
  unmatched: UnmatchedFoci,
): number {
  const literal = listedNode(index, spec.listed);
  if (literal >= 0) return literal;
  if (!isGlob(spec.listed)) {
    const printed = orNoMatch(() => resolveFoci(index, [spec.listed], pseudonymKey));
    if (printed !== null && printed.length > 0) return printed[0];
  }
  if (unmatched === "skip") return -1;
  // The message of a printed path that matched nothing (with its suggestion), or a listed glob's.
  try {
    if (!isGlob(spec.listed)) resolveFoci(index, [spec.listed], pseudonymKey);
  } catch (err) {
    // The message keeps its marked input (--pseudonymize hides it); the place is the list's line.
    if (err instanceof EspalierError && err.code === "FOCUS_NO_MATCH")
      throw new EspalierError("FOCUS_NO_MATCH", err.parts, listedAt(spec), {
        ...err.details,
        line: spec.line,
      });
  }
  throw new EspalierError(
    "FOCUS_NO_MATCH",
    say`${pseudonymKey === undefined ? [quoted.path(spec.listed)] : "the focus"} matches no node (lines of --focus-from are literal paths: no globs)`,
    listedAt(spec),
    { line: spec.line },
  );
}

/** Where a listed focus is: its line of the `--focus-from` file (the line is the focus, from column 1). */
function listedAt(spec: ListedFocus): SourcePos {
  return { ...(spec.file === undefined ? {} : { file: spec.file }), line: spec.line, column: 1 };
}

/** The nodes `resolve` finds, or null when it reports FOCUS_NO_MATCH or FOCUS_SYNTAX (a stray `~`). */
function orNoMatch(resolve: () => Int32Array): Int32Array | null {
  try {
    return resolve();
  } catch (err) {
    if (err instanceof EspalierError && (err.code === "FOCUS_NO_MATCH" || err.code === "FOCUS_SYNTAX"))
      return null;
    throw err;
  }
}

/** A path with every segment replaced by its keyed pseudonym, as printed paths are under a key. */
function hiddenPath(path: string, key: string): string {
  return path
    .split("/")
    .map((s) => (s === "" ? s : pseudonym(key, s)))
    .join("/");
}
