import { Buffer, isUtf8 } from "node:buffer";
import { EspalierError, type MessagePart, quoted, quotedList, say } from "../../errors.js";
import { asBuffer } from "../../model/buffer-codecs.js";
import type { LinkedNodes } from "../../model/linked-nodes.js";
import type { ReadingNote } from "../../model/reading-note.js";
import { hasReplacement } from "../has-replacement.js";
import { knownListingError } from "../known-listings.js";
import type { LoadOptions } from "../load-options.js";
import { checkNoNamedFields } from "../missing-field.js";
import { NodeSink } from "../node-sink.js";
import { notUtf8Note } from "../not-utf8-note.js";
import { parseSize } from "../parse-size.js";
import { PathPlacer, viewOf } from "../path-placer.js";
import { limitsOf, tooLong } from "../read-limits.js";
import { checkReadingOptions } from "../reading-options.js";
import { SEP_LINE, sepLineMessage } from "../sep-line.js";
import { sizeTextHint } from "../size-text-hint.js";
import { WrittenPaths } from "../written-paths.js";
import { BLOCK_COUNTS, blockCountLine } from "./block-counts.js";
import { colonFields, colonRecordsMessage } from "./colon-records.js";
import { complaintError, complaintLines, complaintOf } from "./complaint-lines.js";
import { dotAndPlain } from "./dot-prefix.js";
import { type FolderSizes, folderTotals, type PlacedSizes } from "./folder-totals.js";
import { gitUnquoted } from "./git-quoted.js";
import {
  grandTotalNote,
  isGrandTotal,
  LIKE_TOTAL_EVIDENCE,
  likeTotalNote,
  TOTAL_NAMES,
} from "./grand-total.js";
import { headerLineHint } from "./header-line-hint.js";
import { mixedStartsNote } from "./mixed-starts.js";
import { LS_LINES, MODES_FIRST, modeLineShape, TAR_LINES } from "./mode-lines.js";
import { MOUNT_TABLE, mountLine } from "./mount-table.js";
import { columnsAlignedMessage } from "./process-columns.js";

const newline = 10;
const cr = 13;
const tab = 9;
const space = 32;
const slash = 47;
const dot = 46;
const colon = 58;
const backslash = 92;
const comma = 44;
const semicolon = 59;
const quote = 34;

/**
 * A path list read from UTF-8 bytes, whole or in chunks: one "/"-separated path per line, blank lines
 * ignored. When the first non-blank line holds a tab, every line is "size<TAB>path" (as
 * `find -printf '%s\t%p\n'` prints); when it is digits, spaces and a path that starts with "/" or
 * "./" (or is "."), every line is "size<SPACES>path" (`find DIR -printf '%s %p\n'`, `stat -c '%s %n'`:
 * a relative name never starts so, so the reading is not a guess); otherwise a whole line is one path.
 * When the first path starts with a drive (`C:\`) or two backslashes (`\\server`), the list is a
 * Windows one (`dir /s /b`): every path is split on "\" (which no Windows name holds; "/" neither).
 * Origins are line numbers.
 * A size with an empty path names the root (`find DIR -printf '%s\t%P\n'` prints the starting folder
 * so): every top-level path goes below it. With `nulSeparated`, entries end with a NUL byte instead
 * (`find -print0`, `git ls-files -z`), so a name may hold a line break; nothing is stripped but
 * entries of nothing at all.
 *
 * No line is decoded: lines are cut, sizes parsed, each path compared with the previous one and its
 * segments hashed on the bytes themselves, and a new node's name is copied into the name pool as bytes.
 *
 * Equal names must be equal bytes for the hash table to find them: valid UTF-8 has one spelling per
 * string, and a block with invalid bytes is first decoded (each bad sequence becomes U+FFFD, as the
 * WHATWG decoder does) and encoded again.
 */
export class PathListReader {
  private readonly sink: NodeSink;
  private readonly rootName: string;
  // The start of a line cut by the end of a chunk, in pieces.
  private waiting: Buffer[] = [];
  private waitingBytes = 0;
  /** Longest line, in bytes (read-limits.ts): a line that never ends stops there, not in memory. */
  private readonly maxLineBytes: number;
  private sized: boolean | undefined;
  /** The byte after a line's size: a tab, or a space (then any further spaces are skipped too). */
  private sizeEnd = tab;
  /** Whether paths are split on "\" (a Windows listing), decided by the first path. */
  private backslashes: boolean | undefined;
  private firstLine = 0;
  private line = 0;
  private readonly placer: PathPlacer;
  /** The byte that ends an entry: "\n", or NUL. */
  private readonly separator: number;
  /** Whether an entry's end has been read yet (see `noSeparator`). */
  private sawSeparator = false;
  /** Whether the format was detected, not asked for (`--input-format paths`). */
  private readonly detected: boolean;
  /** Unsized lists: non-blank lines, and those that start with a number and a space (see `end`). */
  private pathLines = 0;
  private numberFirstLines = 0;
  /** Unsized lists: lines that start with a file's mode (`-rw-r--r--`), as `ls -l` and `tar tv` print. */
  private modeFirstLines = 0;
  /** Unsized lists: lines that start with a drawn tree's lines (`├── `, `+-- `), and the first one's number. */
  private drawnLines = 0;
  private firstDrawn = 0;
  /** Unsized lists: lines of the first {@link COMMA_LINES} holding two spaces between words (see `end`). */
  private spacedLines = 0;
  /** Unsized lists: lines of the first {@link COMMA_LINES}, while every one is, that end in a space and a number (see `end`). */
  private sizeLastLines = 0;
  /** Unsized lists: lines as git diff --stat prints them (`path | 12 ++--`), and its closing count. */
  private statLines = 0;
  /**
   * How the first line that starts with a mode is shaped: as GNU tar and busybox tar tv print it (see
   * {@link TAR_LINE}), as ls -l and bsdtar tv do (see {@link LS_LINE}), or neither.
   */
  private tarFirst: "tar" | "ls" | undefined;
  /** Whether the first unsized line is `total N`, as `ls -l` prints first. */
  private totalFirst = false;
  /** Unsized lists: lines after a first `total N` that are a count of blocks and a name, as `ls -s` prints. */
  private blockLines = 0;
  /** Unsized lists: lines of the first {@link COMMA_LINES} that are a mount table's, and those that are not comments. */
  private mountLines = 0;
  private mounts = 0;
  /** Unsized lists: the colons of the first line's record (see {@link colonFields}), and the lines of the first {@link COMMA_LINES} with as many. */
  private colons = -1;
  private colonLines = 0;
  /** The first unsized line (its first 200 bytes), to tell a known command's listing by its second (see `one`). */
  private firstText = "";
  /** Whether the first unsized line is words and spaces without a "/", as a header of columns is. */
  private headerFirst = false;
  /** Unsized lists: how many of the first {@link COMMA_LINES} lines read as `npm ls --parseable --long` prints. */
  private packageLines = 0;
  /** The first line's words when it reads as a header of columns (see `headerFirst`). */
  private headerWords: string[] = [];
  /**
   * Whether that header is words in capitals (`UID PID PPID C STIME TTY TIME CMD`, as ps prints) and
   * each of the first {@link COMMA_LINES} lines after it holds as many fields split by spaces.
   */
  private filledColumns = false;
  /**
   * Unsized lists: the commas on the first line, and whether each of the first {@link COMMA_LINES}
   * lines holds as many: rows of a CSV table without its header row (see `end`).
   */
  private commas = 0;
  private firstCells: string[] = [];
  private sameCommas = true;
  /** As `commas`, for semicolons: rows of a table a spreadsheet saved with ";" between cells (see `end`). */
  private semicolons = 0;
  private sameSemicolons = true;
  /** The separator a first line `sep=X` names, as spreadsheets write it before a table's header, else "". */
  private sepLine = "";
  /** How folders' sizes count (folder-totals.ts); undefined: decided by the listing. */
  private readonly folderSizes: FolderSizes | undefined;
  /** The bytes of the line being read when they are not UTF-8 (it is read decoded), else undefined. */
  private writtenLine: Buffer | undefined;
  /** Paths of lines whose bytes are not UTF-8, as read and as written (see {@link WrittenPaths}). */
  private readonly written = new WrittenPaths("line");
  /** Lines whose bytes are not UTF-8, and the first one's number (see {@link notUtf8Note}). */
  private notUtf8Lines = 0;
  private firstNotUtf8 = 0;
  /** The input's length when known (`LoadOptions.inputBytes`), the bytes read so far, and whether room was made. */
  private readonly inputBytes: number | undefined;
  private readBytes = 0;
  private roomMade = false;

