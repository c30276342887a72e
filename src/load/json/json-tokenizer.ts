import type { Buffer } from "node:buffer";
import { EspalierError, type MessagePart, quoted, say } from "../../errors.js";
import { asBuffer, codecs } from "../../model/buffer-codecs.js";
import type { ReadingNote } from "../../model/reading-note.js";
import { wellFormedUtf8 } from "../../model/well-formed-utf8.js";
import { notUtf8Note } from "../not-utf8-note.js";
import { limitsOf, type ReadLimits, readLimits, tooLong } from "../read-limits.js";
import { ByteBuffer } from "./byte-buffer.js";
import { JsonPositions } from "./json-positions.js";
import { utf16Length } from "./utf16-length.js";

// What may come next.
const VALUE = 0;
const VALUE_OR_END = 1; // after "["
const KEY_OR_END = 2; // after "{"
const KEY = 3; // after "," in an object
const COLON = 4;
const AFTER = 5; // after a value: "," or the end of the container
const DONE = 6; // after the top-level value: only whitespace

// A token cut by the end of a chunk.
const P_NONE = 0;
const P_STRING = 1;
const P_NUMBER = 2;
const P_WORD = 3;

/** The literals, as bytes; a word token is one of these three arrays. */
export const TRUE = Uint8Array.of(0x74, 0x72, 0x75, 0x65);
export const FALSE = Uint8Array.of(0x66, 0x61, 0x6c, 0x73, 0x65);
export const NUL = Uint8Array.of(0x6e, 0x75, 0x6c, 0x6c);

/** Bytes that may continue a number token: digits . e E + - */
const numberByte = new Uint8Array(256);
for (const c of "0123456789.eE+-") numberByte[c.charCodeAt(0)] = 1;

/**
 * An RFC 8259 tokenizer over UTF-8 bytes that arrive in chunks: a token, a multi-byte character or an
 * escape may be cut between chunks. It checks the syntax and hands each token to the hooks a subclass
 * implements, with the token's bytes and absolute offset; nothing is decoded unless a hook asks
 * (`text`). Syntax errors are PARSE_JSON at line and column (UTF-16 units), at the first character that
 * makes the text invalid, or after the last non-blank one when the input ends early.
 */
export abstract class JsonTokenizer {
  /** Open containers; `isObject[d]` says whether level `d` is an object. */
  protected depth = 0;
  private isObject = new Uint8Array(64);
  /** Absolute offset of the current chunk. */
  protected base = 0;
  protected readonly pos = new JsonPositions();
  private state = VALUE;
  private seenValue = false;

  // A token cut by the end of a chunk.
  private pend = P_NONE;
  private readonly pendBytes = new ByteBuffer();
  private pendStart = 0;
  /** Longest string or number, in bytes (read-limits.ts). */
  protected readonly maxTokenBytes: number = readLimits.maxTokenBytes;
  /** Deepest nesting (read-limits.ts): an endless run of "[" stops there, not in memory. */
  protected readonly maxDepth: number = readLimits.maxJsonDepth;
  private pendIsKey = false;
  private pendEscape = false;
  private pendWord = TRUE;
  private pendWordAt = 0;
  // Of the last string scanned: whether it holds an escape or a byte >= 0x80.
  private strEscape = false;
  private strHigh = false;
  // Strings holding bytes that are not UTF-8 (RFC 8259 section 8.1 wants UTF-8), and the first's line.
  private notUtf8Strings = 0;
  private firstNotUtf8 = 0;

  /** `limits`: lower limits of reading than `readLimits` (LoadOptions.limits). */
  constructor(limits?: Partial<ReadLimits>) {
    const l = limitsOf(limits);
    this.maxTokenBytes = l.maxTokenBytes;
    this.maxDepth = l.maxJsonDepth;
  }

  /** An object or array opens at offset `i` of the chunk; it will be level `this.depth`. */
  protected abstract open(i: number, object: boolean): void;
  /** The innermost container (level `this.depth - 1`) closes at offset `i` of `buf`. */
  protected abstract close(buf: Buffer, i: number): void;
  /** A "," inside the array at level `top`: another element follows. */
  protected abstract nextItem(top: number): void;
  /** A key, the string token `bytes[q, e]` (quotes included) at absolute offset `absQ`. */
  protected abstract key(bytes: Uint8Array, q: number, e: number, absQ: number): void;
  /** A string value, as `key`. */
  protected abstract stringValue(bytes: Uint8Array, q: number, e: number, absQ: number): void;
  /** A number, `bytes[s, e)` at absolute offset `absS`; its integer part ends at `integerEnd`. */
  protected abstract number(bytes: Uint8Array, s: number, e: number, absS: number, integerEnd: number): void;
  /** `true`, `false` or `null` (TRUE, FALSE or NUL) at absolute offset `absS`. */
  protected abstract word(word: Uint8Array, absS: number): void;
  /** The chunk `buf` has been read. */
  protected abstract chunkEnd(buf: Buffer): void;

