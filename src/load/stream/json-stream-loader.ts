import { Buffer } from "node:buffer";
import { EspalierError, type MessagePart, quoted, type SourcePos, say } from "../../errors.js";
import type { LinkedNodes } from "../../model/linked-nodes.js";
import { isSize } from "../../model/size-rule.js";
import { describeNode } from "../describe-node.js";
import { linkTable } from "../link-table.js";
import type { LoadOptions } from "../load-options.js";
import { NodeSink } from "../node-sink.js";
import { isRowsValue } from "../rows-shape.js";
import { rowsTable } from "../table.js";
import { ByteBuffer } from "./byte-buffer.js";
import { isArrayIndexKey, reorderKeyedChildren } from "./keyed-order.js";

// What may come next.
const VALUE = 0;
const VALUE_OR_END = 1; // after "["
const KEY_OR_END = 2; // after "{"
const KEY = 3; // after "," in an object
const COLON = 4;
const AFTER = 5; // after a value: "," or the end of the container
const DONE = 6; // after the top-level value: only whitespace

// What an open container is.
const SKIP = 0; // a value nobody reads (still checked to be JSON)
const NODE = 1;
const CHILD_LIST = 2;
const CHILD_MAP = 3;
const TOP_LIST = 4;
const ROWS = 5;

// What the next value is.
const S_SKIP = 0;
const S_TOP = 1;
const S_TOP_ITEM = 2;
const S_CHILD = 3;
const S_KEYED = 4;
const S_FIELD = 5;
const S_ROW = 6;
const itemSlot = [S_SKIP, S_SKIP, S_CHILD, S_SKIP, S_TOP_ITEM, S_ROW];

// The kind of the last value seen for a node's field.
const ABSENT = 0;
const NULL = 1;
const NUMBER = 2;
const STRING = 3;
const BOOLEAN = 4;
const COLLECTION = 5;

// What a field of a node object is for (bits).
const F_NAME = 1;
const F_SIZE = 2;
const F_CHILDREN = 4;

// A token cut by the end of a chunk.
const P_NONE = 0;
const P_STRING = 1;
const P_NUMBER = 2;
const P_WORD = 3;

// Whether the top level is rows (a table) or nested nodes.
const M_NESTED = 0;
const M_ROWS = 1;
const M_UNDECIDED = 2;

// What a captured value (raw bytes, parsed whole at its end) is for.
const C_PROBE = 0; // the first element of a top-level array, to tell rows from nodes
const C_KEEP = 1; // an object or array kept as a field's text
const C_ROW = 2;

const TRUE = Uint8Array.of(0x74, 0x72, 0x75, 0x65);
const FALSE = Uint8Array.of(0x66, 0x61, 0x6c, 0x73, 0x65);
const NUL = Uint8Array.of(0x6e, 0x75, 0x6c, 0x6c);

/** Bytes that may continue a number token: digits . e E + - */
const numberByte = new Uint8Array(256);
for (const c of "0123456789.eE+-") numberByte[c.charCodeAt(0)] = 1;

interface Field {
  bytes: Uint8Array;
  text: string;
  mask: number;
  /** Indices into keepFields. */
  keeps: number[];
}

/** What is known about an open container; one per nesting level, reused. */
class Frame {
  node = -1;
  keyed = false;
  // The kind of the last value of each field, and where it is (line, column), for errors at the end.
  nameKind = ABSENT;
  nameLine = 0;
  nameColumn = 0;
  sizeKind = ABSENT;
  size = 0;
  sizeText = "";
  sizeLine = 0;
  sizeColumn = 0;
  childrenKind = ABSENT;
  childrenLine = 0;
  childrenColumn = 0;
  /** Sink length when the current children value began; -1 when there is none. */
  childrenMark = -1;
  /** Children by name: the keys seen, the children in input order, whether they need reordering. */
  readonly keys = new Set<string>();
  readonly children: number[] = [];
  reorder = false;
}

interface Capture {
  kind: number;
  /** Nesting depth of the captured container; its end ends the capture. */
  depth: number;
  parts: Uint8Array[];
  /** Where the capture starts in the current chunk. */
  start: number;
  node: number;
  keeps: number[];
}

