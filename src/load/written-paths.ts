import { EspalierError, quoted, type SourcePos, say } from "../errors.js";

/**
 * Paths and ids whose bytes are not UTF-8, as read (every bad sequence one U+FFFD, as the WHATWG
 * decoder reads it) and as written (their bytes). Two that read the same but are written in different
 * bytes (Latin-1 names `caf\xe9`, `caf\xe8`) would make one node of two (a path list's folders, a
 * table's ids: a row linked to another's parent), with no error; so the later is DUPLICATE_PATH or
 * DUPLICATE_ID where it stands, naming the earlier.
 *
 * A "/" byte is never part of a bad sequence (the decoder reads an ASCII byte as itself after one), so
 * a path read and as written have their slashes at the same places, and each folder on the way is
 * checked.
 */
export class WrittenPaths {
  private readonly seen = new Map<string, { written: string; at: number }>();

  /** `unit`: what `at` counts in the input, a list's lines or a table's data rows. */
  constructor(private readonly unit: "line" | "row") {}

  /**
   * Checks the path `read` (decoded) of the line or row `at`, whose bytes are `written` (read as
   * Latin-1: one character per byte), both with their folders split by "/"; `field` is the table column
   * holding it.
   */
  checkPath(read: string, written: string, at: number, field?: string): void {
    const readParts = read.split("/");
    const writtenParts = written.split("/");
    let readPath = "";
    let writtenPath = "";
    for (let k = 0; k < readParts.length; k++) {
      // Doubled and trailing separators name nothing (path-placer.ts); a leading one is the node "/".
      if (readParts[k] === "" && k > 0) continue;
      readPath += k === 0 ? readParts[k] : `/${readParts[k]}`;
      writtenPath += k === 0 ? writtenParts[k] : `/${writtenParts[k]}`;
      if (readPath.includes("\uFFFD")) this.checkOne("path", readPath, writtenPath, at, field);
    }
  }

  /** As {@link checkPath}, for an id (in an id or a parent column): one name, no folders. */
  checkId(read: string, written: string, at: number, field: string): void {
    this.checkOne("id", read, written, at, field);
  }

  private checkOne(kind: "path" | "id", read: string, written: string, at: number, field?: string): void {
    const earlier = this.seen.get(read);
    if (earlier === undefined) this.seen.set(read, { written, at });
    else if (earlier.written !== written) throw this.writtenTwoWays(kind, read, at, earlier.at, field);
  }

  private writtenTwoWays(kind: "path" | "id", read: string, at: number, first: number, field?: string) {
    const { unit } = this;
    const pos: SourcePos =
      unit === "line" ? { line: at, column: 1 } : { row: at, ...(field ? { field } : {}) };
    return new EspalierError(
      kind === "path" ? "DUPLICATE_PATH" : "DUPLICATE_ID",
      say`${unit} ${at} writes the ${kind} ${kind === "path" ? quoted.path(read) : quoted.id(read)} in other bytes than ${unit} ${first} does: bytes that are not UTF-8 are read as U+FFFD, so the two would be one node here; convert the input to UTF-8 first (iconv -f LATIN1 -t UTF-8, when it is Latin-1)`,
      pos,
      unit === "line" ? { firstLine: first } : { firstRow: first },
    );
  }
}
