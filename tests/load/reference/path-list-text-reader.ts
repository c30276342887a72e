import { EspalierError } from "../../../src/errors.js";
import type { LoadOptions } from "../../../src/load/load-options.js";
import { NodeSink } from "../../../src/load/node-sink.js";
import { parseSize } from "../../../src/load/parse-size.js";
import { TOTAL_NAMES } from "../../../src/load/path-list/grand-total.js";
import type { LinkedNodes } from "../../../src/model/linked-nodes.js";
import { folderTotalsByReference } from "./folder-totals-reference.js";
import { PathPlacer } from "./path-placer-text.js";

/**
 * Reads a path list a line at a time: one "/"-separated path per line, blank lines ignored. When the first
 * non-blank line holds a tab, every line is "size<TAB>path" (as `find -printf '%s\t%p\n'` prints);
 * when it is digits, spaces and a path starting with "/" or "./" (or "."), every line is
 * "size<SPACES>path" (`find DIR -printf '%s %p\n'`); otherwise a whole line is one path. A first
 * path starting with a drive (`C:\`) or `\\` makes every path split on "\". Origins are line numbers.
 *
 * The reader on text espalier had before every path list was read as bytes, kept as a reference answer
 * for `PathListReader` (tests/load/path-list/path-list-reader.reference.test.ts).
 */
export class PathListTextReader {
  private readonly sink: NodeSink;
  private readonly index: PathPlacer;
  private sized: boolean | undefined;
  private separator = "\t";
  private windows: boolean | undefined;
  private firstLine = 0;
  private line = 0;
  private root = -1;
  private readonly folderSizes: "own" | "total" | undefined;
  /** The line that named each listed node. */
  private readonly listedAt = new Map<number, number>();
  /** The line each node was first made on. */
  private readonly firstSeen: number[] = [];

  private readonly detected: boolean;
  private pathLines = 0;
  private numberFirstLines = 0;
  private spacedLines = 0;

  constructor(options: LoadOptions) {
    this.detected = options.format === undefined;
    this.sink = new NodeSink(options.maxNodes, false);
    this.index = new PathPlacer(this.sink);
    this.folderSizes = options.folderSizes;
  }

  /**
   * Reads the lines of `text[start, end)`, each ended by "\n" (a "\r" before it is dropped); the last
   * line needs no "\n". A caller feeding pieces must cut them after a "\n".
   */
  lines(text: string, start: number, end: number): void {
    while (start < end) {
      let stop = text.indexOf("\n", start);
      if (stop === -1 || stop >= end) stop = end;
      this.one(text, start, stop);
      start = stop + 1;
    }
  }

  /** The nodes, ready for `buildTree`. */
  finish(rootName: string): LinkedNodes {
    const sink = this.sink;
    if (sink.length === 0) throw new EspalierError("INPUT_EMPTY", "the path list names no paths");
    // Lines as `find -printf '%s %p\n'` prints them, with the format detected: said, not read as names.
    if (this.detected && this.sized === false && this.numberFirstLines === this.pathLines)
      throw new EspalierError("PARSE_PATHS", "every line starts with a number and a space", {
        line: this.firstLine,
        column: 1,
      });
    // Columns aligned with runs of spaces (df, sha256sum): every line holds two spaces between words.
    if (this.detected && this.sized === false && this.pathLines >= 2 && this.spacedLines === this.pathLines)
      throw new EspalierError("PARSE_PATHS", "columns aligned with spaces", {
        line: this.firstLine,
        column: 1,
      });
    if (this.detected && this.sized === true && this.separator === " ") this.refuseColumnAfterPath();
    sink.hasSizes = this.sized === true;
    // A size with an empty path named the root: every other top-level node goes below it.
    if (this.root !== -1) {
      for (let i = 0; i < sink.length; i++)
        if (sink.parentOf[i] === -1 && i !== this.root) sink.parentOf[i] = this.root;
      sink.name.setString(this.root, rootName);
    }
    if (sink.hasSizes && this.root === -1) this.dropGrandTotal();
    this.refuseDotAndPlain();
    const totals =
      sink.hasSizes && folderTotalsByReference(sink, this.listedAt, this.firstSeen, this.folderSizes);
    return sink.finish(rootName, new Map(), null, {
      shape: "paths",
      // A size with a fraction counts no bytes: plain numbers (docs/input.md).
      sizeUnit: [...sink.ownSize.subarray(0, sink.length)].some((size) => !Number.isInteger(size))
        ? "number"
        : "bytes",
      ...(totals ? { folderTotals: true } : {}),
    });
  }

