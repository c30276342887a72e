import { EspalierError, quoted, say } from "../../errors.js";
import type { LoadOptions } from "../load-options.js";

type Fields = Pick<LoadOptions, "idField" | "parentField" | "nullParents">;

/**
 * Parent cells that mean "no parent" besides the empty cell (`--null-parent`): a process table's
 * parent 0, a database export's `\N` or `NULL`. Undefined when none is named.
 */
export function nullParentSet(options: Fields): ReadonlySet<string> | undefined {
  return options.nullParents && options.nullParents.length > 0 ? new Set(options.nullParents) : undefined;
}

/**
 * `--null-parent` says how a parent column reads; an input linked any other way (nested nodes, a path
 * list or column, an edge list, an adjacency map) would ignore it, and a user who named the value would
 * not learn that it did not apply: USAGE, naming what the input was read as.
 */
export function checkNullParentUse(
  nodes: { parentColumnRead?: boolean; reading?: { shape: string } },
  format: string,
  options: Pick<LoadOptions, "nullParents">,
): void {
  if (!options.nullParents || options.nullParents.length === 0 || nodes.parentColumnRead) return;
  const read = nodes.reading?.shape ?? format;
  throw new EspalierError(
    "USAGE",
    `--null-parent reads a parent column (a table or JSON rows linked by id and parent); this input is read as ${read}, without one`,
  );
}

/**
 * A row whose id is a value named to mean "no parent": its children could be either, so the table is
 * refused rather than read one way in silence.
 */
export function idIsNullParent(id: string, row: number, options: Fields): EspalierError {
  return new EspalierError(
    "SHAPE",
    say`row ${row} has the ${options.idField} ${quoted.id(id)}, which --null-parent says means no parent: a row naming it as its ${options.parentField} could be either`,
    { row, field: options.idField },
  );
}

/**
 * Parent values that exports commonly write for "none" (common practice, no source): a process table's
 * 0 (`ps -o ppid`), -1, SQL's NULL, MySQL's `\N` in CSV exports, `null`, `None`, `nil`, `n/a`.
 */
const usualNoneValues = new Set(["0", "-1", "null", "\\n", "none", "nil", "n/a", "nan", "#n/a"]);

/**
 * For MISSING_PARENT's hint on a parent cell that is nearly an id ({@link nearParentId}): `trimmedRow`,
 * the 1-based row whose id is that near id, when one is; `strings`, whether the cells are JSON strings
 * (JSON rows) rather than CSV or TSV text.
 */
export interface SpacedParent {
  trimmedRow?: number;
  /** The 1-based row whose id, with spaces around it, is the parent cell without them ({@link spacedIdRow}). */
  spacedIdRow?: number;
  strings: boolean;
}

/**
 * The first row (0-based) whose id has spaces around it and is `parentId` without them (`3 ` for a
 * parent cell `3`), as a sheet's cell typed with a trailing space is; -1 for none. Looked for only
 * once a parent names no id: a pass over the ids.
 */
export function spacedIdRow(parentId: string, rows: number, idOf: (row: number) => string): number {
  if (parentId.trim() !== parentId || parentId === "") return -1;
  for (let r = 0; r < rows; r++) {
    const id = idOf(r);
    if (id.length > parentId.length && id.trim() === parentId) return r;
  }
  return -1;
}

/**
 * The id a parent cell likely means when it names none: the value without the spaces around it (`a `,
 * which CSV keeps: RFC 4180, section 2.4), or a whole number without its `.0` (`12.0`, as a spreadsheet
 * may write a column of numbers: common practice, no source); undefined when the cell is neither.
 */
export function nearParentId(parentId: string): string | undefined {
  const trimmed = parentId.trim();
  if (trimmed !== parentId) return trimmed;
  const whole = /^(\d+)\.0+$/.exec(parentId);
  return whole ? whole[1] : undefined;
}

