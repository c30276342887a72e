import { Buffer } from "node:buffer";
import type { GraphNodes } from "../../model/graph-nodes.js";
import { EdgeListReader } from "../edge-list.js";
import type { LoadOptions } from "../load-options.js";

/**
 * An edge list read from a byte stream: each chunk's whole lines go to {@link EdgeListReader} as they
 * are; a line cut between chunks is joined (its bytes only) before it is read.
 */
export async function edgeListStream(
  chunks: AsyncIterable<Uint8Array>,
  options: Pick<LoadOptions, "maxNodes" | "rootName" | "inputBytes">,
): Promise<GraphNodes> {
  const reader = new EdgeListReader(options);
  let waiting: Buffer[] = [];
  for await (const piece of chunks) {
    const chunk = Buffer.from(piece.buffer, piece.byteOffset, piece.byteLength);
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
    // Up to and with the last "\n": a blank line just before it is a line too.
    reader.lines(chunk, from, last + 1);
    if (last + 1 < chunk.length) waiting.push(chunk.subarray(last + 1));
  }
  const rest = Buffer.concat(waiting);
  if (rest.length > 0) reader.lines(rest, 0, rest.length);
  return reader.finish();
}
