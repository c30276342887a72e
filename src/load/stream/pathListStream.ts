import { Buffer } from "node:buffer";
import type { LinkedNodes } from "../../model/build.js";
import { PathListReader } from "../pathListReader.js";
import type { LoadOptions } from "../types.js";

/**
 * A path list read from a byte stream: each chunk's whole lines are decoded as one piece of text and fed
 * to {@link PathListReader}; the bytes after a chunk's last "\n" wait for the next chunk. A "\n" byte is
 * never inside a multi-byte UTF-8 character, so a character (or a "\r\n") cut between chunks is whole
 * again when decoded.
 */
export async function pathListStream(
  chunks: AsyncIterable<Uint8Array>,
  options: LoadOptions,
): Promise<LinkedNodes> {
  const reader = new PathListReader(options);
  let waiting: Uint8Array[] = [];
  for await (const chunk of chunks) {
    const last = chunk.lastIndexOf(0x0a);
    if (last === -1) {
      waiting.push(chunk);
      continue;
    }
    const bytes = waiting.length > 0 ? Buffer.concat([...waiting, chunk]) : chunk;
    const end = bytes.length - (chunk.length - last - 1);
    const text = decode(bytes, end);
    reader.lines(text, 0, text.length);
    waiting = last + 1 < chunk.length ? [chunk.subarray(last + 1)] : [];
  }
  const bytes = Buffer.concat(waiting);
  const rest = decode(bytes, bytes.length);
  reader.lines(rest, 0, rest.length);
  return reader.finish(options.rootName);
}

/** Invalid UTF-8 becomes U+FFFD, as the WHATWG decoder the in-memory path uses does it. */
function decode(bytes: Uint8Array, end: number): string {
  const buf = bytes instanceof Buffer ? bytes : Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  return buf.toString("utf8", 0, end);
}