/**
 * Nested JSON (and JSON rows) read from a byte stream in chunks, never as one string: a tokenizer that
 * builds the nodes directly into flat arrays as it goes. A token, a multi-byte character or an escape
 * may be split across chunks. Gives the same nodes as `loadJson` on the same text:
 * - node shapes as in {@link walkNested}: children as an array or an object keyed by name (numbers and
 *   null as leaves), a top-level array as several roots, nodes numbered in document order;
 * - JSON.parse's object semantics: a repeated key keeps its first place and its last value; in children
 *   keyed by name, array-index keys come first, ascending;
 * - rows when `as` is "rows", or when it is undefined and the first element of a top-level array is a flat
 *   record with an id, parent or path field (each row is parsed on its own: rows cost what they do in
 *   memory, but no string holds the whole file).
 * Syntax errors are PARSE_JSON at line and column (UTF-16 units, as the in-memory loader counts), at the
 * first character that makes the text invalid, or after the last non-blank one when the input ends early.
 * Structure errors carry the line and column of the value at fault. With several faults, the first in
 * document order is reported (the in-memory loader reports parse errors first, then nodes breadth-first).
 */
export class JsonStreamLoader {
  private readonly options: LoadOptions;
  private readonly sink: NodeSink;
  private readonly fields: Field[] = [];
  /** 1 where a node has an own size: hasSizes counts only nodes a repeated key did not replace. */
  private sized = new Uint8Array(1024);
  /** Kept field values by node; undefined where a node has no such field (it becomes ""). */
  private readonly kept: (string | undefined)[][];
  private mode: number;
  private readonly rows: unknown[] = [];

  // Parser state.
  private state = VALUE;
  private slot = S_TOP;
  private slotField = 0;
  private slotKey = "";
  private depth = 0;
  private role = new Uint8Array(64);
  private isObject = new Uint8Array(64);
  private readonly frames: Frame[] = [];
  private readonly captures: Capture[] = [];
  private seenValue = false;

  // Positions: absolute byte offset of the chunk, the current line and where it starts, and how many
  // bytes of the line so far are beyond their UTF-16 length (multi-byte characters).
  private base = 0;
  private line = 1;
  private lineStart = 0;
  private lineAdjust = 0;
  // The whitespace run the last chunk ended in, for "input ends early" at the last non-blank character.
  private inWs = false;
  private wsStart = 0;
  private wsLine = 1;
  private wsLineStart = 0;
  private wsAdjust = 0;

  // A token cut by the end of a chunk.
  private pend = P_NONE;
  private readonly pendBytes = new ByteBuffer();
  private pendStart = 0;
  private pendIsKey = false;
  private pendEscape = false;
  private pendWord = TRUE;
  private pendWordAt = 0;
  // Of the last string scanned: whether it holds an escape or a byte >= 0x80.
  private strEscape = false;
  private strHigh = false;

  constructor(options: LoadOptions, as?: "json" | "rows") {
    this.options = options;
    this.mode = as === "rows" ? M_ROWS : as === "json" ? M_NESTED : M_UNDECIDED;
    this.sink = new NodeSink(options.maxNodes, false);
    this.kept = options.keepFields.map(() => []);
    const add = (text: string, mask: number, keep: number) => {
      let field = this.fields.find((f) => f.text === text);
      if (!field) {
        field = { bytes: Buffer.from(text, "utf8"), text, mask: 0, keeps: [] };
        this.fields.push(field);
      }
      field.mask |= mask;
      if (keep >= 0) field.keeps.push(keep);
    };
    add(options.nameField, F_NAME, -1);
    add(options.sizeField, F_SIZE, -1);
    add(options.childrenField, F_CHILDREN, -1);
    for (let f = 0; f < options.keepFields.length; f++) add(options.keepFields[f], 0, f);
  }

  /** Reads the next chunk of the input. */
  write(chunk: Uint8Array): void {
    const buf =
      chunk instanceof Buffer ? chunk : Buffer.from(chunk.buffer, chunk.byteOffset, chunk.byteLength);
    let i = 0;
    if (this.pend !== P_NONE) i = this.resume(buf);
    if (i >= 0) this.run(buf, i);
    for (const capture of this.captures) {
      if (capture.start < buf.length) capture.parts.push(Uint8Array.prototype.slice.call(buf, capture.start));
      capture.start = 0;
    }
    this.base += buf.length;
  }

