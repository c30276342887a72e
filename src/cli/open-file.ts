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
      unchanged(stat, await fsCall<Stats>(fstat, fd), bytes.length);
    } finally {
      await fsCall(close, fd);
    }
    return { size: stat.size, chunks: chunksOf(bytes) };
  }
  if (stat.isFile()) return { size: stat.size, chunks: fileChunks(fd, stat) };
  return { size: undefined, chunks: createReadStream("", { fd, highWaterMark: CHUNK }) };
}

/**
 * A regular file's chunks, checked at its end against the file as it was opened: a file written,
 * cut short or grown while it is read (a listing still being made, an artefact replaced in place) is
 * a mix of two versions, and read on it would give a tree no version of the file holds, exit 0.
 */
async function* fileChunks(fd: number, opened: Stats): AsyncGenerator<Uint8Array> {
  try {
    let length = 0;
    for (;;) {
      const buffer = Buffer.allocUnsafe(CHUNK);
      const bytesRead = await fsCall<number>(read, fd, buffer, 0, CHUNK, null);
      if (bytesRead === 0) break;
      length += bytesRead;
      yield bytesRead === CHUNK ? buffer : buffer.subarray(0, bytesRead);
    }
    unchanged(opened, await fsCall<Stats>(fstat, fd), length);
  } finally {
    await fsCall(close, fd);
  }
}

/**
 * Throws when the file changed while it was read: its size or modification time is not what it was
 * when opened, or other than its size at open was read. A file whose size said 0 (procfs and other
 * generated files) is read to its end as it is.
 */
function unchanged(opened: Stats, now: Stats, length: number): void {
  if (
    now.size === opened.size &&
    now.mtimeMs === opened.mtimeMs &&
    (length === opened.size || opened.size === 0)
  )
    return;
  const count = (n: number) => n.toLocaleString("en-US");
  throw new Error(
    `it changed while espalier read it (${count(opened.size)} bytes when opened, ${count(now.size)} now, ${count(length)} read); run again once it is written`,
  );
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