  constructor(options: LoadOptions) {
    checkNoNamedFields(options, "paths");
    checkReadingOptions({ reading: { shape: "paths" } }, "paths", options);
    this.sink = new NodeSink(options.maxNodes, false);
    this.placer = new PathPlacer(this.sink);
    this.rootName = options.rootName;
    this.maxLineBytes = limitsOf(options.limits).maxLineBytes;
    this.separator = options.nulSeparated === true ? 0 : newline;
    this.folderSizes = options.folderSizes;
    this.detected = options.format === undefined;
    this.inputBytes = options.inputBytes;
  }

  /**
   * Reads the next chunk of the input: its whole lines as they are, undecoded and uncopied; a line cut
   * between chunks is joined (its bytes only) first. A "\n" byte is never inside a multi-byte UTF-8
   * character, so a character (or a "\r\n") cut between chunks is whole again in the joined line.
   */
  write(piece: Uint8Array): void {
    this.writeLines(asBuffer(piece));
    this.readBytes += piece.length;
    if (!this.roomMade) this.makeRoom();
  }

  /**
   * After the first chunk of an input of known length: room for the nodes and name bytes it likely has
   * (those of the chunk, in proportion to the length, plus 5%), made once, where growing by doubling
   * makes fresh memory and a copy of every array a dozen times over. A guess too low grows as before;
   * room never used is memory never touched. A first chunk of short lines under a longer rest would
   * guess too many: the room is at most a node for every {@link BYTES_A_NODE} bytes (about twice the
   * input's length in arrays) and the names' bytes at most the input's.
   */
  private makeRoom(): void {
    const size = this.inputBytes;
    const sink = this.sink;
    if (size === undefined || sink.length === 0) return;
    this.roomMade = true;
    if (this.readBytes >= size) return;
    const scale = (1.05 * size) / this.readBytes;
    const nodes =
      Math.min(sink.maxNodes, Math.ceil(sink.length * scale), Math.ceil(size / BYTES_A_NODE)) + 1024;
    sink.makeRoom(nodes);
    sink.name.makeRoom(nodes, Math.min(size, Math.ceil(sink.name.usedBytes * scale)));
    this.placer.makeRoom(nodes);
  }

  private writeLines(chunk: Buffer): void {
    let from = 0;
    if (this.waiting.length > 0) {
      const first = chunk.indexOf(this.separator);
      if (first === -1) {
        this.wait(chunk);
        return;
      }
      this.waiting.push(chunk.subarray(0, first + 1));
      const line = Buffer.concat(this.waiting);
      this.lines(line, 0, line.length);
      this.waiting = [];
      this.waitingBytes = 0;
      from = first + 1;
    }
    const last = chunk.lastIndexOf(this.separator);
    if (last !== -1) this.sawSeparator = true;
    if (last < from) {
      if (from < chunk.length) this.wait(chunk.subarray(from));
      return;
    }
    this.lines(chunk, from, last + 1);
    if (last + 1 < chunk.length) this.wait(chunk.subarray(last + 1));
  }

  /**
   * As {@link lines}, for bytes that are not all UTF-8 or that write U+FFFD: each line that is not UTF-8
   * is decoded on its own (each bad sequence one U+FFFD, as the WHATWG decoder reads it) and encoded
   * again, so that equal names are equal bytes; its path, and that of a line writing U+FFFD itself, is
   * checked against the others so written ({@link WrittenPaths}).
   */
  private undecodedLines(bytes: Buffer, start: number, end: number): void {
    const view = viewOf(bytes);
    const sep = this.separator;
    while (start < end) {
      let stop = bytes.indexOf(sep, start);
      if (stop === -1 || stop >= end) stop = end;
      const written = bytes.subarray(start, stop);
      if (isUtf8(written)) {
        // Valid UTF-8 read as it is; its path is checked against the others only when it writes U+FFFD.
        this.writtenLine = hasReplacement(written, 0, written.length) ? written : undefined;
        try {
          this.one(bytes, view, start, stop);
        } finally {
          this.writtenLine = undefined;
        }
      } else {
        // One line further than read so far: a line that is not UTF-8 is not blank.
        if (this.notUtf8Lines++ === 0) this.firstNotUtf8 = this.line + 1;
        const read = Buffer.from(written.toString("utf8"), "utf8");
        this.writtenLine = written;
        try {
          this.one(read, viewOf(read), 0, read.length);
        } finally {
          this.writtenLine = undefined;
        }
      }
      start = stop + 1;
    }
  }

  /** Keeps the start of a line cut by the end of a chunk; LIMIT_EXCEEDED past the longest line. */
  private wait(bytes: Buffer): void {
    this.waiting.push(bytes);
    this.waitingBytes += bytes.length;
    if (this.waitingBytes > this.maxLineBytes) {
      this.noSeparator(Buffer.concat(this.waiting));
      const line = this.line + 1;
      throw tooLong(`line ${line}`, this.maxLineBytes, { line, column: 1 });
    }
  }