  /** Ends the input; the nodes, ready for `buildTree`. */
  end(): LinkedNodes {
    if (this.pend === P_NUMBER) {
      this.pend = P_NONE;
      const bytes = this.pendBytes.bytes;
      this.number(bytes, 0, this.pendBytes.length, this.pendStart);
      this.state = this.depth === 0 ? DONE : AFTER;
    } else if (this.pend !== P_NONE) {
      throw this.endedEarly();
    }
    if (this.state !== DONE) {
      if (!this.seenValue) throw new EspalierError("INPUT_EMPTY", "the input is empty");
      throw this.endedEarly();
    }
    if (this.mode === M_ROWS) return linkTable(rowsTable(this.rows), this.options);
    const sink = this.sink;
    if (sink.length === 0) throw new EspalierError("INPUT_EMPTY", "the top-level array holds no nodes");
    for (let i = 0; i < sink.length && !sink.hasSizes; i++) if (this.sized[i] === 1) sink.hasSizes = true;
    const { keepFields } = this.options;
    const fields = new Map<string, string[]>();
    for (let f = 0; f < keepFields.length; f++) {
      // Seen only on nodes of the tree: a value a repeated key replaced does not count.
      const column = this.kept[f];
      let seen = false;
      for (let i = 0; i < column.length; i++) {
        if (column[i] === undefined) column[i] = "";
        else seen = true;
      }
      if (!seen) {
        throw new EspalierError("FIELD_MISSING", `no node has the field "${keepFields[f]}" asked to be kept`);
      }
      fields.set(keepFields[f], column as string[]);
    }
    return sink.finish(this.options.rootName, fields);
  }

  // ---------------------------------------------------------------------------------------------------
  // The tokenizer.

