import type { Buffer } from "node:buffer";
import { JsonTokenizer } from "./json-tokenizer.js";

/** A key of a JSON document's top-level object given more than once: the first such, its line, how many repeats. */
export interface RepeatedKeys {
  key: string;
  line: number;
  repeats: number;
}

/**
 * Reads a JSON text parsed whole (JSON.parse, which keeps the last value of a repeated key) once more
 * for the keys of its top-level object that repeat: what the parse dropped without a word.
 */
class RepeatedTopKeyFinder extends JsonTokenizer {
  private readonly seen = new Set<string>();
  found: RepeatedKeys | undefined;

  protected open(_i: number): void {}
  protected close(_buf: Buffer, _i: number): void {}
  protected nextItem(_top: number): void {}
  protected key(bytes: Uint8Array, q: number, e: number, absQ: number): void {
    if (this.depth !== 1) return;
    const key = this.text(bytes, q, e, absQ);
    if (!this.seen.has(key)) this.seen.add(key);
    else if (this.found === undefined) this.found = { key, line: this.pos.at(absQ).line ?? 1, repeats: 1 };
    else this.found.repeats++;
  }
  protected stringValue(_bytes: Uint8Array, _q: number, _e: number, _absQ: number): void {}
  protected number(_bytes: Uint8Array, _s: number, _e: number, _absS: number): void {}
  protected word(_word: Uint8Array, _absS: number): void {}
  protected chunkEnd(_buf: Buffer): void {}

  find(bytes: Uint8Array): RepeatedKeys | undefined {
    try {
      this.write(bytes);
      this.endTokens();
    } catch {
      // The text parsed once: a fault here only means nothing more is found.
    }
    return this.found;
  }
}

/** The keys of the top-level object of the JSON document `bytes` that repeat, or undefined when none does. */
export function repeatedTopKeys(bytes: Uint8Array): RepeatedKeys | undefined {
  return new RepeatedTopKeyFinder().find(bytes);
}
