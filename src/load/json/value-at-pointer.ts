import type { Buffer } from "node:buffer";
import { EspalierError, quoted, quotedList, type SourcePos, say } from "../../errors.js";
import { arrayIndex, type PointerTokens, pointerPrefix } from "../json-pointer.js";
import type { ReadLimits } from "../read-limits.js";
import { JsonTokenizer } from "./json-tokenizer.js";

const SPACE = 0x20;
const NEWLINE = 0x0a;
/** How many of a container's keys a "has no member" message lists. */
const KEYS_LISTED = 12;

/**
 * Finds the value a JSON Pointer (RFC 6901) refers to as a JSON text streams past, and turns every byte
 * outside it into a space (line feeds stay): the loaders then read that value as the whole document
 * (RFC 8259 section 2 allows blanks around it), with the same code as ever, and every line they name in
 * an error is the file's own line. (A column on the line the value starts on counts each blanked byte
 * of a non-ASCII character before it as one column.)
 *
 * The whole text is still tokenized, so a syntax error anywhere is PARSE_JSON at its place. A pointer
 * that refers to no value is FIELD_MISSING where the path stops, naming the keys or the length found
 * there. A key the pointer passes through that appears twice in its object is SHAPE at the second: a
 * JSON parser keeps the last (common practice, no source) while this reading would have kept the first.
 */
class PointerLocator extends JsonTokenizer {
  /** Absolute offsets of the value found: from `start` up to (not including) `end`. */
  start = -1;
  end = -1;
  /** Level of the innermost open container on the path (the value of the first `onPath` tokens). */
  private onPath = -1;
  /** The next value to start is the value of the first `onPath + 1` tokens. */
  private expect = false;
  /** The container level the found value opened at (when it is an object or array). */
  private foundLevel = -1;
  /** Per level on the path: the index of the current element (arrays). */
  private readonly index: number[] = [];
  /** Per level on the path: whether its token matched a member already (objects). */
  private readonly matched: boolean[] = [];
  /** The container on the path where the value is still looked for: its first keys, and its members. */
  private keys: string[] = [];
  private members = 0;

  constructor(
    private readonly tokens: PointerTokens,
    private readonly pointer: string,
    limits?: Partial<ReadLimits>,
  ) {
    super(limits);
  }

  protected open(i: number, object: boolean): void {
    const level = this.depth;
    if (!this.valueStarts(this.base + i)) return;
    this.onPath = level;
    if (level === this.tokens.length) {
      this.foundLevel = level;
      return;
    }
    this.index[level] = 0;
    this.matched[level] = false;
    this.keys = [];
    this.members = 0;
    const token = this.tokens[level];
    if (!object && arrayIndex(token) === undefined) {
      throw new EspalierError(
        "FIELD_MISSING",
        say`--start-at ${this.pointer}: ${this.where(level)} is an array, and ${quoted.name(token)} is no index of one (0, 1, 2 and so on)`,
        this.pos.at(this.base + i),
        { option: "--start-at" },
      );
    }
    this.expect = !object && arrayIndex(token) === 0;
  }

  protected close(_buf: Buffer, i: number): void {
    const level = this.depth - 1;
    this.expect = false;
    if (level !== this.onPath) return;
    this.onPath = level - 1;
    if (level === this.foundLevel) {
      this.end = this.base + i + 1;
      this.foundLevel = -1;
      return;
    }
    if (this.start >= 0) return;
    // The container the path goes on in ends without the next value.
    const token = this.tokens[level];
    const what =
      arrayIndex(token) !== undefined
        ? say`${this.where(level)} is an array of ${this.members} ${this.members === 1 ? "element" : "elements"}, with no index ${token}`
        : say`${this.where(level)} has no member ${quoted.name(token)} (its keys: ${quotedList("name", this.keys, KEYS_LISTED)}${this.members > this.keys.length ? ` and ${this.members - this.keys.length} more` : ""})`;
    throw new EspalierError(
      "FIELD_MISSING",
      say`--start-at ${this.pointer}: ${what}`,
      this.pos.at(this.base + i),
      {
        option: "--start-at",
      },
    );
  }

  protected nextItem(top: number): void {
    if (top !== this.onPath || this.start >= 0 || top >= this.tokens.length) return;
    this.index[top]++;
    this.expect = arrayIndex(this.tokens[top]) === this.index[top];
  }

  protected key(bytes: Uint8Array, q: number, e: number, absQ: number): void {
    const level = this.depth - 1;
    if (level !== this.onPath || level >= this.tokens.length) return;
    const key = this.text(bytes, q, e, absQ);
    if (this.start < 0 && this.keys.length < KEYS_LISTED) this.keys.push(key);
    if (key !== this.tokens[level]) return;
    if (this.matched[level]) {
      throw new EspalierError(
        "SHAPE",
        say`--start-at ${this.pointer}: the key ${quoted.name(key)} appears twice in ${this.where(level)}; a JSON parser keeps the last, this reading found the first: rename one`,
        this.pos.at(absQ),
        { option: "--start-at" },
      );
    }
    this.matched[level] = true;
    this.expect = true;
  }

