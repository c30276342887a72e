/** Where the input is at fault. Lines, columns and rows are 1-based. */
export interface SourcePos {
  file?: string;
  line?: number;
  column?: number;
  /** Data row of a table (1 = the first row after the header). */
  row?: number;
}

/** The closed set of error codes. Tests assert these, never message wording. */
export const errorCodes = [
  "USAGE",
  "IO",
  "INPUT_EMPTY",
  "FORMAT_UNKNOWN",
  "PARSE_JSON",
  "PARSE_YAML",
  "PARSE_CSV",
  "PARSE_PATHS",
  "SHAPE",
  "FIELD_MISSING",
  "BAD_SIZE",
  "CYCLE",
  "DUPLICATE_ID",
  "DUPLICATE_PATH",
  "MISSING_PARENT",
  "TWO_PARENTS",
  "FOCUS_SYNTAX",
  "FOCUS_NO_MATCH",
  "BUDGET_TOO_SMALL",
  "LIMIT_EXCEEDED",
  "ENGINE_MISSING",
  "ENGINE_FAILED",
] as const;

export type ErrorCode = (typeof errorCodes)[number];

/**
 * Facts of an error that a program (or a test) can act on without reading the message, e.g.
 * `{ smallestBudget: 5 }` or `{ option: "--budgt", suggestion: "--budget" }`.
 */
export type ErrorDetails = Readonly<Record<string, string | number | boolean | readonly string[]>>;

/** A typed, user-facing error: a code, an actionable message and where the input is at fault. */
export class EspalierError extends Error {
  readonly code: ErrorCode;
  readonly pos: SourcePos | undefined;
  readonly details: ErrorDetails;
  override readonly name = "EspalierError";

  constructor(code: ErrorCode, message: string, pos?: SourcePos, details: ErrorDetails = {}) {
    super(message);
    this.code = code;
    this.pos = pos;
    this.details = details;
  }

  /** A copy that names the file, for errors raised below the layer that knows it. */
  inFile(file: string): EspalierError {
    if (this.pos?.file !== undefined) return this;
    return new EspalierError(this.code, this.message, { ...this.pos, file }, this.details);
  }
}

/** `file:line:column`, `file: row N` or just the file, for the one line printed at the edge. */
export function formatPos(pos: SourcePos | undefined): string {
  if (!pos) return "";
  const file = pos.file ?? "<input>";
  if (pos.line !== undefined) return `${file}:${pos.line}${pos.column !== undefined ? `:${pos.column}` : ""}`;
  if (pos.row !== undefined) return `${file}: row ${pos.row}`;
  return file;
}