  /**
   * An object opens at offset `i` of `buf` (its `{`): the offset after it when the subclass has taken
   * its whole value from elsewhere (json-loader.ts, read against an earlier version), so that it is
   * not read, and counted its lines and columns (passOver); -1 to read it.
   */
  protected reuse(_buf: Buffer, _i: number): number {
    return -1;
  }

  /** Where the next line feed at or after `nlFrom` of `nlBuf` is (-1: none in it), for passOver. */
  private nlBuf: Uint8Array | null = null;
  private nlFrom = 0;
  private nlAt = -1;

  /**
   * Counts the lines and columns of `buf[from, to)`, a value taken whole (see `reuse`), as reading it
   * would: `lines`, whether it may hold a line feed; `high`, a byte >= 0x80; `adjust`, when it holds no
   * line feed, its bytes beyond their UTF-16 length (JsonPositions.lineAdjust).
   */
  protected passOver(
    buf: Buffer,
    from: number,
    to: number,
    lines: boolean,
    high: boolean,
    adjust: number,
  ): void {
    const pos = this.pos;
    if (!lines) {
      pos.lineAdjust += adjust;
      return;
    }
    let nl = this.nlAt;
    if (this.nlBuf !== buf || from < this.nlFrom || (nl !== -1 && nl < from)) {
      nl = buf.indexOf(0x0a, from);
      this.nlBuf = buf;
    }
    let lineFrom = from;
    while (nl !== -1 && nl < to) {
      pos.newline(this.base + nl + 1);
      lineFrom = nl + 1;
      nl = buf.indexOf(0x0a, lineFrom);
    }
    this.nlFrom = to;
    this.nlAt = nl;
    // The last line's part: mostly a few bytes (after the last line feed of an indented text).
    if (lineFrom === from) pos.lineAdjust += adjust;
    else if (high) pos.lineAdjust += to - lineFrom - utf16Length(buf, lineFrom, to);
  }

  /** Absolute offset of a token the end of the last chunk cut (its hooks run once it ends); -1: none. */
  protected pendingFrom(): number {
    return this.pend === P_NONE ? -1 : this.pendStart;
  }

  /** Reads the next chunk of the input. */
  write(chunk: Uint8Array): void {
    const buf = asBuffer(chunk);
    this.nlBuf = null;
    let i = 0;
    if (this.pend !== P_NONE) i = this.resume(buf);
    if (i >= 0) this.run(buf, i);
    this.chunkEnd(buf);
    this.base += buf.length;
  }

  /** Ends the input: the value must be complete. */
  protected endTokens(): void {
    if (this.pend === P_NUMBER) {
      this.pend = P_NONE;
      this.numberToken(this.pendBytes.bytes, 0, this.pendBytes.length, this.pendStart);
      this.state = this.depth === 0 ? DONE : AFTER;
    } else if (this.pend !== P_NONE) {
      throw this.endedEarly();
    }
    if (this.state !== DONE) {
      if (!this.seenValue) throw new EspalierError("INPUT_EMPTY", "the input is empty");
      throw this.endedEarly();
    }
  }

