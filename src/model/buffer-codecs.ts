import { Buffer } from "node:buffer";

/**
 * Node's Buffer carries its own codecs, `utf8Slice`, `latin1Slice` and `utf8Write`, which `toString` and
 * `write` call after checking their arguments and looking the encoding up by name. They are not in
 * Node's documentation, so they may go away: this module is the one place that reaches for them, and
 * falls back to the documented `toString` and `write` (same results, a little slower) when they are
 * missing. tests/model/buffer-codecs.test.ts says when this Node no longer has them.
 */
interface Codecs {
  utf8Slice(this: Uint8Array, start: number, end: number): string;
  latin1Slice(this: Uint8Array, start: number, end: number): string;
  utf8Write(this: Uint8Array, text: string, offset: number, length: number): number;
}

/** The codecs, each taking the bytes as its first argument. */
export interface ByteCodecs {
  /** `bytes[start, end)` decoded as UTF-8 (each invalid sequence becomes U+FFFD, as WHATWG decodes). */
  utf8Slice(bytes: Buffer, start: number, end: number): string;
  /** `bytes[start, end)` as one character per byte. */
  latin1Slice(bytes: Buffer, start: number, end: number): string;
  /** Writes `text` as UTF-8 at `offset`, at most `length` bytes of whole characters; the bytes written. */
  utf8Write(bytes: Buffer, text: string, offset: number, length: number): number;
}

const internal = Buffer.prototype as unknown as Partial<Codecs>;

/** Whether this Node's Buffer has the undocumented codecs. */
export const hasInternalCodecs =
  typeof internal.utf8Slice === "function" &&
  typeof internal.latin1Slice === "function" &&
  typeof internal.utf8Write === "function";

/** The codecs through Buffer's own methods (`internal`) or through toString and write. */
export function byteCodecs(useInternal: boolean): ByteCodecs {
  if (useInternal) {
    const { utf8Slice, latin1Slice, utf8Write } = internal as Codecs;
    return {
      utf8Slice: (bytes, start, end) => utf8Slice.call(bytes, start, end),
      latin1Slice: (bytes, start, end) => latin1Slice.call(bytes, start, end),
      utf8Write: (bytes, text, offset, length) => utf8Write.call(bytes, text, offset, length),
    };
  }
  return {
    utf8Slice: (bytes, start, end) => bytes.toString("utf8", start, end),
    latin1Slice: (bytes, start, end) => bytes.toString("latin1", start, end),
    utf8Write: (bytes, text, offset, length) => bytes.write(text, offset, length, "utf8"),
  };
}

/** The fastest codecs this Node has. */
export const codecs: ByteCodecs = byteCodecs(hasInternalCodecs);

/** The same bytes as a Buffer (no copy). */
export function asBuffer(bytes: Uint8Array): Buffer {
  return bytes instanceof Buffer ? bytes : Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength);
}