  /** Ends the input; the nodes, ready for `buildTree`. */
  end(): LinkedNodes {
    const rest = Buffer.concat(this.waiting);
    this.waiting = [];
    this.noSeparator(rest);
    this.lines(rest, 0, rest.length);
    const sink = this.sink;
    if (sink.length === 0) throw new EspalierError("INPUT_EMPTY", "the path list names no paths");
    const named = this.namedRefusal();
    if (named !== undefined) throw named;
    if (this.detected && this.sized === false && this.numberFirstLines === this.pathLines) {
      // Every line as `find -printf '%s %p\n'` or `wc -c` prints it: read as names, each top-level name
      // would be a size, and every size lost, with exit 0.
      if (FIND_LS.test(this.firstText))
        throw new EspalierError("PARSE_PATHS", FIND_LS_LINES, { line: this.firstLine, column: 1 });
      throw new EspalierError(
        "PARSE_PATHS",
        "every line starts with a number and a space, as find -printf '%s %P\\n' and wc -c print: a size is read before a tab (find -printf '%s\\t%p\\n'), or before spaces when the first path starts with / or ./ (find /DIR or find . -printf '%s %p\\n'); to read these lines as paths whose names start with a number, pass --input-format paths",
        { line: this.firstLine, column: 1 },
      );
    }
    if (
      this.detected &&
      this.sized === false &&
      this.headerFirst &&
      this.pathLines > 2 &&
      this.numberFirstLines === this.pathLines - 1
    ) {
      // `ps -eo pid,ppid,comm`: a header of columns aligned with spaces, then a number first on every
      // line. Read as paths, each line would be one path (a process name with a "/" split into
      // folders), with exit 0.
      throw new EspalierError("PARSE_PATHS", columnsAlignedMessage(this.headerWords, "number"), {
        line: this.firstLine,
        column: 1,
      });
    }
    if (this.detected && this.sized === false && this.filledColumns && this.pathLines > 2) {
      // `ps -ef`, `ps aux`: a header of capitals, then lines that fill its columns, a user's name first.
      // Read as paths, each line would be one path, a command's "/"s splitting it into folders.
      throw new EspalierError("PARSE_PATHS", columnsAlignedMessage(this.headerWords, "filled"), {
        line: this.firstLine,
        column: 1,
      });
    }
    if (
      this.detected &&
      this.sized === false &&
      this.modeFirstLines > 0 &&
      this.modeFirstLines === this.pathLines - (this.totalFirst ? 1 : 0)
    ) {
      // `ls -l` or `tar tv`: each line a file's mode, owner, size, date and name. Read as paths, each
      // whole line would be one path split at its "/"s, the sizes in the names, with exit 0.
      const message = this.tarFirst === "tar" ? TAR_LINES : this.tarFirst === "ls" ? LS_LINES : MODES_FIRST;
      throw new EspalierError("PARSE_PATHS", message, {
        line: this.firstLine,
        column: 1,
      });
    }
    if (
      this.detected &&
      this.sized === false &&
      this.statLines >= 1 &&
      this.statLines === Math.min(this.pathLines, COMMA_LINES)
    ) {
      // `git diff --stat`: each line a path, " | ", the lines changed and a bar of + and -. Read as
      // paths, each count and bar would be part of a file's name, exit 0.
      throw new EspalierError("PARSE_PATHS", DIFF_STAT, { line: this.firstLine, column: 1 });
    }
    if (
      this.detected &&
      this.sized === false &&
      this.pathLines >= 2 &&
      this.packageLines === Math.min(this.pathLines, COMMA_LINES)
    ) {
      // `npm ls --all --parseable --long`: each line a package's folder, ":" and its name@version. Read
      // as paths, each name@version would be a folder of its own beside or below the package's.
      throw new EspalierError("PARSE_PATHS", PACKAGE_LINES, { line: this.firstLine, column: 1 });
    }
    if (this.detected && this.sized === false && this.sepLine !== "" && this.pathLines >= 2)
      throw new EspalierError("PARSE_PATHS", sepLineMessage(this.sepLine, "paths"), {
        line: this.firstLine,
        column: 1,
      });
    if (
      this.detected &&
      this.sized === false &&
      this.semicolons > 0 &&
      this.sameSemicolons &&
      this.pathLines >= 2
    ) {
      // A table a spreadsheet saved with ";" between cells (where the comma is the decimal mark), given
      // on standard input or in a file not named .csv: read as paths, each whole row would be one name.
      throw new EspalierError("PARSE_PATHS", semicolonsMessage(this.semicolons), {
        line: this.firstLine,
        column: 1,
      });
    }
    if (this.detected && this.sized === false && this.commas > 0 && this.sameCommas && this.pathLines >= 3) {
      // A pip RECORD file (path,hash,size) or any CSV saved without its header row: read as paths, each
      // whole row would be one path (its last name "f.py,sha256=…,2076"), with exit 0.
      const n = this.commas;
      throw new EspalierError(
        "PARSE_PATHS",
        say`every line holds ${n === 1 ? "a comma" : `${n} commas`}, as the rows of a CSV table without its header row do: a table is read from a first line that names its columns (the id and parent columns, or a path column; --id-field, --parent-field and --path-field name others), so add one (e.g. id,parent,name or path,hash,size)${headerLineHint(this.firstCells, "csv")}; to read each whole line as a path, pass --input-format paths`,
        { line: this.firstLine, column: 1 },
      );
    }
    if (this.detected && this.sized === true && this.sizeEnd === space) columnAfterPath(sink, this.placer);
    if (
      this.detected &&
      this.sized === false &&
      this.pathLines >= 2 &&
      this.spacedLines === Math.min(this.pathLines, COMMA_LINES)
    ) {
      // `df -B1`, `sha256sum`: columns aligned with runs of spaces, a size or a hash beside each path.
      // Read as paths, each whole line would be one path, its numbers part of the names, exit 0.
      throw new EspalierError("PARSE_PATHS", SPACED_COLUMNS, { line: this.firstLine, column: 1 });
    }
    if (
      this.detected &&
      this.sized === false &&
      this.pathLines >= SIZE_LAST_EVIDENCE &&
      this.sizeLastLines === Math.min(this.pathLines, COMMA_LINES)
    ) {
      // `find -printf '%p %s\n'`, `stat -c '%n %s'`: the size after the path. Read as paths, each size
      // would be the end of a name, and no size read, with exit 0.
      throw new EspalierError("PARSE_PATHS", SIZE_LAST, { line: this.firstLine, column: 1 });
    }
    sink.hasSizes = this.sized === true;
    const placer = this.placer;
    const root = placer.adoptTopLevel();
    if (root !== -1) sink.name.setString(root, this.rootName);
    const total = sink.length - 1;
    const placed: PlacedSizes = {
      length: sink.length,
      parentOf: sink.parentOf,
      ownSize: sink.ownSize,
      origin: sink.origin,
      isListed: (i) => placer.isListed(i),
      pathOf: (i) => pathOf(sink, i, root),
    };
    // `du -abc` and `wc -c` end with the grand total: read as a file named total, it doubles the size.
    // A word in no catalog read (no "." in it, as a file's name has, and 8 lines at least before it:
    // '1 a/x', '2 a/y', '3 b' adds up so by chance) is kept as an entry, and said.
    const lastName = sink.hasSizes && root === -1 ? sink.name.get(total) : "";
    const known = TOTAL_NAMES.has(lastName);
    const sumLine =
      (known || (lastName !== "" && !lastName.includes(".") && total >= LIKE_TOTAL_EVIDENCE)) &&
      isGrandTotal(placed, total);
    const grandTotal =
      sumLine && known
        ? grandTotalNote(sink.origin[total], sink.ownSize[total], lastName)
        : sumLine
          ? likeTotalNote(sink.origin[total], sink.ownSize[total], lastName)
          : undefined;
    if (sumLine && known) sink.truncate(total);
    const complaint = complaintLines(sink, root);
    if (complaint !== undefined) throw complaint;
    const twoWays = dotAndPlain(sink, root, this.sized === true);
    if (twoWays !== undefined) throw twoWays;
    // A size that is no whole number (1.5) counts no bytes: every size then reads as a plain number.
    const plain = sink.hasSizes && anyFraction(sink.ownSize, sink.length);
    const folders = sink.hasSizes
      ? folderTotals({ ...placed, length: sink.length }, root, placer, this.folderSizes)
      : undefined;
    const totals = folders?.totals === true;
    // Two lines with as many commas, too few to refuse (above): a CSV table's header and one row read
    // so, as two paths; read as paths, but said.
    const csvLike =
      this.detected && this.sized === false && this.commas > 0 && this.sameCommas && this.pathLines === 2;
    // The root is the listed folder when a line named it by the empty path, or when it is the one top
    // name and that is "." (no folder of the listing can be named so).
    const start = root !== -1 || onlyTopIsDot(sink);
    const mixed = this.backslashes ? undefined : mixedStartsNote(sink, root, (i) => placer.isListed(i));
    return sink.finish(this.rootName, new Map(), null, {
      shape: "paths",
      sizeUnit: plain ? "number" : "bytes",
      ...(totals ? { folderTotals: true } : {}),
      ...(start ? { rootIsStart: true } : {}),
      ...(csvLike || grandTotal || folders?.note || this.notUtf8Lines > 0 || mixed
        ? {
            notes: [
              ...(mixed ? [mixed] : []),
              ...(csvLike ? [commasNote(this.firstLine, this.commas, this.firstCells)] : []),
              ...(grandTotal ? [grandTotal] : []),
              ...(folders?.note ? [folders.note] : []),
              ...(this.notUtf8Lines > 0 ? [notUtf8Note("line", this.notUtf8Lines, this.firstNotUtf8)] : []),
            ],
          }
        : {}),
    });
  }

