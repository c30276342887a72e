/**
 * What a focus is given as: a string as `--focus` takes it (a printed path, a row id or a glob), or a
 * line of a `--focus-from` list, which is a literal path as other tools print them (see `listedNode`).
 */
export type FocusSpec = string | ListedFocus;

/** One line of a `--focus-from` list. */
export interface ListedFocus {
  /** The line as written (line break removed). */
  readonly listed: string;
  /** Its 1-based line number in the list. */
  readonly line: number;
  /** The list's file as messages name it (`<stdin>` for standard input), when known. */
  readonly file?: string;
}

/** The text of a spec as the user wrote it. */
export function specText(spec: FocusSpec): string {
  return typeof spec === "string" ? spec : spec.listed;
}

/** What to do with a focus that matches no node: fail (the default), or leave it out and report it. */
export const unmatchedFociChoices = ["error", "skip"] as const;
export type UnmatchedFoci = (typeof unmatchedFociChoices)[number];
