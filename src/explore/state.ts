import type { Importance } from "../interest/importance.js";
import type { Pattern } from "./search.js";

/** A focus added beside the moving one: pinned by hand, or a child that entered when a fold opened. */
export interface ExtraFocus {
  readonly node: number;
  readonly how: "pinned" | "opened";
}

/**
 * What decides the view: the node under the cursor (a focus, except the root, which is always shown),
 * the extra foci in the order they were added, and the a-priori importance. Undo restores these.
 */
export interface ViewSpec {
  readonly cursor: number;
  readonly extra: readonly ExtraFocus[];
  readonly importance: Importance;
}

export type Mode =
  | { readonly kind: "browse" }
  | { readonly kind: "help"; readonly scroll: number }
  /** Typing a search: the view follows the first match; Escape goes back to `before`. */
  | {
      readonly kind: "search";
      readonly query: string;
      readonly before: ViewSpec;
      /** The compiled query; null while empty or invalid. */
      readonly pattern: Pattern | null;
      /** The query is not a valid pattern (yet): a `~` waits for its 0 or 1. */
      readonly invalid: boolean;
      /** Whether the view follows a match (else it stays where the search began). */
      readonly matched: boolean;
      /** Matches counted among the nodes below `countedTo` (counting goes on in slices, see Work). */
      readonly count: number;
      readonly countedTo: number;
    }
  /** Typing the name of the file to write the foci to. */
  | { readonly kind: "write"; readonly file: string };

/** What n and N visit. */
export type Found =
  | { readonly kind: "list"; readonly label: string; readonly matches: Int32Array }
  | { readonly kind: "query"; readonly pattern: Pattern };

/** What the terminal edge must do after this state: nothing, write a file, or leave. */
export type Request =
  | null
  | { readonly kind: "write"; readonly file: string }
  | { readonly kind: "quit" }
  | { readonly kind: "print" }
  | { readonly kind: "interrupt" };

/** The whole interactive view, as a value: every key maps one state to the next (see update). */
export interface ExploreState {
  /** Terminal rows and columns. */
  readonly rows: number;
  readonly cols: number;
  readonly spec: ViewSpec;
  /** Earlier specs, the most recent last. */
  readonly undo: readonly ViewSpec[];
  readonly mode: Mode;
  /** What n and N visit: the last search, or a diff's changes before any search. */
  readonly found: Found | null;
  /** A line for the status bar about the last key, until the next one. */
  readonly message: string | null;
  readonly request: Request;
  /** The file `w` offers (the last one written, at first the --focus-from file or a default). */
  readonly fociFile: string;
}

/** Most undo steps kept. */
export const UNDO_DEPTH = 500;