/**
 * MISSING_PARENT for a parent id no row has. A value that usually means "none" names `--null-parent`;
 * a value that is another row's name (`nameRow`, 1-based: an org chart whose manager column holds names)
 * names `--id-field` with the name column; a value with spaces around it says so, and names the row whose
 * id it is without them (`spaced`).
 */
export function missingParent(
  parentId: string,
  row: number,
  options: Fields & { nameField?: string },
  nameRow?: number,
  spaced?: SpacedParent,
): EspalierError {
  const none = usualNoneValues.has(parentId.trim().toLowerCase());
  const missing = say`row ${row} names the ${options.parentField} ${quoted.id(parentId)}, which no row has as its ${options.idField}`;
  if (none)
    return new EspalierError(
      "MISSING_PARENT",
      say`${missing}; if it means no parent (a top-level row), say ${`--null-parent ${shellWord(parentId)}`}`,
      { row, field: options.parentField },
      { remedies: [`--null-parent ${shellWord(parentId)}`] },
    );
  if (nameRow !== undefined && options.nameField !== undefined) {
    const remedy = `--id-field ${shellWord(options.nameField)}`;
    return new EspalierError(
      "MISSING_PARENT",
      say`${missing}, but it is row ${nameRow}'s ${options.nameField}; if the ${options.parentField} column holds names, say ${remedy}`,
      { row, field: options.parentField },
      { remedies: [remedy] },
    );
  }
  const whole = /^(\d+)\.0+$/.exec(parentId);
  if (whole && spaced?.trimmedRow !== undefined)
    return new EspalierError(
      "MISSING_PARENT",
      say`${missing}; row ${spaced.trimmedRow}'s ${options.idField} is ${quoted.id(whole[1])}, the same whole number without ".0", as a spreadsheet may write a column of numbers: write the ${options.parentField} column as whole numbers`,
      { row, field: options.parentField },
      { idRow: spaced.trimmedRow },
    );
  // `1, , Ada`: spaces after the commas are part of each value (RFC 4180, 2.4), so " " is no empty
  // parent and " 1" no id "1"; a hand-written table often has them.
  if (parentId !== parentId.trim()) {
    const trimmed = parentId.trim();
    const what = spaced?.strings ? "value" : "cell";
    const keeps = spaced?.strings
      ? "a JSON string keeps every character between its quotes"
      : "CSV and TSV keep spaces as part of a value (RFC 4180, section 2.4): write the table without spaces around the separators";
    if (spaced?.trimmedRow !== undefined)
      return new EspalierError(
        "MISSING_PARENT",
        say`${missing}; row ${spaced.trimmedRow}'s ${options.idField} is ${quoted.id(trimmed)}, the ${what} without its spaces: ${keeps}`,
        { row, field: options.parentField },
        { idRow: spaced.trimmedRow },
      );
    return new EspalierError(
      "MISSING_PARENT",
      spaced?.strings
        ? say`${missing}; the value has spaces around it, which are part of it: ${keeps}`
        : say`${missing}; the cell has spaces around its value, which CSV keeps as part of it (RFC 4180, section 2.4): write the table without spaces around the separators`,
      { row, field: options.parentField },
    );
  }
  if (spaced?.spacedIdRow !== undefined) {
    const keeps = spaced.strings
      ? "a JSON string keeps every character between its quotes"
      : "CSV and TSV keep spaces as part of a value (RFC 4180, section 2.4): write the table without spaces around the separators";
    return new EspalierError(
      "MISSING_PARENT",
      say`${missing}; row ${spaced.spacedIdRow}'s ${options.idField} is the same with spaces around it: ${keeps}`,
      { row, field: options.parentField },
      { idRow: spaced.spacedIdRow },
    );
  }
  return new EspalierError("MISSING_PARENT", missing, { row, field: options.parentField });
}

/** The value as one shell word: as is when plain, else in single quotes (`'\\N'`). */
function shellWord(value: string): string {
  return /^[\w.+-]+$/.test(value) ? value : `'${value.replaceAll("'", "'\\''")}'`;
}