  private run(buf: Buffer, from: number): void {
    const n = buf.length;
    const base = this.base;
    const pos = this.pos;
    let i = from;
    let state = this.state;
    for (;;) {
      if (i < n && buf[i] <= 32) {
        if (!pos.inBlank) pos.blankFrom(base + i);
        do {
          const w = buf[i];
          if (w === 10) pos.newline(base + i + 1);
          else if (w !== 32 && w !== 13 && w !== 9) break;
          i++;
        } while (i < n && buf[i] <= 32);
      }
      if (i >= n) break;
      pos.inBlank = false;
      const c = buf[i];
      switch (state) {
        case VALUE:
        case VALUE_OR_END: {
          this.seenValue = true;
          if (c === 0x7b /* { */) {
            const to = this.reuse(buf, i);
            if (to >= 0) {
              // An object whose reading the subclass took from an earlier reading of the same bytes.
              i = to;
              state = AFTER;
              continue;
            }
            this.openContainer(i, true);
            i++;
            state = KEY_OR_END;
            continue;
          }
          if (c === 0x5b /* [ */) {
            this.openContainer(i, false);
            i++;
            state = VALUE_OR_END;
            continue;
          }
          if (state === VALUE_OR_END && c === 0x5d /* ] */) {
            // An empty array closes as every array does (AFTER): code compiled on input that had none
            // meets no branch without type feedback at the first one (docs/performance.md).
            state = AFTER;
            continue;
          }
          if (c === 0x22 /* " */) {
            const e = this.scanString(buf, i, false);
            if (e < 0) {
              this.state = state;
              return;
            }
            this.stringValue(buf, i, e, base + i);
            this.stringDone(buf, i, e, base + i);
            i = e + 1;
          } else if (c === 0x2d /* - */ || (c >= 0x30 && c <= 0x39)) {
            let e = i + 1;
            while (e < n && numberByte[buf[e]] === 1) e++;
            if (e === n) {
              this.pend = P_NUMBER;
              this.pendStart = base + i;
              this.pendBytes.clear();
              this.pendBytes.append(buf, i, n);
              this.state = state;
              return;
            }
            this.numberToken(buf, i, e, base + i);
            i = e;
          } else if (c === 0x74 /* t */ || c === 0x66 /* f */ || c === 0x6e /* n */) {
            const word = c === 0x74 ? TRUE : c === 0x66 ? FALSE : NUL;
            let k = 1;
            while (k < word.length && i + k < n) {
              if (buf[i + k] !== word[k])
                throw this.syntax(base + i + k, "unexpected character in a literal");
              k++;
            }
            if (k < word.length) {
              this.pend = P_WORD;
              this.pendStart = base + i;
              this.pendWord = word;
              this.pendWordAt = k;
              this.state = state;
              return;
            }
            this.word(word, base + i);
            i += k;
          } else {
            throw this.syntax(
              base + i,
              say`unexpected ${shown(c)} where a value was expected${jsoncHint(c, c === 0x5d && this.depth > 0 && this.isObject[this.depth - 1] === 0)}`,
            );
          }
          state = this.depth === 0 ? DONE : AFTER;
          continue;
        }
        case KEY_OR_END:
        case KEY: {
          if (c === 0x22) {
            const e = this.scanString(buf, i, true);
            if (e < 0) {
              this.state = COLON;
              return;
            }
            this.key(buf, i, e, base + i);
            this.stringDone(buf, i, e, base + i);
            i = e + 1;
            state = COLON;
            continue;
          }
          if (state === KEY_OR_END && c === 0x7d /* } */) {
            state = AFTER; // an empty object closes as every object does, as above
            continue;
          }
          throw this.syntax(
            base + i,
            say`expected a double-quoted property name, found ${shown(c)}${jsoncHint(c, c === 0x7d && state === KEY)}`,
          );
        }
        case COLON: {
          if (c !== 0x3a /* : */)
            throw this.syntax(base + i, say`expected ":" after a property name, found ${shown(c)}`);
          i++;
          state = VALUE;
          continue;
        }
        case AFTER: {
          const top = this.depth - 1;
          if (c === 0x2c /* , */) {
            i++;
            if (this.isObject[top] === 1) {
              state = KEY;
            } else {
              state = VALUE;
              this.nextItem(top);
            }
            continue;
          }
          if (c === (this.isObject[top] === 1 ? 0x7d : 0x5d)) {
            this.closeContainer(buf, i);
            i++;
            state = this.depth === 0 ? DONE : AFTER;
            continue;
          }
          const what =
            this.isObject[top] === 1 ? '"," or "}" after a property value' : '"," or "]" after an element';
          throw this.syntax(base + i, say`expected ${what}, found ${shown(c)}${jsoncHint(c, false)}`);
        }
        default:
          throw this.syntax(
            base + i,
            say`unexpected ${shown(c)} after the JSON value${jsonLinesHint(c, base + i === this.pos.lineStart)}`,
          );
      }
    }
    this.state = state;
  }

  private openContainer(i: number, object: boolean): void {
    const top = this.depth;
    if (top >= this.maxDepth)
      throw new EspalierError(
        "LIMIT_EXCEEDED",
        `the JSON is nested more than ${this.maxDepth} levels deep (an endless input?)`,
        this.pos.at(this.base + i),
      );
    this.open(i, object);
    if (top === this.isObject.length) {
      const grown = new Uint8Array(top * 2);
      grown.set(this.isObject);
      this.isObject = grown;
    }
    this.isObject[top] = object ? 1 : 0;
    this.depth = top + 1;
  }