  /**
   * A column after a path split from its size by spaces (`find /DIR -printf '%s %p %u\n'`): every listed
   * name ends in a space and a word, and either a name less its word is an unlisted folder holding
   * entries, or there are at least 4 entries and no more than one distinct word for every 4. Written
   * from docs/input.md, with maps of names, not from path-list-reader.ts.
   */
  private refuseColumnAfterPath(): void {
    const sink = this.sink;
    const listed = [...this.listedAt.keys()].sort((a, b) => a - b);
    if (listed.length < 2) return;
    const split = listed.map((i) => /^(.+) ([^ ]+)$/.exec(sink.name.get(i)));
    if (split.some((m) => m === null)) return;
    const words = new Set(split.map((m) => m![2]));
    const holding = new Set<string>();
    for (let i = 0; i < sink.length; i++) {
      const p = sink.parentOf[i];
      if (p !== -1 && !this.listedAt.has(p)) holding.add(`${sink.parentOf[p]}:${sink.name.get(p)}`);
    }
    const folder = listed.some((i, k) => holding.has(`${sink.parentOf[i]}:${split[k]![1]}`));
    if (folder || (listed.length >= 4 && words.size * 4 <= listed.length))
      throw new EspalierError("PARSE_PATHS", "a column after the path", {
        line: sink.origin[listed[0]],
        column: 1,
      });
  }

  /**
   * Paths inside `.` beside other relative paths name the listed folder two ways: PARSE_PATHS at the
   * first line of a top-level name other than `.` and `/` (the root's children count as top-level),
   * when `.` holds something. Written from docs/input.md, not from dot-prefix.ts.
   */
  private refuseDotAndPlain(): void {
    const sink = this.sink;
    const top = (i: number) => i !== this.root && (sink.parentOf[i] === -1 || sink.parentOf[i] === this.root);
    const names = (i: number) => sink.name.get(i);
    const tops = Array.from({ length: sink.length }, (_, i) => i).filter(top);
    const dot = tops.find((i) => names(i) === ".");
    if (dot === undefined || !sink.parentOf.subarray(0, sink.length).includes(dot)) return;
    const plain = tops.filter((i) => names(i) !== "." && names(i) !== "/" && names(i) !== "");
    if (plain.length === 0) return;
    const line = Math.min(...plain.map((i) => sink.origin[i]));
    throw new EspalierError("PARSE_PATHS", "./ and plain relative paths", { line, column: 1 });
  }

  /**
   * `du -c` and `wc -c` end a listing with `SIZE<TAB>total`, the sum of the lines before it: when the
   * last line named a new top-level leaf "total" (or its translation, TOTAL_NAMES) whose size is that sum, read as each line's own size
   * or as du's folder totals (a top-level entry's line, or what its listed descendants give), the
   * node is dropped. Written from that statement, with children lists, not from grand-total.ts.
   */
  private dropGrandTotal(): void {
    const sink = this.sink;
    const k = sink.length - 1;
    if (k < 1 || sink.parentOf[k] !== -1 || !TOTAL_NAMES.has(sink.name.get(k)) || !this.listedAt.has(k))
      return;
    const children = new Map<number, number[]>();
    for (let i = 0; i < k; i++) {
      const p = sink.parentOf[i];
      if (p !== -1) children.set(p, [...(children.get(p) ?? []), i]);
    }
    const given = (i: number): number =>
      this.listedAt.has(i) ? sink.ownSize[i] : (children.get(i) ?? []).reduce((s, c) => s + given(c), 0);
    const last = this.listedAt.get(k)!;
    if ([...this.listedAt.values()].some((line) => line > last)) return;
    let own = 0;
    let totals = 0;
    for (let i = 0; i < k; i++) {
      if (this.listedAt.has(i)) own += sink.ownSize[i];
      if (sink.parentOf[i] === -1) totals += given(i);
    }
    if (sink.ownSize[k] === own || sink.ownSize[k] === totals) sink.truncate(k);
  }

