import { Buffer } from "node:buffer";
import { EspalierError, type SourcePos } from "../../errors.js";
import { utf16Length } from "../json/utf16-length.js";
import { readLimits, tooLong } from "../read-limits.js";

/** Receives the records a {@link CsvScanner} finds, field by field, as byte ranges. */
export interface CsvSink {
  /**
   * Field `column` (0-based) of the record being delivered: the bytes `bytes[start, end)`, quotes
   * removed and `""` undone. The range is valid only during the call.
   */
  field(column: number, bytes: Uint8Array, start: number, end: number): void;
  /**
   * The record whose fields were just delivered ended; it had `fields` fields and started on `line`.
   * Return true to stop the scan (no more records are delivered).
   */
  record(fields: number, line: number): boolean | undefined;
}

/**
 * Takes whole records off the scanner's hands where it can tell them without scanning (a table read
 * against an earlier version of itself: rows whose bytes that version had, kept-table.ts). Called where
 * a record may start, with the bytes the scanner holds (`bytes[p, n)`); returns where the records it
 * took end (`p` when it took none), having told the scanner how many and how many lines they spanned
 * ({@link CsvScanner.skipped}). It may take only records that end before `n`, each settled by bytes
 * before `n` (a line feed, or a byte after a carriage return), as the scanner would have read them.
 */
export type RecordSkipper = (bytes: Uint8Array, p: number, n: number) => number;

const QUOTE = 0x22;
const CR = 0x0d;
const LF = 0x0a;
const BOM = [0xef, 0xbb, 0xbf];

/**
 * A byte-level scanner for delimiter-separated records, RFC 4180 §2 ("Common Format and MIME Type for
 * Comma-Separated Values Files"): fields separated by the delimiter, records by a line break (CRLF, and
 * also a lone LF or CR, as files written on other systems end their lines); with the comma, a field
 * that starts with a double quote is quoted: it may hold delimiters, line breaks and `""` for one
 * quote (§2.5-2.7), and must be followed by a delimiter, a line break or the end. TSV (the tab)
 * has no quoting: a quote is an ordinary byte. A line with nothing on it is skipped; a UTF-8 byte
 * order mark before the first byte is skipped. Every record must have as many fields as the first
 * (§2.4).
 *
 * Chunks may be cut anywhere (inside a field, a quote pair, a CRLF or a multi-byte character): the
 * bytes of an unfinished record are kept and scanned again with the next chunk. Nothing is decoded
 * here; the sink gets byte ranges. Errors are PARSE_CSV at the physical line and column (UTF-16 units of
 * the decoded text, 1-based, as an editor counts them) of the faulty byte, a quoted field's line breaks
 * counted; {@link fieldPosition} places a field the same way for a sink.
 */
export class CsvScanner {
  private readonly quoting: boolean;
  private carry: Uint8Array | null = null;
  private started = false;
  private stopped = false;
  /** Line where the next record starts (1-based). */
  private line = 1;
  /** Fields of the first record: every later one must have as many. */
  private width = -1;
  // The current record's field bounds (start, end) and whether a field holds `""` to undo.
  private starts = new Int32Array(64);
  private ends = new Int32Array(64);
  private escaped = new Uint8Array(64);
  private scratch = new Uint8Array(256);
  // The record being delivered to the sink: its bytes, where it starts and its first line.
  private recordBytes: Uint8Array = new Uint8Array(0);
  private recordStart = 0;
  private recordLine = 1;

  /** Records delivered so far, the first (a header) included. */
  private records = 0;
  /** Records read with missing last fields filled in as empty (`shortRows: "fill"`). */
  private filledRecords = 0;
  /** Offset in the whole input of the bytes being scanned (`bytes[0]` of scan), and of the next chunk. */
  private base = 0;
  private nextChunkAt = 0;
  /** Where the record being delivered ends (past its line break), in the bytes being scanned. */
  private recordEnd = 0;
  /** Whole records taken without scanning, when set (see RecordSkipper). */
  skipper: RecordSkipper | null = null;