  /**
   * PARSE_PATHS for an unsized list detected as a path list whose every line (so far: at its end, or at
   * a repeated path, which such lines meet before the end) is one a known command prints, naming it and
   * what reads its data: a mount table, `ls -s`, a drawn tree (`npm ls --all`). Undefined otherwise.
   */
  private namedRefusal(): EspalierError | undefined {
    if (!this.detected || this.sized !== false) return undefined;
    const lines = Math.min(this.pathLines, COMMA_LINES);
    if (this.mounts >= 2 && this.mountLines === lines)
      // mount, /proc/mounts, fstab: read as paths, each line one path split at its mount point's "/"s.
      return new EspalierError("PARSE_PATHS", MOUNT_TABLE, { line: this.firstLine, column: 1 });
    if (this.colons !== -1 && this.pathLines >= 2 && this.colonLines === lines)
      // /etc/passwd, /etc/group: read as paths, each account one path split at its home's "/"s, exit 0.
      return new EspalierError("PARSE_PATHS", colonRecordsMessage(this.colons), {
        line: this.firstLine,
        column: 1,
      });
    if (this.totalFirst && this.pathLines >= 2 && this.blockLines === lines - 1)
      // `ls -s`: read as paths, each block count would be part of a name and `total N` a name, exit 0.
      return new EspalierError("PARSE_PATHS", BLOCK_COUNTS, { line: this.firstLine, column: 1 });
    if (this.drawnLines >= 2 && this.drawnLines >= this.pathLines - 1)
      // `npm ls --all`: a tree already drawn, a package a line under `├── ` and `│ `. Read as paths, each
      // line would be one path named with the drawing, a scoped package's "/" splitting it, exit 0.
      return new EspalierError("PARSE_PATHS", DRAWN_TREE, { line: this.firstDrawn, column: 1 });
    return undefined;
  }

  /**
   * Reads the lines of `bytes[start, end)`, each ended by "\n" (a "\r" before it is dropped) or NUL; the
   * last line needs no end. The bytes are not kept past the next call, except the last path's.
   */
  private lines(bytes: Buffer, start: number, end: number): void {
    const sep = this.separator;
    if (sep === newline) this.refuseNul(bytes, start, end);
    // A line that writes U+FFFD itself (EF BF BD) is checked too: a folder so named and one written in
    // bytes that are not UTF-8 read alike (docs/input.md). One more memchr-like search per block.
    if (!isUtf8(bytes.subarray(start, end)) || hasReplacement(bytes, start, end)) {
      this.undecodedLines(bytes, start, end);
      return;
    }
    const view = viewOf(bytes);
    while (start < end) {
      let stop = bytes.indexOf(sep, start);
      if (stop === -1 || stop >= end) stop = end;
      this.one(bytes, view, start, stop);
      start = stop + 1;
    }
  }

  /**
   * `du -ab --time` and `find -printf '%s\t%TY-%Tm-%Td\t%p\n'` put a column between the size and the
   * path: read as part of the path, each date becomes a top-level folder and the folders' totals are
   * split among them, with exit 0 (du -ab --time /usr/share/doc/git read as 5.9 MiB in three date
   * folders, where du -sb says 3.0 MiB); `find -printf '%s\t%p\t%y\n'` puts one after it, and each
   * folder was two nodes (`contrib\td` holding its size, `contrib` its contents). So a detected
   * listing whose first path holds a tab is PARSE_PATHS at that tab: a name may hold a tab, but so
   * rarely that `--input-format paths` is the way to read one.
   */
  private refuseMoreColumns(
    bytes: Buffer,
    lineStart: number,
    start: number,
    end: number,
    line: number,
  ): void {
    const t = bytes.indexOf(tab, start);
    if (t === -1 || t >= end) return;
    // The field the tab ends, after the path's last "/" (a column before the path has none).
    const s = bytes.lastIndexOf(slash, t);
    const from = s >= start ? s + 1 : start;
    const field = bytes.toString("utf8", Math.max(from, t - 40), t);
    // `git diff --numstat`: lines added, a tab, lines deleted ("-" for a binary file), a tab, the path.
    const numstat =
      from === start && /^(?:[0-9]+|-)$/.test(field)
        ? "; for git diff --numstat (lines added and deleted before the path), git diff --numstat | awk -F'\\t' '{print $1 + $2 \"\\t\" $3}' | espalier - --units plain reads the lines changed as sizes"
        : "";
    throw new EspalierError(
      "PARSE_PATHS",
      say`line ${line} holds another tab after the size, after ${quoted.excerpt(field)}: a column besides the size and the path, as du --time and find -printf '%s\\t%T+\\t%p\\n' put a date before the path and find -printf '%s\\t%p\\t%y\\n' a type after it; read as part of the path, each date would be a folder of its own, or each folder two. List the size and the path alone (du -ab, find -printf '%s\\t%p\\n'), or keep those columns with cut (cut -f1,3 for a date before the path); to read the tab as part of a name, pass --input-format paths${numstat}`,
      // The column of the second tab: the size is ASCII digits, and the field is counted in characters.
      { line, column: start - lineStart + 1 + bytes.toString("utf8", start, t).length },
    );
  }