  /** One line, `text[start, end)` without its "\n". */
  private one(text: string, start: number, end: number): void {
    const line = ++this.line;
    if (end > start && text.charCodeAt(end - 1) === 13) end--;
    if (isBlank(text, start, end)) return;
    let pathStart = start;
    let size = 0;
    if (this.sized === undefined) {
      const first = text.slice(start, end);
      this.sized = first.includes("\t");
      // Spaces before the size too: wc -c pads its sizes to one width (docs/input.md, Path lists).
      if (!this.sized && /^ *[0-9]{1,15} +(\/|\.\/|\.$)/.test(first)) {
        this.sized = true;
        this.separator = " ";
      }
      this.firstLine = line;
    }
    if (this.sized) {
      if (this.separator === " ") while (start < end && text[start] === " ") start++;
      const tab = text.indexOf(this.separator, start);
      if (tab === -1 || tab >= end) {
        throw new EspalierError(
          "PARSE_PATHS",
          `line ${line} has no size column before ${this.separator === " " ? "a space" : "a tab"}, unlike line ${this.firstLine}`,
          { line, column: 1 },
        );
      }
      size = plainDigits(text, start, tab);
      if (size < 0) size = parseSize(text.slice(start, tab));
      if (!(size >= 0)) {
        throw new EspalierError(
          "BAD_SIZE",
          `the size on line ${line} must be a number from 0 to 2^53 - 1, got ${JSON.stringify(text.slice(start, tab))}`,
          { line, column: 1 },
        );
      }
      pathStart = tab + 1;
      if (this.separator === " ") while (pathStart < end && text[pathStart] === " ") pathStart++;
    } else {
      this.pathLines++;
      if (/^ *[0-9]+ +[^ ]/.test(text.slice(start, end))) this.numberFirstLines++;
      if (/\S {2,}\S/.test(text.slice(start, end))) this.spacedLines++;
    }
    if (this.windows === undefined) this.windows = /^([A-Za-z]:\\|\\\\)/.test(text.slice(pathStart, end));
    const i = this.windows
      ? this.index.place(text.slice(pathStart, end).replaceAll("\\", "/"), 0, end - pathStart, line)
      : this.index.place(text, pathStart, end, line);
    for (let k = this.firstSeen.length; k < this.sink.length; k++) this.firstSeen.push(line);
    if (i === -1) {
      if (this.root !== -1) {
        throw new EspalierError(
          "DUPLICATE_PATH",
          `line ${line} repeats the empty path (the root) of line ${this.sink.origin[this.root]}`,
          { line, column: 1 },
        );
      }
      this.root = this.sink.add(-1, "", line);
      this.firstSeen.push(line);
      this.listedAt.set(this.root, line);
      this.sink.ownSize[this.root] = size;
      return;
    }
    this.listedAt.set(i, line);
    this.sink.ownSize[i] = size;
  }
}

function isBlank(text: string, start: number, end: number): boolean {
  for (let k = start; k < end; k++) {
    const c = text.charCodeAt(k);
    if (c !== 32 && c !== 9) return false;
  }
  return true;
}

/** The value of 1 to 15 decimal digits (exact in a double), without cutting a string; -1 otherwise. */
function plainDigits(text: string, start: number, end: number): number {
  if (end <= start || end - start > 15) return -1;
  let value = 0;
  for (let k = start; k < end; k++) {
    const d = text.charCodeAt(k) - 48;
    if (d < 0 || d > 9) return -1;
    value = value * 10 + d;
  }
  return value;
}
