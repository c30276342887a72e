import { close, createReadStream, fstat, open, read, type Stats } from "node:fs";
import { fsCall } from "./fs-call.js";
import type { StreamedInput } from "./io.js";

/** The size of a chunk read from a file; a regular file no bigger is read in one call. */
const CHUNK = 1 << 20;

/**
 * A named file read in 1 MiB chunks, with its size when it is a regular file; a directory is EISDIR. A
 * regular file of at most one chunk is read whole in one call and handed on as that one chunk (what the
 * stream would hand on), so a small run never starts a stream: a good part of its start (issue 14).
 * Through `node:fs`'s callbacks, not `node:fs/promises`, whose module a start would otherwise load.
 */
export async function openFile(name: string): Promise<StreamedInput> {
  const fd = await fsCall<number>(open, name, "r");
  let stat: Stats;
  try {
    stat = await fsCall(fstat, fd);
  } catch (error) {
    await fsCall(close, fd);
    throw error;
  }
  if (stat.isDirectory()) {
    await fsCall(close, fd);
    throw Object.assign(new Error(`${name} is a directory`), { code: "EISDIR" });
  }
  if (stat.isFile() && stat.size <= CHUNK) {
    let bytes: Buffer;
    try {
      bytes = await readAll(fd, stat.size);
    } finally {
      await fsCall(close, fd);
    }
    return { size: stat.size, chunks: chunksOf(bytes) };
  }
  return {
    size: stat.isFile() ? stat.size : undefined,
    chunks: createReadStream("", { fd, highWaterMark: CHUNK }),
  };
}

/** The file's bytes from where `fd` stands to its end; `size` is what it is expected to hold. */
async function readAll(fd: number, size: number): Promise<Buffer> {
  // One byte more than expected, so a file that grew since fstat is read to its end too.
  let buffer = Buffer.allocUnsafe(size + 1);
  let length = 0;
  for (;;) {
    if (length === buffer.length) {
      const grown = Buffer.allocUnsafe(buffer.length * 2);
      buffer.copy(grown, 0, 0, length);
      buffer = grown;
    }
    const bytesRead = await fsCall<number>(read, fd, buffer, length, buffer.length - length, null);
    if (bytesRead === 0) return buffer.subarray(0, length);
    length += bytesRead;
  }
}

/** The bytes as one chunk; none for an empty file, as a stream gives none. */
async function* chunksOf(bytes: Buffer): AsyncIterable<Uint8Array> {
  if (bytes.length > 0) yield bytes;
}