  /**
   * A NUL byte cannot be part of a file name (POSIX.1-2017, 3.170 Filename; from memory), so a line
   * holding one means a NUL-separated list (`find -print0`, `git ls-files -z`) or UTF-16 without a
   * byte-order mark: read as lines it would give a wrong tree with exit 0, so it is PARSE_PATHS at the
   * byte, naming the option. One memchr per block of whole lines; the position is counted only then.
   */
  private refuseNul(bytes: Buffer, start: number, end: number): void {
    const at = bytes.indexOf(0, start);
    if (at === -1 || at >= end) return;
    let line = this.line + 1;
    let lineStart = start;
    for (let i = bytes.indexOf(newline, start); i !== -1 && i < at; i = bytes.indexOf(newline, i + 1)) {
      line++;
      lineStart = i + 1;
    }
    const column = bytes.toString("utf8", lineStart, at).length + 1;
    throw new EspalierError(
      "PARSE_PATHS",
      "a path list line holds a NUL byte, which no file name can: for a NUL-separated list (find -print0, git ls-files -z) pass --nul-separated; UTF-16 input needs a byte-order mark or iconv first",
      { line, column },
    );
  }

  /**
   * PARSE_PATHS when entries should end with NUL (`--nul-separated`) but none has ended yet and `rest`,
   * the input read so far, holds a line break: a list of one path per line (`find -printf '%s\t%p\n'`,
   * `du -ab`) read so would be one entry, every later line part of its last name, with exit 0. Lists
   * that are NUL-separated end every entry with NUL (`find -print0`, `git ls-files -z`; from memory), so
   * a line break with no NUL anywhere before it is not one; one path with no end and no line break
   * (`printf 'a/b'`) is still read.
   */
  private noSeparator(rest: Buffer): void {
    if (this.separator !== 0 || this.sawSeparator) return;
    const at = rest.indexOf(newline);
    if (at === -1) return;
    throw new EspalierError(
      "PARSE_PATHS",
      "--nul-separated reads entries ended by a NUL byte, but the input has none and holds line breaks: it lists one path per line, so leave out --nul-separated",
      { line: 1, column: rest.toString("utf8", 0, at).length + 1 },
    );
  }

  /**
   * The path of the line being read, `bytes[pathStart, end)` (a line `bytes[start, …)` decoded from
   * {@link writtenLine}), against the other paths written in bytes that are not UTF-8. What comes before
   * the path (a size, a tab or spaces) is ASCII, so the path starts as many bytes into the written line.
   */
  private checkWritten(bytes: Buffer, start: number, pathStart: number, end: number, line: number): void {
    const writtenLine = this.writtenLine!;
    const cut = this.separator === newline && writtenLine[writtenLine.length - 1] === cr ? 1 : 0;
    let read = bytes.toString("utf8", pathStart, end);
    let written = writtenLine.toString("latin1", pathStart - start, writtenLine.length - cut);
    if (this.backslashes) {
      read = read.replaceAll("\\", "/");
      written = written.replaceAll("\\", "/");
    }
    this.written.checkPath(read, written, line);
  }

  /** One line, `bytes[start, end)` without its "\n". */
  private one(bytes: Buffer, view: DataView, start: number, end: number): void {
    const line = ++this.line;
    if (end - start > this.maxLineBytes)
      throw tooLong(`line ${line}`, this.maxLineBytes, { line, column: 1 });
    if (this.separator === newline) {
      if (end > start && bytes[end - 1] === cr) end--;
      if (isBlank(bytes, start, end)) return;
    } else if (end === start) {
      return;
    }
    let pathStart = start;
    let size = 0;
    if (this.sized === undefined) {
      const t = bytes.indexOf(tab, start);
      this.sized = t !== -1 && t < end;
      if (!this.sized && spaceSized(bytes, start, end)) {
        this.sized = true;
        this.sizeEnd = space;
      }
      this.firstLine = line;
    }
    if (this.sized) {
      // wc -c pads its sizes with spaces to one width: read from the number on.
      if (this.sizeEnd === space) while (start < end && bytes[start] === space) start++;
      // Fast path: 1 to 15 digits, then the tab (exact in a double).
      let k = start;
      let value = 0;
      for (; k < end && k - start < 16; k++) {
        const d = bytes[k] - 48;
        if (d < 0 || d > 9) break;
        value = value * 10 + d;
      }
      const sizeEnd = this.sizeEnd;
      let at = k;
      if (k > start && k - start <= 15 && k < end && bytes[k] === sizeEnd) {
        size = value;
      } else {
        at = bytes.indexOf(sizeEnd, start);
        if (at === -1 || at >= end) {
          const whole = bytes.toString("utf8", start, end).replace(/\r$/, "");
          if (complaintOf(whole) !== undefined) throw complaintError(whole, line);
          const what = sizeEnd === tab ? "a tab" : "a space";
          // find prints a name that holds a line break as it is, so the rest of the name is a line.
          const split =
            this.separator === newline
              ? "; if a name holds a line break, it splits its entry over two lines: then list entries ended by NUL (find -printf '%s\\t%p\\0') and pass --nul-separated"
              : "";
          throw new EspalierError(
            "PARSE_PATHS",
            `line ${line} has no size column before ${what}, unlike line ${this.firstLine}${split}`,
            { line, column: 1 },
          );
        }
        const text = bytes.toString("utf8", start, at);
        size = parseSize(text);
        if (!(size >= 0)) {
          throw new EspalierError(
            "BAD_SIZE",
            say`the size on line ${line} must be a number from 0 to 2^53 - 1, got ${quoted.value(text)}${sizeTextHint(text)}${
              this.detected && line === this.firstLine && sizeEnd === tab
                ? firstLineHint(bytes.toString("utf8", start, end).replace(/\r$/, "").split("\t"))
                : ""
            }`,
            { line, column: 1 },
          );
        }
      }
      pathStart = at + 1;
      if (sizeEnd === space) while (pathStart < end && bytes[pathStart] === space) pathStart++;
      else if (line === this.firstLine && this.detected && this.separator === newline)
        this.refuseMoreColumns(bytes, start, pathStart, end, line);
    } else {
      if (this.pathLines++ === 0) {
        this.headerFirst = headerOfColumns(bytes, start, end);
        if (this.headerFirst) this.headerWords = bytes.toString("utf8", start, end).trim().split(/ +/);
        this.filledColumns = this.headerFirst && this.headerWords.every((word) => CAPITALS.test(word));
        this.totalFirst = /^total [0-9]/.test(bytes.toString("latin1", start, Math.min(end, start + 8)));
        this.firstText = bytes.toString("utf8", start, Math.min(end, start + 200));
        this.sepLine = SEP_LINE.exec(this.firstText)?.[1] ?? "";
      } else if (this.filledColumns && this.pathLines <= COMMA_LINES) {
        const fields = bytes.toString("utf8", start, end).trim().split(/ +/).length;
        if (fields < this.headerWords.length) this.filledColumns = false;
      }
      if (this.pathLines === 2 && this.detected) {
        // `ls -R` (a folder's path and ":", then its entries by name alone), `unzip -l`, `zipinfo`,
        // `git log`, told by their first two lines: read as paths, every line would be a path, exit 0.
        // Said at once, as a line met twice (a name in two folders, a commit's author) would be
        // DUPLICATE_PATH before the end.
        const known = knownListingError(
          this.firstText,
          bytes.toString("utf8", start, Math.min(end, start + 200)),
          line,
          "paths",
        );
        if (known !== undefined) throw known;
      }
      if (numberThenSpace(bytes, start, end)) this.numberFirstLines++;
      // Only while every line so far is one (after `total N`, or in a mount table): a bounded cost.
      if (
        this.totalFirst &&
        this.pathLines <= COMMA_LINES &&
        this.blockLines === this.pathLines - 2 &&
        blockCountLine(bytes.toString("utf8", start, end))
      )
        this.blockLines++;
      if (
        this.pathLines <= COMMA_LINES &&
        this.colonLines === this.pathLines - 1 &&
        (this.pathLines === 1 || this.colons !== -1)
      ) {
        const colons = colonFields(bytes.toString("utf8", start, Math.min(end, start + 4096)));
        if (this.pathLines === 1) this.colons = colons;
        if (colons !== -1 && colons === this.colons) this.colonLines++;
      }
      if (this.pathLines <= COMMA_LINES && this.mountLines === this.pathLines - 1) {
        const kind = mountLine(bytes.toString("utf8", start, end));
        if (kind !== undefined) this.mountLines++;
        if (kind === "mount") this.mounts++;
      }
      if (drawnTreeLine(bytes, start, end) && this.drawnLines++ === 0) this.firstDrawn = line;
      if (
        this.pathLines <= COMMA_LINES &&
        this.spacedLines === this.pathLines - 1 &&
        spacedWords(bytes, start, end)
      )
        this.spacedLines++;
      if (
        this.pathLines <= COMMA_LINES &&
        this.sizeLastLines === this.pathLines - 1 &&
        sizeLast(bytes, start, end)
      )
        this.sizeLastLines++;
      // Only while every line so far is one: a bounded cost on other lists.
      if (
        this.pathLines <= COMMA_LINES &&
        this.statLines === this.pathLines - 1 &&
        diffStatLine(bytes, start, end)
      )
        this.statLines++;
      if (modeFirst(bytes, start, end) && this.modeFirstLines++ === 0)
        this.tarFirst = modeLineShape(bytes.toString("utf8", start, Math.min(end, start + 200)));
      if (this.pathLines <= COMMA_LINES && packageLine(bytes, start, end)) this.packageLines++;
      if (this.pathLines <= COMMA_LINES && this.sameSemicolons) {
        const semicolons = countByte(bytes, semicolon, start, end);
        if (this.pathLines === 1) this.semicolons = semicolons;
        else if (semicolons !== this.semicolons) this.sameSemicolons = false;
      }
      if (this.pathLines <= COMMA_LINES && this.sameCommas) {
        const commas = countByte(bytes, comma, start, end);
        if (this.pathLines === 1) {
          this.commas = commas;
          // The first line's cells, for the message of a CSV table (see `end`): at most 200 bytes.
          if (commas > 0)
            this.firstCells = bytes.toString("utf8", start, Math.min(end, start + 200)).split(",");
        } else if (commas !== this.commas) this.sameCommas = false;
      }
    }
    if (this.backslashes === undefined) this.backslashes = windowsPath(bytes, pathStart, end);
    if (this.writtenLine !== undefined) this.checkWritten(bytes, start, pathStart, end, line);
    // A path git wrote quoted (`"docs/\346\227\245.txt"`): read as written, its folder `"docs` would be
    // another than `docs`, and each name would hold its escapes.
    if (bytes[pathStart] === quote && end - pathStart > 2 && bytes[end - 1] === quote && !this.backslashes) {
      const name = gitUnquoted(bytes, pathStart + 1, end - 1);
      if (name !== undefined) {
        if (!isUtf8(name))
          throw new EspalierError(
            "PARSE_PATHS",
            `line ${line} is a path git quoted whose bytes are not UTF-8: list the paths ended by NUL (git ls-files -z) and pass --nul-separated, which reads such names as every other reader does`,
            { line, column: pathStart - start + 1 },
          );
        const j = this.placer.place(name, viewOf(name), 0, name.length, line);
        this.sink.ownSize[j === -1 ? this.placer.placeRoot(line) : j] = size;
        return;
      }
    }
    let i: number;
    try {
      i = this.backslashes
        ? this.placer.placeText(bytes.toString("utf8", pathStart, end).replaceAll("\\", "/"), line)
        : this.placer.place(bytes, view, pathStart, end, line);
    } catch (err) {
      // A drawn tree repeats a line (`├── x deduped`) before its end is read: say what it is.
      // So does a mount table (a device mounted twice), or ls -s (a name in two folders).
      throw this.namedRefusal() ?? err;
    }
    if (i === -1) i = this.placer.placeRoot(line);
    this.sink.ownSize[i] = size;
  }
}

