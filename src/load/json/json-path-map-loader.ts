import type { Buffer } from "node:buffer";
import { EspalierError, type MessagePart, quoted, say } from "../../errors.js";
import type { LinkedNodes } from "../../model/linked-nodes.js";
import type { LoadOptions } from "../load-options.js";
import { linkPathMap } from "../table/link-table.js";
import { withNotes } from "../with-notes.js";
import { JsonTokenizer } from "./json-tokenizer.js";
import { C_ROW, Captures } from "./value-capture.js";

/**
 * A JSON object keyed by path whose values are records (a lock file's `packages`: `""` for the root,
 * `node_modules/a/node_modules/b` below it), read as rows linked by path: the key is the row's path
 * ("/"-separated, as written), the record its other fields. The map is the top-level object (`field`
 * "") or the value of `field` in the top-level object; everything else is read only to check it is
 * JSON. Each record is parsed on its own.
 */
export class JsonPathMapLoader extends JsonTokenizer {
  private readonly options: LoadOptions;
  private readonly field: string;
  private readonly captures: Captures;
  private readonly keys: string[] = [];
  private readonly records: Record<string, unknown>[] = [];
  // Depth of the map's object once it opened; -1 before.
  private mapDepth = -1;
  private nextIsMap = false;
  private currentKey = "";

  constructor(options: LoadOptions, field: string) {
    super(options.limits);
    this.options = options;
    this.captures = new Captures(this.maxTokenBytes);
    this.field = field;
    this.nextIsMap = field === "";
  }

  /** Ends the input; the nodes, ready for `buildTree`. */
  end(): LinkedNodes {
    this.endTokens();
    if (this.mapDepth < 0) {
      throw new EspalierError(
        "FIELD_MISSING",
        say`the top-level object has no object ${quoted.name(this.field)} keyed by path`,
      );
    }
    return withNotes(linkPathMap(this.keys, this.records, this.options, this.field), this.notUtf8Notes());
  }

  protected open(i: number, object: boolean): void {
    const depth = this.depth;
    if (this.nextIsMap && depth === (this.field === "" ? 0 : 1)) {
      this.nextIsMap = false;
      if (!object)
        throw this.notAnObject(say`the ${quoted.name(this.field)} field must be an object keyed by path`);
      this.mapDepth = depth;
      return;
    }
    if (this.mapDepth >= 0 && depth === this.mapDepth + 1) {
      if (!object)
        throw this.notAnObject(say`the value of the path ${quoted.path(this.currentKey)} must be an object`);
      this.captures.start(C_ROW, depth + 1, i, -1, []);
    }
  }

  protected close(buf: Buffer, i: number): void {
    const capture = this.captures.closing(this.depth);
    if (capture) {
      this.keys.push(this.currentKey);
      this.records.push(this.captures.value(capture, buf, i + 1) as Record<string, unknown>);
    }
    if (this.depth - 1 === this.mapDepth) this.mapDepth = Number.POSITIVE_INFINITY;
  }

  protected nextItem(): void {}

  protected key(bytes: Uint8Array, q: number, e: number, absQ: number): void {
    const top = this.depth - 1;
    if (top === this.mapDepth) this.currentKey = this.text(bytes, q, e, absQ);
    else if (top === 0 && this.field !== "" && this.mapDepth < 0)
      this.nextIsMap = this.text(bytes, q, e, absQ) === this.field;
  }

  protected stringValue(): void {
    this.scalar();
  }

  protected number(): void {
    this.scalar();
  }

  protected word(): void {
    this.scalar();
  }

  protected chunkEnd(buf: Buffer): void {
    this.captures.chunkEnd(buf, this.pos.line);
  }

  private scalar(): void {
    if (this.nextIsMap && this.depth === (this.field === "" ? 0 : 1))
      throw this.notAnObject(say`the ${quoted.name(this.field)} field must be an object keyed by path`);
    if (this.mapDepth >= 0 && this.depth === this.mapDepth + 1)
      throw this.notAnObject(say`the value of the path ${quoted.path(this.currentKey)} must be an object`);
    this.nextIsMap = false;
  }

  private notAnObject(message: MessagePart[]): EspalierError {
    return new EspalierError("SHAPE", message, { line: this.pos.line });
  }
}
