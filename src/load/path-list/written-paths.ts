import { EspalierError, quoted, say } from "../../errors.js";

/**
 * The paths of a path list's lines whose bytes are not UTF-8, each folder on the way as read (every bad
 * sequence one U+FFFD, as the WHATWG decoder reads it) and as written (its bytes). Two lines that write
 * one read folder in different bytes (`caf\xe9/a`, `caf\xe8/b`: two folders, Latin-1 names) would make
 * one node of two folders, with no error, so that is DUPLICATE_PATH at the later line.
 *
 * A "/" byte is never part of a bad sequence (the decoder reads an ASCII byte as itself after one), so
 * the read path and the written one have their slashes at the same segments.
 */
export class WrittenPaths {
  private readonly seen = new Map<string, { written: string; line: number }>();

  /**
   * Checks the path `read` (decoded) of `line`, whose bytes are `written` (read as Latin-1: one character
   * per byte), both with their folders split by "/".
   */
  check(read: string, written: string, line: number): void {
    const readParts = read.split("/");
    const writtenParts = written.split("/");
    let readPath = "";
    let writtenPath = "";
    for (let k = 0; k < readParts.length; k++) {
      // Doubled and trailing separators name nothing (path-placer.ts); a leading one is the node "/".
      if (readParts[k] === "" && k > 0) continue;
      readPath += k === 0 ? readParts[k] : `/${readParts[k]}`;
      writtenPath += k === 0 ? writtenParts[k] : `/${writtenParts[k]}`;
      if (!readPath.includes("\uFFFD")) continue;
      const earlier = this.seen.get(readPath);
      if (earlier === undefined) this.seen.set(readPath, { written: writtenPath, line });
      else if (earlier.written !== writtenPath) throw writtenTwoWays(readPath, line, earlier.line);
    }
  }
}

function writtenTwoWays(path: string, line: number, firstLine: number): EspalierError {
  return new EspalierError(
    "DUPLICATE_PATH",
    say`line ${line} writes the path ${quoted.path(path)} in other bytes than line ${firstLine} does: bytes that are not UTF-8 are read as U+FFFD, so the two would be one node here; list the names converted to UTF-8 first (iconv -f LATIN1 -t UTF-8, when they are Latin-1)`,
    { line, column: 1 },
    { firstLine },
  );
}