  private closeContainer(buf: Buffer, i: number): void {
    this.close(buf, i);
    this.depth--;
  }

  /** Continues the token cut by the last chunk; the offset after it, or -1 when this chunk ends first. */
  private resume(buf: Buffer): number {
    const n = buf.length;
    if (this.pend === P_WORD) {
      const word = this.pendWord;
      let k = this.pendWordAt;
      let j = 0;
      while (k < word.length && j < n) {
        if (buf[j] !== word[k]) throw this.syntax(this.base + j, "unexpected character in a literal");
        k++;
        j++;
      }
      this.pendWordAt = k;
      if (k < word.length) return -1;
      this.pend = P_NONE;
      this.word(word, this.pendStart);
      this.state = this.depth === 0 ? DONE : AFTER;
      return j;
    }
    if (this.pend === P_NUMBER) {
      let j = 0;
      while (j < n && numberByte[buf[j]] === 1) j++;
      this.pendBytes.append(buf, 0, j);
      if (j === n) return this.stillPending("a JSON number");
      this.pend = P_NONE;
      this.numberToken(this.pendBytes.bytes, 0, this.pendBytes.length, this.pendStart);
      this.state = this.depth === 0 ? DONE : AFTER;
      return j;
    }
    // A string: find its closing quote, minding an escape cut in two.
    let j = 0;
    if (this.pendEscape) {
      if (n === 0) return -1;
      this.pendEscape = false;
      j = 1;
    }
    for (; j < n; j++) {
      const c = buf[j];
      if (c === 0x22) break;
      if (c === 0x5c) {
        this.strEscape = true;
        if (j + 1 >= n) {
          this.pendEscape = true;
          j = n;
          break;
        }
        j++;
      } else if (c < 0x20) {
        this.pendBytes.append(buf, 0, j);
        this.controlCharacter(this.pendBytes.bytes, 0, this.pendBytes.length, this.pendStart);
      } else if (c >= 0x80) {
        this.strHigh = true;
      }
    }
    if (j >= n) {
      this.pendBytes.append(buf, 0, n);
      return this.stillPending("a JSON string");
    }
    this.pendBytes.append(buf, 0, j + 1);
    this.pend = P_NONE;
    const bytes = this.pendBytes.bytes;
    const e = this.pendBytes.length - 1;
    if (this.pendIsKey) {
      this.key(bytes, 0, e, this.pendStart);
      this.stringDone(bytes, 0, e, this.pendStart);
      this.state = COLON;
    } else {
      this.stringValue(bytes, 0, e, this.pendStart);
      this.stringDone(bytes, 0, e, this.pendStart);
      this.state = this.depth === 0 ? DONE : AFTER;
    }
    return j + 1;
  }

  /**
   * The offset of the quote closing the string that opens at `q`, noting escapes and bytes >= 0x80; or -1
   * when the chunk ends first (the string so far is kept as the pending token).
   */
  private scanString(buf: Buffer, q: number, isKey: boolean): number {
    const n = buf.length;
    let escaped = false;
    let high = false;
    let j = q + 1;
    for (; j < n; j++) {
      const c = buf[j];
      if (c === 0x22) break;
      if (c === 0x5c) {
        escaped = true;
        j++;
      } else if (c < 0x20) {
        this.controlCharacter(buf, q, j, this.base + q);
      } else if (c >= 0x80) {
        high = true;
      }
    }
    this.strEscape = escaped;
    this.strHigh = high;
    this.strChecked = false;
    if (j < n) return j;
    this.pend = P_STRING;
    this.pendIsKey = isKey;
    this.pendStart = this.base + q;
    this.pendEscape = j > n; // the chunk ended right after a backslash
    this.pendBytes.clear();
    this.pendBytes.append(buf, q, n);
    return -1;
  }