  constructor(
    private readonly delimiter: number,
    private readonly sink: CsvSink,
    /** Longest record, in bytes (read-limits.ts): an endless one stops there, not in memory. */
    private readonly maxRecordBytes = readLimits.maxLineBytes,
    /**
     * `header`: the first record is a header, and errors name data rows. `shortRows: "fill"`: a record
     * with fewer fields than the first is delivered with the missing last fields empty (else PARSE_CSV).
     */
    private readonly table: { header: boolean; shortRows: "error" | "fill" } = {
      header: false,
      shortRows: "error",
    },
  ) {
    this.quoting = delimiter !== 0x09;
  }

  private tooLong(line: number): EspalierError {
    return tooLong(`the record at line ${line}`, this.maxRecordBytes, { line });
  }

  /**
   * Where field `f` (0-based) of the record being delivered starts, at its opening quote when it is
   * quoted: the physical line and the 1-based column in UTF-16 units. Valid only inside the sink's calls.
   */
  fieldPosition(f: number): { line: number; column: number } {
    const s = this.starts[f];
    const start = this.quoting && s > this.recordStart && this.recordBytes[s - 1] === QUOTE ? s - 1 : s;
    return positionIn(this.recordBytes, this.recordStart, this.recordLine, start);
  }

  /**
   * Where the record being delivered starts and where it ends (past its line break), as offsets in the
   * whole input (every chunk's bytes, a byte order mark included). Valid only inside the sink's calls.
   */
  get recordAt(): number {
    return this.base + this.recordStart;
  }

  get recordEndAt(): number {
    return this.base + this.recordEnd;
  }

  /** The line the next record starts on, unless blank lines come first (1-based). */
  get nextLine(): number {
    return this.line;
  }

  /** A {@link RecordSkipper} took `records` records spanning `lines` lines. */
  skipped(records: number, lines: number): void {
    this.records += records;
    this.line += lines;
  }

  /**
   * A {@link RecordSkipper} took the first record, of `fields` fields, and with the blank lines around it
   * `lines` lines: every later record must have as many fields.
   */
  tookFirst(fields: number, lines: number): void {
    this.width = fields;
    this.skipped(1, lines);
  }

  /** How many records were short and read with their missing last fields empty (`shortRows: "fill"`). */
  get filled(): number {
    return this.filledRecords;
  }

  /** Whether the sink asked to stop. */
  get done(): boolean {
    return this.stopped;
  }

  write(chunk: Uint8Array): void {
    if (this.stopped || chunk.length === 0) return;
    const at = this.nextChunkAt;
    this.nextChunkAt += chunk.length;
    const carry = this.carry;
    if (carry === null) {
      this.base = at;
      this.scan(chunk, false, 0);
      return;
    }
    this.carry = null;
    this.base = at - carry.length;
    if (!this.started) {
      this.scan(joined(carry, chunk, chunk.length), false, 0);
      return;
    }
    // The record cut at the end of the last chunk is finished with as few of this chunk's bytes as it
    // needs, and only those are copied after it; the rest of the chunk is scanned where it is. (Copying
    // every chunk after the bytes carried over was fresh memory the size of the input: at 1M rows,
    // 32 MiB of it, at about 4 ms a MiB on the bench machine; docs/performance.md.)
    for (let take = Math.min(chunk.length, Math.max(1024, 2 * carry.length)); ; take *= 2) {
      if (take >= chunk.length) {
        this.scan(joined(carry, chunk, chunk.length), false, 0);
        return;
      }
      const bytes = joined(carry, chunk, take);
      const line = this.line;
      const next = this.record(bytes, 0, false);
      if (next < 0) continue;
      // As scan does with each record: one past the limit is refused.
      if (next > this.maxRecordBytes) throw this.tooLong(line);
      if (this.stopped) return;
      if (next >= carry.length) {
        this.base = at;
        this.scan(chunk, false, next - carry.length);
      } else {
        this.base = at - carry.length + next;
        this.scan(joined(carry.subarray(next), chunk, chunk.length), false, 0);
      }
      return;
    }
  }

  end(): void {
    if (this.stopped) return;
    const rest = this.carry;
    this.carry = null;
    if (rest === null) return;
    this.base = this.nextChunkAt - rest.length;
    this.scan(rest, true, 0);
  }