  protected stringValue(_bytes: Uint8Array, q: number, e: number, absQ: number): void {
    this.scalar(absQ, absQ + (e - q) + 1);
  }
  protected number(_bytes: Uint8Array, s: number, e: number, absS: number): void {
    this.scalar(absS, absS + (e - s));
  }
  protected word(word: Uint8Array, absS: number): void {
    this.scalar(absS, absS + word.length);
  }
  protected chunkEnd(_buf: Buffer): void {}

  /** A scalar `[s, e)`: the value found, or where a path that goes on past it stops. */
  private scalar(s: number, e: number): void {
    if (!this.valueStarts(s)) return;
    const count = this.onPath + 1;
    if (count === this.tokens.length) {
      this.end = e;
      this.scalarPos = this.pos.at(s);
      return;
    }
    throw new EspalierError(
      "FIELD_MISSING",
      say`--start-at ${this.pointer}: ${this.where(count)} is a single value (no object or array), so ${quoted.name(this.tokens[count])} is not in it`,
      this.pos.at(s),
      { option: "--start-at" },
    );
  }

  /**
   * A value starts at absolute offset `abs`: whether it is the next one on the path (the document's
   * value always is), noting its start when it is the one the whole pointer refers to.
   */
  private valueStarts(abs: number): boolean {
    const inPath = this.depth === 0 || this.depth - 1 === this.onPath;
    const next = inPath && (this.depth === 0 || this.expect);
    this.expect = false;
    if (this.start >= 0) return false;
    if (inPath && this.depth > 0) this.members++;
    if (!next) return false;
    if (this.depth === this.tokens.length) this.start = abs;
    return true;
  }

  /** `the document`, or `/data/items` (the value the first `count` tokens refer to). */
  private where(count: number): string {
    return count === 0 ? "the document" : pointerPrefix(this.tokens, count);
  }

  /**
   * Up to where (absolute offset) every value start is known: all that was read, less a token cut by
   * the end of the last chunk (its start is reported only when it ends).
   */
  known(): number {
    const cut = this.pendingFrom();
    return cut >= 0 ? cut : this.base;
  }

  /** Where the value found starts when it is a scalar (no object or array). */
  private scalarPos: SourcePos | undefined;

  /**
   * Ends the text: it must be one whole JSON value. With `tree`, a pointer to a scalar is SHAPE at it:
   * a lone value holds no hierarchy, and a one-node tree with exit 0 would hide the mistake.
   */
  finish(tree: boolean): void {
    this.endTokens();
    if (!tree || this.scalarPos === undefined) return;
    throw new EspalierError(
      "SHAPE",
      say`--start-at ${this.pointer} refers to a single value (no object or array), which holds no tree: point at the object or array that holds it${this.tokens.length > 1 ? ` (${this.where(this.tokens.length - 1)})` : ""}`,
      this.scalarPos,
      { option: "--start-at" },
    );
  }
}

/**
 * The value `tokens` refers to, out of a JSON text arriving in `chunks`: the same chunks with every byte
 * outside that value a space (line feeds kept). The chunks are changed in place. With `tree` (the
 * loaders), a pointer to a scalar is SHAPE once the text has ended.
 */
export async function* valueAtPointer(
  chunks: AsyncIterable<Uint8Array>,
  tokens: PointerTokens,
  pointer: string,
  limits?: Partial<ReadLimits>,
  tree = false,
): AsyncGenerator<Uint8Array> {
  const locator = new PointerLocator(tokens, pointer, limits);
  // Chunks read but not yet passed on: a token cut at a chunk's end may turn out to be the value.
  const held: Uint8Array[] = [];
  let at = 0;
  for await (const chunk of chunks) {
    locator.write(chunk);
    held.push(chunk);
    const known = locator.known();
    while (held.length > 0 && at + held[0].length <= known) {
      const next = held.shift()!;
      blankOutside(next, at, locator.start, locator.end);
      at += next.length;
      yield next;
    }
  }
  locator.finish(tree);
  for (const next of held) {
    blankOutside(next, at, locator.start, locator.end);
    at += next.length;
    yield next;
  }
}

/** {@link valueAtPointer} over a whole text held as bytes, changed in place. */
export function valueAtPointerInBytes(
  bytes: Uint8Array,
  tokens: PointerTokens,
  pointer: string,
  limits?: Partial<ReadLimits>,
  tree = false,
): Uint8Array {
  const locator = new PointerLocator(tokens, pointer, limits);
  locator.write(bytes);
  locator.finish(tree);
  blankOutside(bytes, 0, locator.start, locator.end);
  return bytes;
}

/**
 * Blanks the bytes of `chunk` (which starts at absolute offset `at`) outside `[start, end)`; `start` -1:
 * not found yet (all of the chunk goes), `end` -1: not ended yet (all from `start` on stays).
 */
function blankOutside(chunk: Uint8Array, at: number, start: number, end: number): void {
  const keepFrom = start < 0 ? chunk.length : Math.min(Math.max(start - at, 0), chunk.length);
  const keepTo =
    start < 0 ? chunk.length : end < 0 ? chunk.length : Math.min(Math.max(end - at, 0), chunk.length);
  blank(chunk, 0, keepFrom);
  blank(chunk, keepTo, chunk.length);
}

function blank(chunk: Uint8Array, from: number, to: number): void {
  for (let k = from; k < to; k++) if (chunk[k] !== NEWLINE) chunk[k] = SPACE;
}
