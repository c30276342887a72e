import { open } from "node:fs/promises";
import type { StreamedInput } from "./io.js";

/** The size of a chunk read from a file; a regular file no bigger is read in one call. */
const CHUNK = 1 << 20;

/**
 * A named file read in 1 MiB chunks, with its size when it is a regular file; a directory is EISDIR. A
 * regular file of at most one chunk is read whole in one call and handed on as that one chunk (what the
 * stream would hand on), so a small run never starts a stream: a good part of its start (issue 14).
 */
export async function openFile(name: string): Promise<StreamedInput> {
  const handle = await open(name, "r");
  const stat = await handle.stat();
  if (stat.isDirectory()) {
    await handle.close();
    throw Object.assign(new Error(`${name} is a directory`), { code: "EISDIR" });
  }
  if (stat.isFile() && stat.size <= CHUNK) {
    let bytes: Buffer;
    try {
      bytes = await handle.readFile();
    } finally {
      await handle.close();
    }
    return { size: stat.size, chunks: chunksOf(bytes) };
  }
  return {
    size: stat.isFile() ? stat.size : undefined,
    chunks: handle.createReadStream({ highWaterMark: CHUNK }),
  };
}

/** The bytes as one chunk; none for an empty file, as a stream gives none. */
async function* chunksOf(bytes: Buffer): AsyncIterable<Uint8Array> {
  if (bytes.length > 0) yield bytes;
}