  /** RFC 8259 section 6: -? (0 | [1-9][0-9]*) (. [0-9]+)? ([eE] [+-]? [0-9]+)? */
  private numberToken(bytes: Uint8Array, s: number, e: number, absS: number): void {
    let k = s;
    if (bytes[k] === 0x2d) k++;
    if (k < e && bytes[k] === 0x30) k++;
    else if (k < e && isDigit(bytes[k])) while (k < e && isDigit(bytes[k])) k++;
    else throw this.badNumber(absS + (k - s), k === e);
    const integerEnd = k;
    if (k < e && bytes[k] === 0x2e) {
      k++;
      const from = k;
      while (k < e && isDigit(bytes[k])) k++;
      if (k === from) throw this.badNumber(absS + (k - s), k === e);
    }
    if (k < e && (bytes[k] === 0x65 || bytes[k] === 0x45)) {
      k++;
      if (k < e && (bytes[k] === 0x2b || bytes[k] === 0x2d)) k++;
      const from = k;
      while (k < e && isDigit(bytes[k])) k++;
      if (k === from) throw this.badNumber(absS + (k - s), k === e);
    }
    if (k < e) throw this.syntax(absS + (k - s), say`unexpected ${shown(bytes[k])} after a number`);
    this.number(bytes, s, e, absS, integerEnd);
  }

  // ---------------------------------------------------------------------------------------------------
  // Strings: a hook reads the current string token through these, before the tokenizer moves on.

  // Whether the current string's escapes have been checked (by `text`).
  private strChecked = false;

  /** Whether the current string token holds an escape. */
  protected get escaped(): boolean {
    return this.strEscape;
  }

  /**
   * The text of the current string token `bytes[q, e]` (quotes included); checks its escapes (RFC 8259
   * section 7) first.
   */
  protected text(bytes: Uint8Array, q: number, e: number, absQ: number): string {
    this.strChecked = true;
    if (this.strEscape) return this.unescape(bytes, q, e, absQ, true)!;
    const buf = asBuffer(bytes);
    return this.strHigh ? codecs.utf8Slice(buf, q + 1, e) : codecs.latin1Slice(buf, q + 1, e);
  }

  /** After the hooks: checks the escapes no hook asked for, and counts the string for columns. */
  private stringDone(bytes: Uint8Array, q: number, e: number, absQ: number): void {
    if (this.strEscape && !this.strChecked) this.unescape(bytes, q, e, absQ, false);
    if (this.strHigh) {
      // Only strings with a byte >= 0x80 are looked at: an ASCII document costs nothing more.
      if (!wellFormedUtf8(bytes, q + 1, e) && this.notUtf8Strings++ === 0) this.firstNotUtf8 = this.pos.line;
      this.pos.afterHighString(bytes, q, e);
    }
  }

  /**
   * UNDECODABLE_BYTES when strings (names, keys, values) held bytes that are not UTF-8: each bad
   * sequence reads as U+FFFD, so names that differ only there print alike.
   */
  protected notUtf8Notes(): ReadingNote[] {
    return this.notUtf8Strings > 0 ? [notUtf8Note("string", this.notUtf8Strings, this.firstNotUtf8)] : [];
  }

  private unescape(bytes: Uint8Array, q: number, e: number, absQ: number, need: boolean): string | undefined {
    let out = "";
    let run = q + 1;
    const buf = asBuffer(bytes);
    for (let k = q + 1; k < e; k++) {
      if (bytes[k] !== 0x5c) continue;
      if (need && k > run) out += codecs.utf8Slice(buf, run, k);
      const x = bytes[k + 1];
      let code: number;
      switch (x) {
        case 0x22:
        case 0x5c:
        case 0x2f:
          code = x;
          break;
        case 0x62:
          code = 8;
          break;
        case 0x66:
          code = 12;
          break;
        case 0x6e:
          code = 10;
          break;
        case 0x72:
          code = 13;
          break;
        case 0x74:
          code = 9;
          break;
        case 0x75: {
          code = 0;
          for (let h = k + 2; h < k + 6; h++) {
            const d = h < e ? hexValue(bytes[h]) : -1;
            if (d < 0) throw this.stringError(bytes, q, Math.min(h, e), absQ, "bad \\u escape in a string");
            code = code * 16 + d;
          }
          k += 4;
          break;
        }
        default:
          throw this.stringError(bytes, q, k + 1, absQ, "bad escape in a string");
      }
      if (need) out += String.fromCharCode(code);
      k++;
      run = k + 1;
    }
    if (need && e > run) out += codecs.utf8Slice(buf, run, e);
    return need ? out : undefined;
  }

  /** A control character inside the string opening at `q`: first any bad escape before it. */
  private controlCharacter(bytes: Uint8Array, q: number, k: number, absQ: number): never {
    this.unescape(bytes, q, k, absQ, false);
    throw this.stringError(bytes, q, k, absQ, "a control character in a string must be escaped");
  }

