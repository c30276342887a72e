import type { LoadOptions } from "../load-options.js";
import { isRowsValue } from "../rows-shape.js";

const M_NESTED = 0;
const M_ROWS = 1;
const M_UNDECIDED = 2;

/**
 * Whether a JSON input is rows (a table) or nested nodes. Forced by `as`; otherwise a top-level object
 * is nodes, and a top-level array is rows when its first element is a record with the id, parent or path
 * field and no children field ({@link isRowsValue}), decided when that element ends, or earlier when it
 * turns out to have children or not to be an object.
 */
export class RowsProbe {
  private mode: number;

  constructor(as?: "json" | "rows") {
    this.mode = as === "rows" ? M_ROWS : as === "json" ? M_NESTED : M_UNDECIDED;
  }

  get rows(): boolean {
    return this.mode === M_ROWS;
  }

  get undecided(): boolean {
    return this.mode === M_UNDECIDED;
  }

  /** What was read so far can only be nodes. */
  nodes(): void {
    if (this.mode === M_UNDECIDED) this.mode = M_NESTED;
  }

  /** Decides by the first element of the top-level array, `first`: true for rows. */
  decide(
    first: unknown,
    fields: Pick<LoadOptions, "childrenField" | "idField" | "parentField" | "pathField">,
  ): boolean {
    this.mode = isRowsValue([first], fields) ? M_ROWS : M_NESTED;
    return this.mode === M_ROWS;
  }
}