  /** Scans the records of `bytes` from `from`; keeps an unfinished last one for the next chunk. */
  private scan(bytes: Uint8Array, last: boolean, from: number): void {
    let p = from;
    const n = bytes.length;
    if (!this.started) {
      if (n < 3 && !last && isPrefixOfBom(bytes)) {
        this.carry = bytes.slice();
        return;
      }
      this.started = true;
      if (n >= 3 && bytes[0] === BOM[0] && bytes[1] === BOM[1] && bytes[2] === BOM[2]) p = 3;
    }
    while (p < n) {
      // Read each time: the sink sets it once it has read the header, in this very loop.
      const skipper = this.skipper;
      if (skipper !== null) {
        const q = skipper(bytes, p, n);
        if (q > p) {
          p = q;
          continue;
        }
      }
      const line = this.line;
      const next = this.record(bytes, p, last);
      if (next < 0) {
        // The record is not finished in these bytes: keep them for the next chunk, up to the limit.
        if (n - p > this.maxRecordBytes) throw this.tooLong(line);
        this.carry = bytes.slice(p);
        return;
      }
      // A whole record past the limit is refused too, so chunked and whole input agree.
      if (next - p > this.maxRecordBytes) throw this.tooLong(line);
      p = next;
      if (this.stopped) return;
    }
  }

  /**
   * Scans the record starting at `p`; delivers it (or skips an empty line) and returns where the next
   * one starts, or -1 when the bytes end first (and more may come).
   */
  private record(bytes: Uint8Array, p: number, last: boolean): number {
    const n = bytes.length;
    const delimiter = this.delimiter;
    const quoting = this.quoting;
    let lines = 0; // line breaks inside quoted fields
    let fields = 0;
    let q = p;
    for (;;) {
      if (fields === this.starts.length) this.grow();
      if (quoting && q < n && bytes[q] === QUOTE) {
        // A quoted field: up to the quote that is not doubled.
        let escaped = 0;
        let k = q + 1;
        for (;;) {
          while (k < n) {
            const c = bytes[k];
            if (c === QUOTE) break;
            if (c === LF) lines++;
            else if (c === CR && (k + 1 >= n || bytes[k + 1] !== LF)) lines++;
            k++;
          }
          if (k >= n) {
            if (!last) return -1;
            throw this.error("a quoted field is not closed before the end of the input", bytes, p, q);
          }
          if (k + 1 < n && bytes[k + 1] === QUOTE) {
            escaped = 1;
            k += 2;
            continue;
          }
          if (k + 1 >= n && !last) return -1;
          break;
        }
        this.starts[fields] = q + 1;
        this.ends[fields] = k;
        this.escaped[fields] = escaped;
        fields++;
        q = k + 1;
        if (q < n) {
          const c = bytes[q];
          if (c !== delimiter && c !== LF && c !== CR)
            throw this.error(
              "a closing quote is followed by other text instead of a delimiter or a line break",
              bytes,
              p,
              q,
            );
        }
      } else {
        let k = q;
        if (quoting) {
          for (; k < n; k++) {
            const c = bytes[k];
            if (c === delimiter || c === LF || c === CR) break;
            if (c === QUOTE)
              throw this.error("a quote inside a field that does not start with one", bytes, p, k);
          }
        } else {
          for (; k < n; k++) {
            const c = bytes[k];
            if (c === delimiter || c === LF || c === CR) break;
          }
        }
        if (k >= n && !last) return -1;
        this.starts[fields] = q;
        this.ends[fields] = k;
        this.escaped[fields] = 0;
        fields++;
        q = k;
      }
      if (q < n && bytes[q] === delimiter) {
        q++;
        continue;
      }
      // The record ends: a line break (CRLF counts once; a CR at the end waits for what follows) or
      // the end of the input.
      if (q < n) {
        if (bytes[q] === CR) {
          if (q + 1 >= n && !last) return -1;
          q += q + 1 < n && bytes[q + 1] === LF ? 2 : 1;
        } else q++;
      }
      break;
    }
    const line = this.line;
    this.line += lines + 1;
    if (fields === 1 && this.ends[0] === this.starts[0] && (p >= n || bytes[p] !== QUOTE)) return q;
    let filled = 0;
    if (this.width === -1) this.width = fields;
    else if (fields < this.width && this.table.shortRows === "fill") filled = this.width - fields;
    else if (fields !== this.width) {
      this.line = line;
      // At the first field too many, or where the record ends a field short.
      let at: number;
      if (fields > this.width) {
        at = this.starts[this.width];
        if (quoting && bytes[at - 1] === QUOTE) at--; // its opening quote
      } else {
        at = this.ends[fields - 1];
        if (quoting && bytes[at] === QUOTE) at++; // after the closing quote
      }
      throw this.error(this.countMessage(fields), bytes, p, at);
    }
    const sink = this.sink;
    this.recordBytes = bytes;
    this.recordStart = p;
    this.recordEnd = q;
    this.recordLine = line;
    for (let f = 0; f < fields; f++) {
      if (this.escaped[f] === 0) sink.field(f, bytes, this.starts[f], this.ends[f]);
      else {
        const length = this.unescape(bytes, this.starts[f], this.ends[f]);
        sink.field(f, this.scratch, 0, length);
      }
    }
    // Missing last fields, read as empty (`shortRows: "fill"`): empty ranges at the record's end.
    for (let f = fields; f < fields + filled; f++) sink.field(f, bytes, q, q);
    if (filled > 0) this.filledRecords++;
    this.records++;
    if (sink.record(fields + filled, line) === true) this.stopped = true;
    return q;
  }

