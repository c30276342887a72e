import { Buffer } from "node:buffer";
import { readLimits, tooLong } from "../read-limits.js";

/** What a captured value is for. */
export const C_PROBE = 0; // the first element of a top-level array, to tell rows from nodes
export const C_KEEP = 1; // an object or array kept as a field's text
export const C_ROW = 2; // a row of a table

/** An object or array whose raw bytes are kept as it is read, across chunks, to be parsed whole. */
export interface Capture {
  kind: number;
  /** Nesting depth of the captured container; its end ends the capture. */
  depth: number;
  parts: Uint8Array[];
  /** Bytes in `parts`. */
  bytes: number;
  /** Where the capture starts in the current chunk. */
  start: number;
  /** The node a kept field belongs to. */
  node: number;
  /** Indices into keepFields, for a kept field. */
  keeps: number[];
  /** The line it starts on. */
  line: number;
}

/**
 * The values being captured, innermost last. Only objects and arrays the tokenizer has already checked
 * are captured, so each parses.
 */
export class Captures {
  readonly open: Capture[] = [];

  /** `maxBytes`: the most one captured value may hold (read-limits.ts maxTokenBytes). */
  constructor(private readonly maxBytes = readLimits.maxTokenBytes) {}

  /** Starts capturing a container that opens at offset `start` of the current chunk, at `depth`. */
  start(kind: number, depth: number, start: number, node: number, keeps: number[], line = 0): void {
    this.open.push({ kind, depth, parts: [], bytes: 0, start, node, keeps, line });
  }

  /**
   * The end of a chunk: each open capture keeps the rest of it (copied: chunks are not kept). A value
   * past `maxBytes` is LIMIT_EXCEEDED at `line`, so an endless row or kept field cannot fill memory.
   */
  chunkEnd(buf: Buffer, line: number): void {
    for (const capture of this.open) {
      if (capture.start < buf.length) {
        capture.parts.push(Uint8Array.prototype.slice.call(buf, capture.start));
        capture.bytes += buf.length - capture.start;
        if (capture.bytes > this.maxBytes)
          throw tooLong("a value kept whole (a row, or a field kept for a label)", this.maxBytes, { line });
      }
      capture.start = 0;
    }
  }

  /** The innermost capture, taken off the list, when it is the container at `depth` that is closing. */
  closing(depth: number): Capture | undefined {
    const open = this.open;
    return open.length > 0 && open[open.length - 1].depth === depth ? open.pop() : undefined;
  }

  /** The value of `capture`, whose last byte is before offset `end` of `buf`. */
  value(capture: Capture, buf: Buffer, end: number): unknown {
    capture.parts.push(buf.subarray(capture.start, end));
    return JSON.parse(Buffer.concat(capture.parts).toString("utf8"));
  }
}