  private run(buf: Buffer, from: number): void {
    const n = buf.length;
    const base = this.base;
    let i = from;
    let state = this.state;
    for (;;) {
      if (i < n && buf[i] <= 32) {
        if (!this.inWs) {
          this.inWs = true;
          this.wsStart = base + i;
          this.wsLine = this.line;
          this.wsLineStart = this.lineStart;
          this.wsAdjust = this.lineAdjust;
        }
        do {
          const w = buf[i];
          if (w === 10) {
            this.line++;
            this.lineStart = base + i + 1;
            this.lineAdjust = 0;
          } else if (w !== 32 && w !== 13 && w !== 9) {
            break;
          }
          i++;
        } while (i < n && buf[i] <= 32);
      }
      if (i >= n) break;
      this.inWs = false;
      const c = buf[i];
      switch (state) {
        case VALUE:
        case VALUE_OR_END: {
          this.seenValue = true;
          if (c === 0x7b /* { */) {
            this.open(i, true);
            i++;
            state = KEY_OR_END;
            continue;
          }
          if (c === 0x5b /* [ */) {
            this.open(i, false);
            i++;
            state = VALUE_OR_END;
            continue;
          }
          if (c === 0x5d /* ] */ && state === VALUE_OR_END) {
            this.close(buf, i);
            i++;
            state = this.depth === 0 ? DONE : AFTER;
            continue;
          }
          if (c === 0x22 /* " */) {
            const e = this.scanString(buf, i, false);
            if (e < 0) {
              this.state = state;
              return;
            }
            this.stringValue(buf, i, e, base + i);
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
            this.number(buf, i, e, base + i);
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
            throw this.syntax(base + i, say`unexpected ${shown(c)} where a value was expected`);
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
            i = e + 1;
            state = COLON;
            continue;
          }
          if (c === 0x7d /* } */ && state === KEY_OR_END) {
            this.close(buf, i);
            i++;
            state = this.depth === 0 ? DONE : AFTER;
            continue;
          }
          throw this.syntax(base + i, say`expected a double-quoted property name, found ${shown(c)}`);
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
              this.slot = itemSlot[this.role[top]];
            }
            continue;
          }
          if (c === (this.isObject[top] === 1 ? 0x7d : 0x5d)) {
            this.close(buf, i);
            i++;
            state = this.depth === 0 ? DONE : AFTER;
            continue;
          }
          const what =
            this.isObject[top] === 1 ? '"," or "}" after a property value' : '"," or "]" after an element';
          throw this.syntax(base + i, say`expected ${what}, found ${shown(c)}`);
        }
        default:
          throw this.syntax(base + i, say`unexpected ${shown(c)} after the JSON value`);
      }
    }
    this.state = state;
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
      if (j === n) return -1;
      this.pend = P_NONE;
      this.number(this.pendBytes.bytes, 0, this.pendBytes.length, this.pendStart);
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
      return -1;
    }
    this.pendBytes.append(buf, 0, j + 1);
    this.pend = P_NONE;
    const bytes = this.pendBytes.bytes;
    const e = this.pendBytes.length - 1;
    if (this.pendIsKey) {
      this.key(bytes, 0, e, this.pendStart);
      this.state = COLON;
    } else {
      this.stringValue(bytes, 0, e, this.pendStart);
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
    if (j < n) return j;
    this.pend = P_STRING;
    this.pendIsKey = isKey;
    this.pendStart = this.base + q;
    this.pendEscape = j > n; // the chunk ended right after a backslash
    this.pendBytes.clear();
    this.pendBytes.append(buf, q, n);
    return -1;
  }

  // ---------------------------------------------------------------------------------------------------
  // Tokens.

  /** A key: picks what the value after it is for. */
  private key(bytes: Uint8Array, q: number, e: number, absQ: number): void {
    const top = this.depth - 1;
    const role = this.role[top];
    if (role === NODE) {
      const fields = this.fields;
      let found = -1;
      if (this.strEscape) {
        const text = this.text(bytes, q, e, absQ, true)!;
        for (let f = 0; f < fields.length; f++) if (fields[f].text === text) found = f;
      } else {
        const length = e - q - 1;
        for (let f = 0; f < fields.length && found < 0; f++) {
          const want = fields[f].bytes;
          if (want.length !== length) continue;
          let k = 0;
          while (k < length && bytes[q + 1 + k] === want[k]) k++;
          if (k === length) found = f;
        }
        this.advance(bytes, q, e);
      }
      this.slot = found < 0 ? S_SKIP : S_FIELD;
      this.slotField = found;
    } else if (role === CHILD_MAP) {
      this.slotKey = this.text(bytes, q, e, absQ, true)!;
      this.slot = S_KEYED;
    } else {
      if (this.strEscape) this.text(bytes, q, e, absQ, false);
      else this.advance(bytes, q, e);
      this.slot = S_SKIP;
    }
  }

  private stringValue(bytes: Uint8Array, q: number, e: number, absQ: number): void {
    const slot = this.slot;
    if (slot === S_SKIP) {
      if (this.strEscape) this.text(bytes, q, e, absQ, false);
      else this.advance(bytes, q, e);
      return;
    }
    if (slot === S_FIELD && !this.strEscape && this.fields[this.slotField].mask === F_NAME) {
      // Only a name, and spelled without escapes: its bytes go to the name pool as they are (invalid
      // UTF-8 reads back as U+FFFD, as decoding the whole text would give it), with no string made.
      const field = this.fields[this.slotField];
      const frame = this.frames[this.depth - 1];
      if (field.keeps.length === 0 && !frame.keyed) {
        frame.nameKind = STRING;
        this.sink.name.setBytes(frame.node, bytes, q + 1, e);
        this.advance(bytes, q, e);
        return;
      }
    }
    const text = this.text(bytes, q, e, absQ, slot === S_FIELD)!;
    this.scalar(STRING, text, 0, this.columnAt(absQ));
  }

  private number(bytes: Uint8Array, s: number, e: number, absS: number): void {
    // RFC 8259 section 6: -? (0 | [1-9][0-9]*) (. [0-9]+)? ([eE] [+-]? [0-9]+)?
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
    if (this.slot === S_SKIP) return;
    let value = 0;
    if (integerEnd === e && bytes[s] !== 0x2d && e - s <= 15) {
      for (let d = s; d < e; d++) value = value * 10 + (bytes[d] - 0x30);
    } else {
      value = Number(latin1(bytes, s, e));
    }
    this.scalar(NUMBER, "", value, this.columnAt(absS));
  }

  private word(word: Uint8Array, absS: number): void {
    if (this.slot === S_SKIP) return;
    const column = this.columnAt(absS);
    if (word === NUL) this.scalar(NULL, "", 0, column);
    else this.scalar(BOOLEAN, word === TRUE ? "true" : "false", 0, column);
  }

  // ---------------------------------------------------------------------------------------------------
  // Building nodes.

  private addNode(parent: number, name: string): number {
    const j = this.sink.add(parent, name, 0);
    if (j === this.sized.length) {
      const grown = new Uint8Array(this.sized.length * 2);
      grown.set(this.sized);
      this.sized = grown;
    }
    this.sized[j] = 0;
    for (const column of this.kept) column.push(undefined);
    return j;
  }

  /** A scalar value in the current slot, starting at `column` of the current line. */
  private scalar(kind: number, text: string, value: number, column: number): void {
    const top = this.depth - 1;
    switch (this.slot) {
      case S_FIELD:
        this.fieldScalar(this.frames[top], kind, text, value, column);
        return;
      case S_KEYED: {
        const j = this.keyedChild(top);
        if (kind === NUMBER) {
          if (!isSize(value)) {
            throw this.badSize(String(value), j, { line: this.line, column });
          }
          this.sink.ownSize[j] = value;
          this.sized[j] = 1;
        } else if (kind !== NULL) {
          throw new EspalierError("SHAPE", say`${this.where(j)} must be a node object, a number or null`, {
            line: this.line,
            column,
          });
        }
        return;
      }
      case S_CHILD:
      case S_TOP_ITEM: {
        if (this.mode === M_UNDECIDED) this.mode = M_NESTED;
        const j = this.addNode(this.slot === S_CHILD ? this.frames[top].node : -1, "");
        throw new EspalierError("SHAPE", say`${this.where(j)} must be a node object`, {
          line: this.line,
          column,
        });
      }
      case S_ROW:
        throw this.badRow();
      default:
        throw this.badTop({ line: this.line, column });
    }
  }

  private fieldScalar(frame: Frame, kind: number, text: string, value: number, column: number): void {
    const field = this.fields[this.slotField];
    const i = frame.node;
    if ((field.mask & F_NAME) !== 0 && !frame.keyed) {
      frame.nameKind = kind;
      this.sink.name.setString(i, kind === NUMBER ? String(value) : text);
    }
    if ((field.mask & F_SIZE) !== 0) {
      frame.sizeKind = kind;
      frame.size = value;
      frame.sizeText = text;
      frame.sizeLine = this.line;
      frame.sizeColumn = column;
    }
    if ((field.mask & F_CHILDREN) !== 0) {
      this.dropChildren(frame);
      frame.childrenKind = kind;
      frame.childrenLine = this.line;
      frame.childrenColumn = column;
    }
    for (const f of field.keeps) {
      this.kept[f][i] = kind === NUMBER ? String(value) : text;
    }
  }

  /** A later children field replaces an earlier one (JSON.parse keeps the last value of a key). */
  private dropChildren(frame: Frame): void {
    if (frame.childrenMark < 0) return;
    this.sink.truncate(frame.childrenMark);
    for (const column of this.kept) column.length = frame.childrenMark;
    frame.childrenMark = -1;
  }

  /** Adds the child named by the current key of the children-by-name object at `top`. */
  private keyedChild(top: number): number {
    const map = this.frames[top];
    const key = this.slotKey;
    const j = this.addNode(map.node, key);
    if (map.keys.has(key) || isArrayIndexKey(key)) map.reorder = true;
    map.keys.add(key);
    map.children.push(j);
    return j;
  }

  /** Opens an object or array at offset `i` of the chunk, as what the current slot says. */
  private open(i: number, object: boolean): void {
    const top = this.depth; // index of the new container
    if (top === this.role.length) this.growStack();
    const captures = this.captures;
    if (captures.length > 0 && captures[0].kind === C_PROBE && top >= 2) {
      // A nested value in the first element: it is not a flat record, so the input is nodes.
      captures.shift();
      this.mode = M_NESTED;
    }
    let frame = this.frames[top];
    if (!frame) {
      frame = new Frame();
      this.frames[top] = frame;
    }
    const parentFrame = top > 0 ? this.frames[top - 1] : frame;
    let role = SKIP;
    let slot = S_SKIP;
    const column = this.columnAt(this.base + i);
    const pos = { line: this.line, column };
    switch (this.slot) {
      case S_TOP:
        if (this.mode === M_ROWS && object) throw this.badTop(pos);
        if (object) {
          if (this.mode === M_UNDECIDED) this.mode = M_NESTED;
          role = NODE;
          this.nodeFrame(frame, this.addNode(-1, ""), false);
        } else {
          role = this.mode === M_ROWS ? ROWS : TOP_LIST;
          slot = itemSlot[role];
        }
        break;
      case S_TOP_ITEM:
        if (!object) {
          this.scalar(COLLECTION, "", 0, column);
          break;
        }
        if (this.mode === M_UNDECIDED) {
          if (this.sink.length === 0) this.startCapture(C_PROBE, top + 1, i, -1, []);
          else this.mode = M_NESTED;
        }
        role = NODE;
        this.nodeFrame(frame, this.addNode(-1, ""), false);
        break;
      case S_CHILD:
        if (!object) this.scalar(COLLECTION, "", 0, column);
        role = NODE;
        this.nodeFrame(frame, this.addNode(parentFrame.node, ""), false);
        break;
      case S_KEYED: {
        const j = this.keyedChild(top - 1);
        if (!object) {
          throw new EspalierError(
            "SHAPE",
            say`${this.where(j)} must be a node object, a number or null`,
            pos,
          );
        }
        role = NODE;
        this.nodeFrame(frame, j, true);
        break;
      }
      case S_FIELD: {
        const field = this.fields[this.slotField];
        const node = parentFrame.node;
        if ((field.mask & F_NAME) !== 0 && !parentFrame.keyed) {
          parentFrame.nameKind = COLLECTION;
          parentFrame.nameLine = this.line;
          parentFrame.nameColumn = column;
          this.sink.name.setString(node, "");
        }
        if ((field.mask & F_SIZE) !== 0) {
          parentFrame.sizeKind = COLLECTION;
          parentFrame.sizeLine = this.line;
          parentFrame.sizeColumn = column;
        }
        if ((field.mask & F_CHILDREN) !== 0) {
          this.dropChildren(parentFrame);
          parentFrame.childrenKind = COLLECTION;
          parentFrame.childrenMark = this.sink.length;
          role = object ? CHILD_MAP : CHILD_LIST;
          slot = object ? S_SKIP : S_CHILD;
          frame.node = node;
          if (object) {
            frame.keys.clear();
            frame.children.length = 0;
            frame.reorder = false;
          }
        }
        if (field.keeps.length > 0) {
          this.startCapture(C_KEEP, top + 1, i, node, field.keeps);
        }
        break;
      }
      case S_ROW:
        if (!object) throw this.badRow();
        this.startCapture(C_ROW, top + 1, i, -1, []);
        break;
    }
    this.role[top] = role;
    this.isObject[top] = object ? 1 : 0;
    this.depth = top + 1;
    this.slot = slot;
  }

  private nodeFrame(frame: Frame, node: number, keyed: boolean): void {
    frame.node = node;
    frame.keyed = keyed;
    frame.nameKind = ABSENT;
    frame.sizeKind = ABSENT;
    frame.childrenKind = ABSENT;
    frame.childrenMark = -1;
  }

  /** Closes the innermost container, whose last byte is at offset `i` of `buf`. */
  private close(buf: Buffer, i: number): void {
    const top = this.depth - 1;
    const frame = this.frames[top];
    const captures = this.captures;
    if (captures.length > 0 && captures[captures.length - 1].depth === top + 1) {
      const capture = captures.pop()!;
      const value = this.captured(capture, buf, i + 1);
      if (capture.kind === C_PROBE) {
        if (isRowsValue([value], this.options)) {
          this.mode = M_ROWS;
          this.sink.truncate(0);
          for (const column of this.kept) column.length = 0;
          this.rows.push(value);
          this.role[top - 1] = ROWS;
          this.depth = top;
          return;
        }
        this.mode = M_NESTED;
      } else if (capture.kind === C_ROW) {
        this.rows.push(value);
      } else {
        const text = JSON.stringify(value);
        for (const f of capture.keeps) {
          this.kept[f][capture.node] = text;
        }
      }
    }
    const role = this.role[top];
    if (role === NODE) {
      this.closeNode(frame);
    } else if (role === CHILD_MAP) {
      if (frame.reorder) {
        const mark = this.frames[top - 1].childrenMark;
        reorderKeyedChildren(this.sink, this.sized, this.kept, frame.node, mark, frame.children);
      }
      frame.keys.clear();
      frame.children.length = 0;
    }
    this.depth = top;
  }

  /** Checks a node's fields once all are known (a later repeat of a key replaces an earlier value). */
  private closeNode(frame: Frame): void {
    const i = frame.node;
    const { nameField, sizeField, childrenField } = this.options;
    if (!frame.keyed && frame.nameKind === COLLECTION) {
      throw new EspalierError("SHAPE", say`the "${nameField}" of ${this.where(i)} must be text`, {
        line: frame.nameLine,
        column: frame.nameColumn,
      });
    }
    const sizeKind = frame.sizeKind;
    if (sizeKind === NUMBER) {
      const size = frame.size;
      if (!isSize(size)) {
        throw this.badSize(String(size), i, { line: frame.sizeLine, column: frame.sizeColumn });
      }
      this.sink.ownSize[i] = size;
      this.sized[i] = 1;
    } else if (sizeKind !== ABSENT && sizeKind !== NULL) {
      const shownSize = sizeKind === STRING ? quoted.value(frame.sizeText) : "a non-number";
      throw new EspalierError(
        "BAD_SIZE",
        say`the "${sizeField}" of ${this.where(i)} must be a number from 0 to 2^53 - 1, got ${shownSize}`,
        { line: frame.sizeLine, column: frame.sizeColumn },
      );
    }
    const childrenKind = frame.childrenKind;
    if (childrenKind === STRING || childrenKind === NUMBER || childrenKind === BOOLEAN) {
      throw new EspalierError(
        "SHAPE",
        say`the "${childrenField}" of ${this.where(i)} must be an array or an object keyed by child name`,
        { line: frame.childrenLine, column: frame.childrenColumn },
      );
    }
  }

  private startCapture(kind: number, depth: number, start: number, node: number, keeps: number[]): void {
    this.captures.push({ kind, depth, parts: [], start, node, keeps });
  }

  /** The value captured, whose last byte is before offset `end` of `buf`. */
  private captured(capture: Capture, buf: Buffer, end: number): unknown {
    capture.parts.push(buf.subarray(capture.start, end));
    // Already checked to be JSON by the tokenizer.
    return JSON.parse(Buffer.concat(capture.parts).toString("utf8"));
  }

  private growStack(): void {
    const role = new Uint8Array(this.role.length * 2);
    role.set(this.role);
    this.role = role;
    const isObject = new Uint8Array(this.isObject.length * 2);
    isObject.set(this.isObject);
    this.isObject = isObject;
  }

  // ---------------------------------------------------------------------------------------------------
  // Text and positions.

  /**
   * The string between the quotes at `q` and `e`; checks its escapes (RFC 8259 section 7) and returns the
   * text when `need` is set. Counts the multi-byte characters for columns.
   */
  private text(bytes: Uint8Array, q: number, e: number, absQ: number, need: boolean): string | undefined {
    let out: string | undefined;
    if (!this.strEscape) {
      if (need) out = this.strHigh ? utf8(bytes, q + 1, e) : latin1(bytes, q + 1, e);
    } else {
      out = this.unescape(bytes, q, e, absQ, need);
    }
    this.advance(bytes, q, e);
    return out;
  }

  /** Column bookkeeping after a string token. */
  private advance(bytes: Uint8Array, q: number, e: number): void {
    if (this.strHigh) this.lineAdjust += e + 1 - q - utf16Length(bytes, q, e + 1);
  }

  private unescape(bytes: Uint8Array, q: number, e: number, absQ: number, need: boolean): string | undefined {
    let out = "";
    let run = q + 1;
    for (let k = q + 1; k < e; k++) {
      if (bytes[k] !== 0x5c) continue;
      if (need && k > run) out += utf8(bytes, run, k);
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
    if (need && e > run) out += utf8(bytes, run, e);
    return need ? out : undefined;
  }

  /** A control character inside the string opening at `q`: first any bad escape before it. */
  private controlCharacter(bytes: Uint8Array, q: number, k: number, absQ: number): never {
    this.unescape(bytes, q, k, absQ, false);
    throw this.stringError(bytes, q, k, absQ, "a control character in a string must be escaped");
  }

  private stringError(bytes: Uint8Array, q: number, k: number, absQ: number, message: string): EspalierError {
    const column = absQ - this.lineStart - this.lineAdjust + utf16Length(bytes, q, k) + 1;
    return new EspalierError("PARSE_JSON", `invalid JSON: ${message}`, { line: this.line, column });
  }

  /** Column (UTF-16 units, 1-based) of absolute offset `abs` on the current line. */
  private columnAt(abs: number): number {
    return abs - this.lineStart - this.lineAdjust + 1;
  }

  private posAt(abs: number): SourcePos {
    return { line: this.line, column: this.columnAt(abs) };
  }

  private syntax(abs: number, message: string | MessagePart[]): EspalierError {
    return new EspalierError("PARSE_JSON", say`invalid JSON: ${message}`, this.posAt(abs));
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
      const kept = utf8(bytes, 0, length).trimEnd().length;
      const column = this.pendStart - this.lineStart - this.lineAdjust + kept + 1;
      return new EspalierError("PARSE_JSON", message, { line: this.line, column });
    }
    if (this.inWs) {
      const column = this.wsStart - this.wsLineStart - this.wsAdjust + 1;
      return new EspalierError("PARSE_JSON", message, { line: this.wsLine, column });
    }
    return new EspalierError("PARSE_JSON", message, this.posAt(this.base));
  }

  private where(i: number): MessagePart[] {
    return describeNode(this.sink.parentOf, this.sink.name, i);
  }

  private badSize(shownSize: string, i: number, pos: SourcePos | undefined): EspalierError {
    return new EspalierError(
      "BAD_SIZE",
      say`the size of ${this.where(i)} must be a number from 0 to 2^53 - 1, got ${shownSize}`,
      pos,
    );
  }

  private badTop(pos: SourcePos): EspalierError {
    if (this.mode === M_ROWS)
      return new EspalierError("SHAPE", "rows must be a top-level array of objects", pos);
    return new EspalierError("SHAPE", "the top level must be a node object or an array of them", pos);
  }

  private badRow(): EspalierError {
    const row = this.rows.length + 1;
    return new EspalierError("SHAPE", `row ${row} must be an object`, { row });
  }
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
 * How many UTF-16 units the WHATWG UTF-8 decoder makes of `bytes[s, e)`, invalid sequences included
 * (each maximal invalid subpart is one U+FFFD), so columns count as they do in the decoded text.
 */
