import type { BytesAt } from "./load-options.js";
import { releasableMemory, releaseMemory } from "./releasable-memory.js";

/**
 * Longest input whose bytes a load keeps for a later version's (LoadOptions.keepForLaterVersion) when
 * that load cannot read them again: held, with where each row or node object lies, until that load
 * ends. Above it the later version is read as any input is (about 8 million rows of the benchmark's
 * table).
 */
export const MOST_KEPT_BYTES = 256 * 2 ** 20;

/**
 * Longest input whose places (rows, node objects) are kept for a later version that reads the input
 * again: offsets in 32 bits.
 */
const MOST_PLACED_BYTES = 2 ** 32 - 1;

/** Longest range read apart from the window (and at most a quarter of it). */
const ASIDE = 64 << 10;

const EMPTY = new Uint8Array(0);

/**
 * The load side of an input kept for a later version of it (a diff's OLD for its NEW, one after the
 * other): its bytes copied as they come, or (`readAgain`: the later load reads the input again,
 * LoadOptions.inputReadAgain) only counted. Places are kept in 32 bits, so an input read again is kept
 * up to 4 GiB, one whose bytes are copied up to MOST_KEPT_BYTES.
 */
export class BytesKeeper {
  /** The bytes copied so far; null when the later load reads the input again (or nothing is kept). */
  private bytes: Uint8Array | null;
  private used = 0;
  /** False once the input is longer than it can be kept. */
  keeping: boolean;

  constructor(inputBytes: number, readAgain: boolean) {
    this.keeping = inputBytes <= (readAgain ? MOST_PLACED_BYTES : MOST_KEPT_BYTES);
    this.bytes =
      this.keeping && !readAgain
        ? new Uint8Array(releasableMemory(Math.min(inputBytes, MOST_KEPT_BYTES)))
        : null;
  }

  /**
   * The next chunk of the input, copied when the bytes are kept (a stream may hand out the same memory
   * again); false when the input is now too long to keep (nothing is kept any more).
   */
  write(chunk: Uint8Array): boolean {
    if (!this.keeping) return false;
    const need = this.used + chunk.length;
    const bytes = this.bytes;
    if (need > (bytes === null ? MOST_PLACED_BYTES : MOST_KEPT_BYTES)) {
      this.drop();
      return false;
    }
    this.used = need;
    if (bytes === null) return true;
    let into = bytes;
    if (need > into.length) {
      into = new Uint8Array(releasableMemory(Math.min(MOST_KEPT_BYTES, Math.max(need, 2 * into.length))));
      into.set(bytes.subarray(0, need - chunk.length));
      releaseMemory(bytes.buffer);
      this.bytes = into;
    }
    into.set(chunk, need - chunk.length);
    return true;
  }

  /** Lets go of the bytes: nothing is kept. */
  drop(): void {
    this.keeping = false;
    if (this.bytes !== null) releaseMemory(this.bytes.buffer);
    this.bytes = null;
  }

  /** What the later load compares with: the bytes copied, or the input read again. */
  earlier(): EarlierBytes {
    return new EarlierBytes(this.bytes === null ? null : this.bytes.subarray(0, this.used));
  }
}

/**
 * An earlier version's input as a later load compares its own bytes with it: the bytes its load kept,
 * or the input read again (`readable`: a regular file, LoadOptions.earlierInput) a window at a time,
 * where keeping them would be fresh memory as big as the file.
 *
 * The window moves where the looks go on (`holds`, anchored: the next ones mostly a little past the
 * last, within a chunk of the later input), a quarter of it kept behind. A look out of it that is not
 * where the next ones will be (`apart`: a try at what may have moved) is read apart when short, the
 * window left where it is. A range longer than what a window holds is not compared.
 */
export class EarlierBytes {
  /** Bytes of the input read again at once (LoadOptions.earlierInput). */
  static windowBytes = 4 << 20;

  /** The bytes compared with, and where in the input they start and end (a read may come short). */
  window: Uint8Array = EMPTY;
  windowAt = 0;
  private windowEnd = 0;
  private source: BytesAt | null = null;
  private aside: Uint8Array = EMPTY;

  /** `bytes`: the input's bytes as its load kept them; null when it kept none. */
  constructor(private readonly bytes: Uint8Array | null) {}

  /** Whether the bytes can be compared with: kept, or read again through `readAgain`. */
  readable(readAgain: BytesAt | undefined): boolean {
    if (this.bytes !== null) {
      this.window = this.bytes;
      this.windowEnd = this.bytes.length;
      return true;
    }
    if (readAgain === undefined) return false;
    this.source = readAgain;
    this.window = new Uint8Array(EarlierBytes.windowBytes);
    this.windowAt = 0;
    this.windowEnd = 0;
    return true;
  }

  /** Makes `window` hold the input's bytes `[from, to)`, read again when it does not; whether it does. */
  holds(from: number, to: number): boolean {
    if (from >= this.windowAt && to <= this.windowEnd) return true;
    const source = this.source;
    if (source === null) return false;
    const size = this.window.length;
    const quarter = size >>> 2;
    if (to - from > size - quarter) return false;
    const at = Math.max(0, from - quarter);
    this.windowAt = at;
    this.windowEnd = at + source.read(this.window, 0, size, at);
    return to <= this.windowEnd;
  }

  /**
   * The input's bytes `[from, to)` without moving the window: a view of it when it holds them, else
   * read apart when short (null when not).
   */
  apart(from: number, to: number): Uint8Array | null {
    if (from >= this.windowAt && to <= this.windowEnd)
      return this.window.subarray(from - this.windowAt, to - this.windowAt);
    const source = this.source;
    if (source === null || to - from > Math.min(ASIDE, this.window.length >>> 2)) return null;
    if (this.aside.length === 0) this.aside = new Uint8Array(ASIDE);
    return source.read(this.aside, 0, to - from, from) < to - from ? null : this.aside.subarray(0, to - from);
  }

  /** Gives the memory of kept bytes back now; compared with no more. */
  release(): void {
    if (this.bytes !== null) releaseMemory(this.bytes.buffer);
    this.window = EMPTY;
    this.aside = EMPTY;
    this.source = null;
  }
}
