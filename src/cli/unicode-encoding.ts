/** How an input's bytes are decoded. */
export type UnicodeEncoding = "utf-8" | "utf-16le" | "utf-16be";

/**
 * The encoding an input's first bytes announce: `FF FE` is UTF-16LE, `FE FF` UTF-16BE, anything else
 * (a UTF-8 byte-order mark or none) UTF-8. These are the marks the WHATWG Encoding Standard's "BOM
 * sniff" recognises (from memory); UTF-16 without a mark is not guessed at.
 */
export function unicodeEncoding(start: Uint8Array): UnicodeEncoding {
  if (start[0] === 0xff && start[1] === 0xfe) return "utf-16le";
  if (start[0] === 0xfe && start[1] === 0xff) return "utf-16be";
  return "utf-8";
}
