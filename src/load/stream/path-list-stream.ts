import { Buffer } from "node:buffer";
import type { LinkedNodes } from "../../model/linked-nodes.js";
import type { LoadOptions } from "../load-options.js";
import { PathListByteReader } from "../path-list-byte-reader.js";

/**
 * A path list read from a byte stream: each chunk's whole lines go to {@link PathListByteReader} as they
 * are, undecoded and uncopied. A line cut between chunks is joined (its bytes only) before it is read. A
 * "\n" byte is never inside a multi-byte UTF-8 character, so a character (or a "\r\n") cut between
 * chunks is whole again in the joined line.
 */
export async function pathListStream(
  chunks: AsyncIterable<Uint8Array>,
  options: LoadOptions,
): Promise<LinkedNodes> {
  const reader = new PathListByteReader(options);
  // The start of a line cut by the end of a chunk, in pieces.
  let waiting: Buffer[] = [];
  for await (const piece of chunks) {
    const chunk = asBuffer(piece);
    let from = 0;
    if (waiting.length > 0) {
      const first = chunk.indexOf(0x0a);
      if (first === -1) {
        waiting.push(chunk);
        continue;
      }
      waiting.push(chunk.subarray(0, first + 1));
      const line = Buffer.concat(waiting);
      reader.lines(line, 0, line.length);
      waiting = [];
      from = first + 1;
    }
    const last = chunk.lastIndexOf(0x0a);
    if (last < from) {
      if (from < chunk.length) waiting.push(chunk.subarray(from));
      continue;
    }
    reader.lines(chunk, from, last + 1);
    if (last + 1 < chunk.length) waiting.push(chunk.subarray(last + 1));
  }
  const rest = Buffer.concat(waiting);
  reader.lines(rest, 0, rest.length);
  return reader.finish(options.rootName);
}

function asBuffer(bytes: Uint8Array): Buffer {
  return bytes instanceof Buffer ? bytes : Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength);
}
