import { EspalierError } from "../errors.js";
import { readLimits } from "../load/read-limits.js";
import type { CliIO } from "./io.js";
import type { ReadBound } from "./read-bounded.js";
import { ioError } from "./read-input-stream.js";
import { unicodeEncoding } from "./unicode-encoding.js";

/**
 * Reads a named input ("-" is standard input) and decodes it: UTF-16 when it starts with a UTF-16
 * byte-order mark, UTF-8 otherwise (see {@link unicodeEncoding}). The byte-order mark is dropped; bytes
 * that do not decode become U+FFFD (the WHATWG decoder's replacement behaviour).
 */
/** A --focus-from file: a file or a pipe (`<(git diff --name-only)`), at most `maxFociBytes`. */
export const FOCI_BOUND: ReadBound = {
  maxBytes: readLimits.maxFociBytes,
  what: "the foci file",
  pipes: true,
};

export async function readInput(io: CliIO, name: string, bound?: ReadBound): Promise<string> {
  let bytes: Buffer;
  try {
    bytes = name === "-" ? await io.readStdin(bound) : await io.readFile(name, bound);
  } catch (err) {
    if (err instanceof EspalierError) throw err;
    throw ioError(name, err);
  }
  return new TextDecoder(unicodeEncoding(bytes), { ignoreBOM: false }).decode(bytes);
}