  /** Why a record's field count is wrong: which row, how many fields, how many wanted, what to do. */
  private countMessage(fields: number): string {
    if (!this.table.header) return `a record has ${fields} fields where the first had ${this.width}`;
    const row = `row ${this.records}`;
    const counts = `has ${fields} ${fields === 1 ? "field" : "fields"} where the header has ${this.width}`;
    // RFC 4180, section 2.4: each line should contain the same number of fields throughout the file.
    return fields < this.width
      ? `${row} ${counts} (RFC 4180: every row as many as the header); --short-rows fill reads its missing last fields as empty`
      : `${row} ${counts} (RFC 4180: every row as many as the header)`;
  }

  /** Copies `bytes[s, e)` into the scratch buffer with every `""` as one quote; returns the length. */
  private unescape(bytes: Uint8Array, s: number, e: number): number {
    if (this.scratch.length < e - s) this.scratch = new Uint8Array(Math.max(e - s, this.scratch.length * 2));
    const out = this.scratch;
    let m = 0;
    for (let k = s; k < e; k++) {
      out[m++] = bytes[k];
      if (bytes[k] === QUOTE) k++;
    }
    return m;
  }

  private grow(): void {
    const size = this.starts.length * 2;
    const starts = new Int32Array(size);
    starts.set(this.starts);
    this.starts = starts;
    const ends = new Int32Array(size);
    ends.set(this.ends);
    this.ends = ends;
    const escaped = new Uint8Array(size);
    escaped.set(this.escaped);
    this.escaped = escaped;
  }

  /** PARSE_CSV at byte `at` of the record that starts at `bytes[p]` on line `this.line`. */
  private error(reason: string, bytes: Uint8Array, p: number, at: number): EspalierError {
    return new EspalierError("PARSE_CSV", `invalid CSV: ${reason}`, positionIn(bytes, p, this.line, at));
  }
}

/**
 * The line and column of byte `at` in a record that starts at `bytes[p]`, on line `line`: line breaks
 * inside quoted fields (LF, CR, CRLF once) start new lines.
 */
function positionIn(
  bytes: Uint8Array,
  p: number,
  line: number,
  at: number,
): SourcePos & { line: number; column: number } {
  let lineStart = p;
  for (let k = p; k < at; k++) {
    const c = bytes[k];
    if (c === LF || (c === CR && bytes[k + 1] !== LF)) {
      line++;
      lineStart = k + 1;
    }
  }
  return { line, column: utf16Length(bytes, lineStart, at) + 1 };
}

/**
 * The bytes of `carry` followed by the first `take` bytes of `chunk`, in a new array: a Buffer, as a
 * file's chunks are, so that the scanner and its sink see one kind of array. A plain Uint8Array here,
 * met at the first record cut between chunks, threw away the optimized code of every function that
 * reads the bytes (`record`, the reader's `field`, the name pool's `setBytes`; docs/performance.md).
 */
function joined(carry: Uint8Array, chunk: Uint8Array, take: number): Uint8Array {
  const bytes = Buffer.allocUnsafe(carry.length + take);
  bytes.set(carry);
  bytes.set(take === chunk.length ? chunk : chunk.subarray(0, take), carry.length);
  return bytes;
}

function isPrefixOfBom(bytes: Uint8Array): boolean {
  for (let k = 0; k < bytes.length; k++) if (bytes[k] !== BOM[k]) return false;
  return true;
}