/**
 * Whether `bytes[start, end)` is a size, spaces and a path that starts with "/" or "./" or is ".": the
 * first line of `find DIR -printf '%s %p\n'` (DIR absolute or "."), or of `wc -c ./a ./b`, whose sizes
 * are padded with spaces in front to one width (GNU wc, seen here). A plain path list's first name
 * could start with digits and a space ("2019 survey/a.jpg"), but then no "/" or "./" follows the spaces.
 */
function spaceSized(bytes: Buffer, start: number, end: number): boolean {
  while (start < end && bytes[start] === space) start++;
  let k = start;
  while (k < end && k - start < 16 && bytes[k] >= 48 && bytes[k] <= 57) k++;
  if (k === start || k - start > 15 || k >= end || bytes[k] !== space) return false;
  while (k < end && bytes[k] === space) k++;
  if (k >= end) return false;
  if (bytes[k] === slash) return true;
  return bytes[k] === dot && (k + 1 === end || bytes[k + 1] === slash);
}

/** Listed entries looked at for a column after the path (see {@link columnAfterPath}): a bounded cost. */
const COLUMN_LINES = 1000;

/**
 * PARSE_PATHS when a listing of sizes and paths split by spaces holds another column after the path, as
 * `find /DIR -printf '%s %p %u\n'` (an owner) and `stat -c '%s %n %U'` print: read as part of the
 * names, each folder was two nodes (`git root` holding the folder's size, `git` its contents) and every
 * name carried the word, with exit 0. A name may hold a space, so it is a column only when every entry
 * looked at (at least 2) ends in a space and a word, and either some entry's name less that word is a
 * folder no line names that holds entries (find lists every folder: there it is the start's own line),
 * or the words repeat, at most one for every four entries (at least 4): owners, groups, types or modes
 * do, the last words of names with spaces (`01 Overture.flac`) do not.
 */
function columnAfterPath(sink: NodeSink, placer: PathPlacer): void {
  const words = new Set<string>();
  const lessWord: { parent: number; name: string }[] = [];
  let first = -1;
  for (let i = 0; i < sink.length && lessWord.length < COLUMN_LINES; i++) {
    if (!placer.isListed(i)) continue;
    const name = sink.name.get(i);
    const sp = name.lastIndexOf(" ");
    if (sp <= 0 || sp === name.length - 1) return;
    if (first === -1) first = i;
    words.add(name.slice(sp + 1));
    lessWord.push({ parent: sink.parentOf[i], name: name.slice(0, sp) });
  }
  const n = lessWord.length;
  if (n < 2) return;
  let repeated = n >= 4 && words.size * 4 <= n;
  if (!repeated) {
    // Folders no line names, holding entries, by parent and name.
    const holds = new Uint8Array(sink.length);
    for (let i = 0; i < sink.length; i++) if (sink.parentOf[i] !== -1) holds[sink.parentOf[i]] = 1;
    const unlisted = new Set<string>();
    for (let i = 0; i < sink.length; i++)
      if (holds[i] === 1 && !placer.isListed(i)) unlisted.add(`${sink.parentOf[i]}/${sink.name.get(i)}`);
    repeated = lessWord.some(({ parent, name }) => unlisted.has(`${parent}/${name}`));
  }
  if (!repeated) return;
  throw new EspalierError(
    "PARSE_PATHS",
    say`every path ends in a space and a word (${quotedList("value", [...words], 3)}), as find -printf '%s %p %u\\n' and stat -c '%s %n %U' print a column after the path: read as part of the names, each folder would be two nodes and every name would hold the word. List the size and the path alone (find DIR -printf '%s\\t%p\\n', stat --printf '%s\\t%n\\n'), or put the column first and keep the size and path with cut; to read the word as part of the names, pass --input-format paths`,
    { line: sink.origin[first], column: 1 },
  );
}