  private stringError(bytes: Uint8Array, q: number, k: number, absQ: number, message: string): EspalierError {
    return new EspalierError("PARSE_JSON", `invalid JSON: ${message}`, this.pos.inString(bytes, q, k, absQ));
  }

  /** -1 (the token goes on in the next chunk), or LIMIT_EXCEEDED when it is already too long. */
  private stillPending(what: string): -1 {
    if (this.pendBytes.length > this.maxTokenBytes)
      throw tooLong(what, this.maxTokenBytes, this.pos.at(this.pendStart));
    return -1;
  }

  private syntax(abs: number, message: string | MessagePart[]): EspalierError {
    return new EspalierError("PARSE_JSON", say`invalid JSON: ${message}`, this.pos.at(abs));
  }

  private badNumber(abs: number, atEnd: boolean): EspalierError {
    return this.syntax(abs, atEnd ? "a number ends too early" : "a number is malformed");
  }

  /** PARSE_JSON after the last non-blank character: the input ends inside a value. */
  private endedEarly(): EspalierError {
    const message = "invalid JSON: the input ends before the value is complete";
    if (this.pend === P_STRING) {
      const { bytes, length } = this.pendBytes;
      // A bad escape before the end is reported first, as a scan from the start meets it first.
      this.unescape(bytes, 0, length, this.pendStart, false);
      // After the last character that is not white space (String.prototype.trimEnd's white space).
      const kept = codecs.utf8Slice(asBuffer(bytes), 0, length).trimEnd().length;
      const column = this.pos.columnAt(this.pendStart) + kept;
      return new EspalierError("PARSE_JSON", message, { line: this.pos.line, column });
    }
    if (this.pos.inBlank) return new EspalierError("PARSE_JSON", message, this.pos.blankStartPos());
    return new EspalierError("PARSE_JSON", message, this.pos.at(this.base));
  }
}

/** The value of a number token `bytes[s, e)` whose integer part ends at `integerEnd`. */
export function numberValue(bytes: Uint8Array, s: number, e: number, integerEnd: number): number {
  if (integerEnd === e && bytes[s] !== 0x2d && e - s <= 15) {
    let value = 0;
    for (let d = s; d < e; d++) value = value * 10 + (bytes[d] - 0x30);
    return value;
  }
  return Number(codecs.latin1Slice(asBuffer(bytes), s, e));
}

function isDigit(c: number): boolean {
  return c >= 0x30 && c <= 0x39;
}

function hexValue(c: number): number {
  if (c >= 0x30 && c <= 0x39) return c - 0x30;
  if (c >= 0x61 && c <= 0x66) return c - 0x57;
  if (c >= 0x41 && c <= 0x46) return c - 0x37;
  return -1;
}

/**
 * What a JSONC file (JSON with comments and trailing commas, as tsconfig.json and editor settings are
 * written) holds that JSON does not, for the end of a PARSE_JSON message: a "/" where a token was
 * due starts a comment; `afterComma`, a "}" where a property name was due or a "]" where an array's
 * value was due closes its object or array right after a comma (an empty one is read before). RFC
 * 8259 has neither.
 */
function jsoncHint(c: number, afterComma: boolean): string {
  if (c === 0x2f)
    return "; JSON has no comments (RFC 8259): a file written with them (JSONC, as tsconfig.json may be) is read once they are removed";
  if (afterComma)
    return "; JSON has no comma before a closing bracket (RFC 8259), as JSONC files (tsconfig.json) may have: remove it";
  return "";
}

/**
 * What a second value at the start of a line is: JSON Lines (one JSON text a line, jsonlines.org),
 * which espalier reads as a fact table, its records rolled up by columns named as levels; records
 * linked by an id and a parent (an export of rows) read as JSON rows once they are one array, which
 * the sed named makes of them (blank lines left out, "[" before the first, "," after each but the
 * last, "]" after it).
 */
function jsonLinesHint(c: number, lineStart: boolean): string {
  if (!lineStart || (c !== 0x7b && c !== 0x5b)) return "";
  return "; another JSON text begins this line: one value a line (JSON Lines) is read as a table of records, with --input-format jsonl and the columns that make its levels (--levels team,service, or --key-field); records linked by an id and a parent field read as rows once they are one array: sed '/^[[:space:]]*$/d' FILE | sed '1s/^/[/; $!s/$/,/; $s/$/]/' | espalier - --input-format rows";
}

function shown(c: number): MessagePart {
  if (c >= 0x21 && c < 0x7f) return quoted.value(String.fromCharCode(c));
  return `byte 0x${c.toString(16).padStart(2, "0")}`;
}