function utf16Length(bytes: Uint8Array, s: number, e: number): number {
  let units = 0;
  let needed = 0;
  let seen = 0;
  let lower = 0x80;
  let upper = 0xbf;
  for (let k = s; k < e; k++) {
    const b = bytes[k];
    if (needed === 0) {
      if (b >= 0xc2 && b <= 0xdf) needed = 1;
      else if (b >= 0xe0 && b <= 0xef) {
        if (b === 0xe0) lower = 0xa0;
        if (b === 0xed) upper = 0x9f;
        needed = 2;
      } else if (b >= 0xf0 && b <= 0xf4) {
        if (b === 0xf0) lower = 0x90;
        if (b === 0xf4) upper = 0x8f;
        needed = 3;
      } else units++; // ASCII, or a byte no sequence starts with
      continue;
    }
    if (b < lower || b > upper) {
      // The sequence so far is one U+FFFD; this byte starts afresh.
      units++;
      needed = 0;
      seen = 0;
      lower = 0x80;
      upper = 0xbf;
      k--;
      continue;
    }
    lower = 0x80;
    upper = 0xbf;
    if (++seen === needed) {
      units += needed === 3 ? 2 : 1;
      needed = 0;
      seen = 0;
    }
  }
  return needed === 0 ? units : units + 1;
}

// Buffer's own decoders, without toString's checks and encoding lookup (a name costs one call).
interface Decoders {
  utf8Slice(start: number, end: number): string;
  latin1Slice(start: number, end: number): string;
}

function asBuffer(bytes: Uint8Array): Buffer & Decoders {
  const buf = bytes instanceof Buffer ? bytes : Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  return buf as Buffer & Decoders;
}

/** Invalid UTF-8 becomes U+FFFD, as the WHATWG decoder the in-memory path uses does it. */
function utf8(bytes: Uint8Array, s: number, e: number): string {
  return asBuffer(bytes).utf8Slice(s, e);
}

function latin1(bytes: Uint8Array, s: number, e: number): string {
  return asBuffer(bytes).latin1Slice(s, e);
}

function shown(c: number): MessagePart {
  if (c >= 0x21 && c < 0x7f) return quoted.value(String.fromCharCode(c));
  return `byte 0x${c.toString(16).padStart(2, "0")}`;
}