/** Whether a path starts as a Windows one: a drive letter, ":" and "\", or "\\" (a network share). */
function windowsPath(bytes: Buffer, start: number, end: number): boolean {
  if (end - start < 3) return false;
  const c = bytes[start] | 0x20;
  if (c >= 97 && c <= 122 && bytes[start + 1] === colon && bytes[start + 2] === backslash) return true;
  return bytes[start] === backslash && bytes[start + 1] === backslash;
}

/**
 * Whether the line starts with a file's mode as `ls -l` and `tar tv` print it (POSIX ls, -l: the entry
 * type, then three triplets of permissions; from memory): `-rw-r--r-- `, `drwxr-xr-x. `, `lrwxrwxrwx+ `.
 */
function modeFirst(bytes: Buffer, start: number, end: number): boolean {
  if (end - start < 11 || !TYPES.includes(bytes[start])) return false;
  for (let k = 1; k <= 9; k++) if (!PERMISSIONS.includes(bytes[start + k])) return false;
  const after = bytes[start + 10];
  if (after === space) return true;
  return (after === dot || after === plus || after === at) && end - start > 11 && bytes[start + 11] === space;
}

const TYPES = Buffer.from("-dlcbpsD");
const PERMISSIONS = Buffer.from("-rwxsStT");
const plus = 43;
const at = 64;

/** Whether the line is spaces, digits, one or more spaces and then more: `  1234 ./a` (wc -c, find '%s %p'). */
function numberThenSpace(bytes: Buffer, start: number, end: number): boolean {
  let k = start;
  while (k < end && bytes[k] === space) k++;
  const digits = k;
  while (k < end && bytes[k] >= 48 && bytes[k] <= 57) k++;
  if (k === digits || k >= end || bytes[k] !== space) return false;
  while (k < end && bytes[k] === space) k++;
  return k < end;
}

/**
 * Whether the line is two or more words separated by spaces, none holding a "/" or a digit first: as the
 * header line of a command that aligns its columns with spaces (`  PID  PPID COMMAND`).
 */
function headerOfColumns(bytes: Buffer, start: number, end: number): boolean {
  const words = bytes.toString("utf8", start, end).trim().split(/ +/);
  return words.length >= 2 && words.every((word) => !word.includes("/") && !/^[0-9]/.test(word));
}

const pipe = 124;

/**
 * Whether the line holds two spaces or more between words (its ends trimmed): columns aligned with
 * spaces (`df`, `sha256sum`'s hash and name); a file's name seldom holds two spaces in a row.
 */
function spacedWords(bytes: Buffer, start: number, end: number): boolean {
  while (start < end && (bytes[start] === space || bytes[start] === tab)) start++;
  while (end > start && (bytes[end - 1] === space || bytes[end - 1] === tab)) end--;
  for (let k = bytes.indexOf(space, start); k !== -1 && k + 1 < end; k = bytes.indexOf(space, k + 1))
    if (bytes[k + 1] === space) return true;
  return false;
}

/**
 * What a detected path list's first line, split at its tabs, may be when its first cell is no size: a
 * path and then its size (`find -printf '%p\t%s\n'`, a sheet's path and size columns), or a table's header.
 */
function firstLineHint(cells: readonly string[]): MessagePart[] {
  if (cells.length === 2 && /^\d{1,15}$/.test(cells[1].trim()))
    return [
      "; the line is a path, a tab and a number, as find -printf '%p\\t%s\\n' puts the size after the path: put the size first (find DIR -printf '%s\\t%p\\n', or awk -F'\\t' '{print $2 \"\\t\" $1}' LIST)",
    ];
  return headerLineHint(cells, "tsv");
}

/**
 * Whether the line ends in a space and a number of 1 to 15 digits after something else, as a path and
 * its size (`find -printf '%p %s\n'`, `stat -c '%n %s'`) do.
 */
function sizeLast(bytes: Buffer, start: number, end: number): boolean {
  let k = end;
  while (k > start && end - k < 16 && bytes[k - 1] >= 48 && bytes[k - 1] <= 57) k--;
  return k < end && end - k <= 15 && k - 1 > start && bytes[k - 1] === space && bytes[k - 2] !== space;
}

/**
 * Lines of an unsized list, every one ending in a space and a number, from which it is read as sizes after
 * paths: a few names may end so (`scan 1`, `scan 2`), a whole listing of names rarely does.
 */
const SIZE_LAST_EVIDENCE = 3;

/**
 * A line as `find -ls` prints it (GNU findutils, seen here): the inode, the blocks, the mode, the links,
 * the owner and the group, then the size, the date and the path (` 349299  8 -rw-r--r--  1 root root 7943 May 11  2023 /usr/share/doc/dpkg/copyright`).
 */
const FIND_LS = /^ *[0-9]+ +[0-9]+ +[-dlcbpsD][-rwxsStT]{9}[.+@]? +[0-9]+ +\S+ +\S+ +[0-9]+ /;

const FIND_LS_LINES =
  "every line is as find -ls prints an entry (its inode, blocks, mode, links, owner, group, size, date and path): read as a path list, each whole line would be one path, its size and date part of the names. List each entry's size and path: find DIR -printf '%s\\t%p\\n'; to read each line as a path, pass --input-format paths";

const SIZE_LAST =
  "every line ends in a space and a number, as find -printf '%p %s\\n' and stat -c '%n %s' put the size after the path: read as a path list, each number would be the end of a name and no size read. Put the size first, separated by a tab (find DIR -printf '%s\\t%p\\n', or awk '{n = $NF; sub(/ [0-9]+$/, \"\"); print n \"\\t\" $0}' LIST); to read each line as a path, pass --input-format paths";

const SPACED_COLUMNS =
  "every line holds two or more spaces between words, as columns aligned with spaces are (df, sha256sum): read as a path list, each whole line would be one path, its numbers part of the names. Give espalier a size and a path separated by a tab a line (find DIR -printf '%s\\t%p\\n', du -ab), or a table whose header row names its columns (CSV or TSV); to read each line as a path, pass --input-format paths";

/**
 * Whether the line starts (after spaces) with the lines of a drawn tree: `├`, `└` or `│` (U+251C,
 * U+2514, U+2502, as npm ls prints its dependencies), or `+-- `, `` `-- `` or `| ` (its --unicode=false
 * form; seen here, npm 11).
 */
