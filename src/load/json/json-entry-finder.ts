import type { Buffer } from "node:buffer";
import type { SourcePos } from "../../errors.js";
import { JsonTokenizer } from "./json-tokenizer.js";

/** What to find in a JSON text: the `index`-th element (0-based) of a top-level array, or a top-level key. */
export type JsonEntry = { index: number } | { key: string };

/**
 * Finds where an entry of a JSON document starts, for a fault found after the document was parsed
 * whole (a graph: an adjacency map's entry, a row of rows): the element's first character, or the
 * key's opening quote (of its last occurrence, the one a parser keeps). Only an error pays for this
 * second reading; the text must be the one that parsed.
 */
class JsonEntryFinder extends JsonTokenizer {
  found: SourcePos | undefined;
  private elements = 0;

  constructor(private readonly entry: JsonEntry) {
    super();
  }

  protected open(i: number): void {
    this.element(this.base + i);
  }
  protected close(_buf: Buffer, _i: number): void {}
  protected nextItem(_top: number): void {}
  protected key(bytes: Uint8Array, q: number, e: number, absQ: number): void {
    if (this.depth !== 1 || !("key" in this.entry)) return;
    if (this.text(bytes, q, e, absQ) === this.entry.key) this.found = this.pos.at(absQ);
  }
  protected stringValue(_bytes: Uint8Array, _q: number, _e: number, absQ: number): void {
    this.element(absQ);
  }
  protected number(_bytes: Uint8Array, _s: number, _e: number, absS: number): void {
    this.element(absS);
  }
  protected word(_word: Uint8Array, absS: number): void {
    this.element(absS);
  }
  protected chunkEnd(_buf: Buffer): void {}

  /** A value starts at absolute offset `abs`: an element when it is directly inside the top level. */
  private element(abs: number): void {
    // Hooks see the depth before a container opens: directly inside the top level is depth 1.
    if (!("index" in this.entry) || this.found !== undefined || this.depth !== 1) return;
    if (this.elements++ === this.entry.index) this.found = this.pos.at(abs);
  }

  /** Reads the whole text; where the entry starts, or undefined. */
  find(bytes: Uint8Array): SourcePos | undefined {
    try {
      this.write(bytes);
      this.endTokens();
    } catch {
      // Read again, the text parsed the first time; a fault here only means nothing more is found.
    }
    return this.found;
  }
}

/** Where `entry` starts in the JSON document `bytes`; undefined when it has no such entry. */
export function findJsonEntry(bytes: Uint8Array, entry: JsonEntry): SourcePos | undefined {
  return new JsonEntryFinder(entry).find(bytes);
}
