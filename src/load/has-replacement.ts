import { Buffer } from "node:buffer";
import { asBuffer } from "../model/buffer-codecs.js";

/** U+FFFD in UTF-8 (RFC 3629): what every sequence that is not UTF-8 reads as. */
const REPLACEMENT = Buffer.from([0xef, 0xbf, 0xbd]);

/**
 * Whether `bytes[start, end)` writes U+FFFD itself: a name so written and one written in bytes that
 * are not UTF-8 read alike (see written-paths.ts). The runtime's byte search, over those bytes only.
 */
export function hasReplacement(bytes: Uint8Array, start: number, end: number): boolean {
  return (
    end - start >= REPLACEMENT.length && asBuffer(bytes).subarray(start, end).indexOf(REPLACEMENT) !== -1
  );
}