function drawnTreeLine(bytes: Buffer, start: number, end: number): boolean {
  let k = start;
  while (k < end && bytes[k] === space) k++;
  if (end - k >= 3 && bytes[k] === 0xe2 && bytes[k + 1] === 0x94) {
    const c = bytes[k + 2];
    return c === 0x9c || c === 0x94 || c === 0x82;
  }
  if (end - k < 2) return false;
  const a = bytes[k];
  if (a === pipe) return bytes[k + 1] === space;
  return (a === plus || a === backtick) && end - k >= 4 && bytes[k + 1] === dash && bytes[k + 2] === dash;
}

const dash = 45;
const backtick = 96;

const DRAWN_TREE =
  "the lines start with a drawn tree's lines (├── , │ , or +-- and `-- ), as npm ls --all prints its dependencies: read as a path list, each line would be one path named with the drawing. Give espalier the hierarchy as data: npm ls --all --json (nested JSON) or npm ls --all --parseable (one folder a line); to read each line as a path, pass --input-format paths";

/**
 * Whether the line is as git diff --stat (and git log --stat) prints a changed file: the path, spaces,
 * "|", spaces and the lines changed with a bar of "+" and "-", or `Bin 10 -> 12 bytes`; or the count
 * that closes it (` 3 files changed, 12 insertions(+)`). From the lines git 2.39 prints here.
 */
function diffStatLine(bytes: Buffer, start: number, end: number): boolean {
  const text = bytes.toString("utf8", start, end);
  return DIFF_STAT_LINE.test(text) || DIFF_STAT_TOTAL.test(text);
}

const DIFF_STAT_LINE = / \| +(?:[0-9]+(?: [+-]*)?|Bin(?: [0-9]+ -> [0-9]+ bytes)?)$/;
const DIFF_STAT_TOTAL = /^ *[0-9]+ files? changed(?:, [0-9]+ (?:insertions?\(\+\)|deletions?\(-\)))*$/;

const DIFF_STAT =
  "every line is a path, \" | \" and the lines changed, as git diff --stat prints: read as a path list, each count would be part of a file's name. List the lines changed as sizes: git diff --numstat | awk -F'\\t' '{print $1 + $2 \"\\t\" $3}' | espalier - --units plain (a binary file's \"-\" counts 0); to read each line as a path, pass --input-format paths";

/** A column's name in a header of capitals: `PID`, `%CPU`, `STIME`, `RSS`. */
const CAPITALS = /^%?[A-Z][A-Z0-9%_:+-]*$/;

const PACKAGE_LINES =
  "every line is a folder, a colon and a name@version, as npm ls --parseable --long prints: read as a path list, each name@version would be a folder of its own. List the folders alone (npm ls --all --parseable), or the packages with their versions as nested JSON (npm ls --all --json); to read these lines as paths, pass --input-format paths";

/**
 * Whether the line is an absolute path, ":", a package's name (`@scope/` allowed) and `@version`, with
 * maybe more `:WORD`s after: `npm ls --parseable --long`'s line (npm 11 here:
 * `/srv/app/node_modules/@scope/pkg:@scope/pkg@1.2.0`).
 */
function packageLine(bytes: Buffer, start: number, end: number): boolean {
  if (end - start < 4 || bytes[start] !== slash) return false;
  return /^\/[^:]*:(?:@[^/:@\s]+\/)?[^/:@\s]+@[^/:\s]+(?::[^/:\s]+)*$/.test(
    bytes.toString("utf8", start, end),
  );
}

/**
 * The least input bytes a node is given room for before it is read (see `PathListReader.makeRoom`): a
 * node takes 25 bytes of arrays (parent and line 4 each, the name's place 8, size 8, listed 1). The bench's
 * listings have 80 to 90 bytes a node.
 */
const BYTES_A_NODE = 12;

/** Lines of an unsized list whose commas are counted (see `PathListReader.commas`): a bounded cost. */
const COMMA_LINES = 1000;

/** How many `byte`s `bytes[start, end)` holds. */
function countByte(bytes: Buffer, byte: number, start: number, end: number): number {
  let n = 0;
  for (let k = bytes.indexOf(byte, start); k !== -1 && k < end; k = bytes.indexOf(byte, k + 1)) n++;
  return n;
}

function isBlank(bytes: Buffer, start: number, end: number): boolean {
  for (let k = start; k < end; k++) {
    const c = bytes[k];
    if (c !== space && c !== tab) return false;
  }
  return true;
}

/**
 * Whether any of the first `length` sizes is no whole number, as no byte count is (a listing of sizes in
 * KiB or MiB with fractions, `awk '{print $1 / 1024 "\t" $2}'`): printed with byte units it would
 * read "1.5 B".
 */
function anyFraction(sizes: Float64Array, length: number): boolean {
  for (let i = 0; i < length; i++) if (sizes[i] % 1 !== 0) return true;
  return false;
}

/** Whether the sink's one top-level node is named "." (`find .`): false for none or several. */
function onlyTopIsDot(sink: NodeSink): boolean {
  let top = -1;
  for (let i = 0; i < sink.length; i++) {
    if (sink.parentOf[i] !== -1) continue;
    if (top !== -1) return false;
    top = i;
  }
  return top !== -1 && sink.name.get(top) === ".";
}

/** The path of node `i` as a listing names it: names from below the root joined by "/". */
function pathOf(sink: NodeSink, i: number, root: number): string {
  const names: string[] = [];
  for (let k = i; k !== -1 && k !== root; k = sink.parentOf[k]) names.push(sink.name.get(k));
  names.reverse();
  return names[0] === "/" ? `/${names.slice(1).join("/")}` : names.join("/");
}

/**
 * PARSE_PATHS for an unsized list every line of which (of the first {@link COMMA_LINES}, 2 at least)
 * holds `n` semicolons: a table saved with ";" between cells, as spreadsheets save "CSV" where the
 * comma is the decimal mark. RFC 4180 (section 2) separates fields by commas; the python3 csv module
 * (a reference reader with a delimiter option) converts it.
 */
function semicolonsMessage(n: number): string {
  return `every line holds ${n === 1 ? "a semicolon" : `${n} semicolons`}, as the rows of a table saved with ";" between cells do (spreadsheets save CSV so where the comma is the decimal mark): read as a path list, each whole row would be one name. espalier reads tables separated by commas (CSV, RFC 4180) or tabs (TSV): convert it first, python3 -c 'import csv, sys; csv.writer(sys.stdout).writerows(csv.reader(sys.stdin, delimiter=";"))' < FILE | espalier - (a decimal comma in a size stays one: write it with a point); to read each line as a path, pass --input-format paths`;
}

/** The note on a two-line list read as paths whose lines hold as many commas (see `end`). */
function commasNote(line: number, commas: number, cells: readonly string[]): ReadingNote {
  return {
    code: "COMMAS_READ_AS_PATHS",
    line,
    parts: say`both lines hold ${commas === 1 ? "a comma" : `${commas} commas`}, as a CSV table's header and row do, and were read as two paths: a table is read from a first line that names the id and parent columns, or a path column; for a table, pass --input-format csv with --id-field COLUMN and --parent-field COLUMN (or --path-field COLUMN)${headerLineHint(cells, "csv", "edges")}; --input-format paths reads the lines as paths without this note`,
  };
}
