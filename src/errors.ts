/** Where the input is at fault. Lines, columns and rows are 1-based. */
export interface SourcePos {
  file?: string;
  line?: number;
  column?: number;
  /** Data row of a table (1 = the first row after the header). */
  row?: number;
  /**
   * The table column (its header name) of the faulty cell in `row`, or the key of a JSON graph's
   * entry, while the loader that read the input places it as a line and column; never printed, and
   * gone once placed.
   */
  field?: string;
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

/**
 * What a piece of input quoted in a message is. Under `--pseudonymize` names, ids and node paths print
 * as their pseudonyms; values and excerpts (a bad size cell, a parser's quote of the text) as `(hidden)`.
 */
export type InputKind = "name" | "id" | "path" | "value" | "excerpt";

/** Text taken from the input, kept apart from a message's wording so the printer can hide it. */
export interface InputText {
  readonly kind: InputKind;
  readonly text: string;
}

/** A message: wording, and input text marked as such. */
export type MessagePart = string | InputText;

/**
 * Marks input text for a message. Every loader quotes names, ids, paths and values through these (in
 * the {@link say} template), never by pasting them into the wording, so `--pseudonymize` can hide them.
 */
export const quoted = {
  name: (text: string): InputText => ({ kind: "name", text }),
  id: (text: string): InputText => ({ kind: "id", text }),
  path: (text: string): InputText => ({ kind: "path", text }),
  value: (text: string): InputText => ({ kind: "value", text }),
  excerpt: (text: string): InputText => ({ kind: "excerpt", text }),
};

/**
 * Input texts of one kind as a list for a message, `"a", "b", "c"` (at most `max`, then `and N more`);
 * `(none)` when empty.
 */
export function quotedList(kind: InputKind, texts: readonly string[], max = 12): MessagePart[] {
  if (texts.length === 0) return ["(none)"];
  const parts: MessagePart[] = [];
  texts.slice(0, max).forEach((text, k) => {
    if (k > 0) parts.push(", ");
    parts.push({ kind, text });
  });
  if (texts.length > max) parts.push(` and ${texts.length - max} more`);
  return parts;
}

/**
 * A message from a template: `` say`row ${3} repeats the id ${quoted.id(x)}` ``. A value may be input
 * text, an array of message parts (a message built elsewhere), or anything else, printed as text.
 */
export function say(strings: TemplateStringsArray, ...values: unknown[]): MessagePart[] {
  const parts: MessagePart[] = [strings[0]];
  values.forEach((value, k) => {
    if (Array.isArray(value)) for (const v of value) parts.push(isInputText(v) ? v : String(v));
    else parts.push(isInputText(value) ? value : String(value));
    parts.push(strings[k + 1]);
  });
  return parts;
}

function isInputText(value: unknown): value is InputText {
  return typeof value === "object" && value !== null && "kind" in value && "text" in value;
}

/** How input text prints with nothing hidden: names, ids, paths and values quoted as JSON strings, excerpts as they are. */
export function showInput(t: InputText): string {
  return t.kind === "excerpt" ? t.text : JSON.stringify(t.text);
}

/** A typed, user-facing error: a code, an actionable message and where the input is at fault. */
export class EspalierError extends Error {
  readonly code: ErrorCode;
  readonly pos: SourcePos | undefined;
  /** The message as wording and marked input text ({@link quoted}); `message` shows the input as it is. */
  readonly parts: readonly MessagePart[];
  readonly details: ErrorDetails;
  override readonly name = "EspalierError";

  constructor(
    code: ErrorCode,
    message: string | readonly MessagePart[],
    pos?: SourcePos,
    details: ErrorDetails = {},
  ) {
    const parts = typeof message === "string" ? [message] : message;
    super(render(parts, showInput));
    this.code = code;
    this.pos = pos;
    this.parts = parts;
    this.details = details;
  }

  /** A copy that names the file, for errors raised below the layer that knows it. */
  inFile(file: string): EspalierError {
    if (this.pos?.file !== undefined) return this;
    return new EspalierError(this.code, this.parts, { ...this.pos, file }, this.details);
  }

  /**
   * A copy at `pos` where it says more (the line and column of a table row the loader found); once it
   * has a column, the table column it was placed by is dropped.
   */
  placed(pos: SourcePos | undefined): EspalierError {
    if (pos === undefined) return this;
    const merged = { ...this.pos, ...pos };
    if (pos.column !== undefined) delete merged.field;
    return new EspalierError(this.code, this.parts, merged, this.details);
  }

  /** A copy whose input text is printed by `show` (pseudonyms, or hidden) and then kept only as wording. */
  hidingInput(show: (t: InputText) => string): EspalierError {
    // Details may quote the input as well: only numbers and yes/no facts stay.
    const kept = Object.fromEntries(
      Object.entries(this.details).filter(([, v]) => typeof v === "number" || typeof v === "boolean"),
    );
    return new EspalierError(this.code, [render(this.parts, show)], this.pos, kept);
  }

  /** Plain data, to cross a thread (structured clone) and come back as the same error. */
  toData(): EspalierErrorData {
    return { code: this.code, parts: [...this.parts], pos: this.pos, details: this.details };
  }

  static fromData(data: EspalierErrorData): EspalierError {
    return new EspalierError(data.code, data.parts, data.pos, data.details);
  }
}

/** An {@link EspalierError} as plain data. */
export interface EspalierErrorData {
  code: ErrorCode;
  parts: MessagePart[];
  pos: SourcePos | undefined;
  details?: ErrorDetails;
}

function render(parts: readonly MessagePart[], show: (t: InputText) => string): string {
  let out = "";
  for (const part of parts) out += typeof part === "string" ? part : show(part);
  return out;
}

/**
 * `file:line:column` (or `file:line` where no column is known), or just the file when the fault is the
 * file as a whole, for the one line printed at the edge. A row without a line is not printed: the
 * message names its row itself (printing both read "row 3: row 3").
 */
export function formatPos(pos: SourcePos | undefined): string {
  if (!pos) return "";
  const file = pos.file ?? "<input>";
  if (pos.line !== undefined) return `${file}:${pos.line}${pos.column !== undefined ? `:${pos.column}` : ""}`;
  return file;
}

/** `err` without the table column it was to be placed by (see {@link SourcePos.field}), once placing is over. */
export function placingDone(err: unknown): unknown {
  if (!(err instanceof EspalierError) || err.pos?.field === undefined) return err;
  const { field: _, ...pos } = err.pos;
  return new EspalierError(err.code, err.parts, pos, err.details);
}

/**
 * `err` placed by `place` when it is an error about a table row that has no column yet (see
 * {@link SourcePos.field}); anything else as it is.
 */
export function placedAtRow(
  err: unknown,
  place: ((row: number, field?: string) => SourcePos | undefined) | undefined,
): unknown {
  if (!(err instanceof EspalierError) || place === undefined) return err;
  const pos = err.pos;
  if (pos?.row === undefined || pos.column !== undefined) return err;
  return err.placed(place(pos.row, pos.field));
}
