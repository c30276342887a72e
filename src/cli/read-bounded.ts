import { close, open, read, type Stats, stat } from "node:fs";
import { EspalierError } from "../errors.js";
import { fsCall } from "./fs-call.js";

/** How much of a named file may be read, and what it may be. */
export interface ReadBound {
  /** Most bytes read; one more is LIMIT_EXCEEDED. */
  maxBytes: number;
  /** What the file is, in messages: "the config", "the foci file". */
  what: string;
  /** Whether a pipe or socket will do (foci from another process); else only a regular file. */
  pipes: boolean;
}

/**
 * Reads a named file of bounded size. It is looked at before it is opened (links followed): a device
 * (`/dev/zero`, a terminal), a folder or, unless `pipes`, a pipe is refused with IO, so a committed
 * `.espalier.yaml` that links to a device or a named pipe cannot hang a CI job; past `maxBytes` it is
 * LIMIT_EXCEEDED, so an endless pipe cannot fill memory. Errors name the file.
 */
export async function readBounded(path: string, bound: ReadBound): Promise<Buffer> {
  const kind = await fsCall<Stats>(stat, path);
  if (kind.isDirectory()) throw Object.assign(new Error(`${path} is a directory`), { code: "EISDIR" });
  if (!kind.isFile() && !(bound.pipes && (kind.isFIFO() || kind.isSocket()))) {
    throw new EspalierError(
      "IO",
      `${bound.what} ${path} is ${kind.isCharacterDevice() || kind.isBlockDevice() ? "a device" : "not a regular file"}; espalier reads it only from ${bound.pipes ? "a file or a pipe" : "a regular file"}`,
      { file: path },
    );
  }
  const fd = await fsCall<number>(open, path, "r");
  try {
    const parts: Buffer[] = [];
    let length = 0;
    for (;;) {
      const chunk = Buffer.allocUnsafe(Math.min(1 << 20, bound.maxBytes + 1 - length));
      const bytesRead = await fsCall<number>(read, fd, chunk, 0, chunk.length, null);
      if (bytesRead === 0) break;
      parts.push(chunk.subarray(0, bytesRead));
      length += bytesRead;
      if (length > bound.maxBytes) throw tooBig(path, bound);
    }
    return Buffer.concat(parts, length);
  } finally {
    await fsCall(close, fd);
  }
}

/** Reads a stream (standard input) of bounded size: past `maxBytes` it is LIMIT_EXCEEDED. */
export async function readStreamBounded(
  chunks: AsyncIterable<Uint8Array> | Iterable<Uint8Array>,
  name: string,
  bound: ReadBound,
): Promise<Buffer> {
  const parts: Uint8Array[] = [];
  let length = 0;
  for await (const chunk of chunks) {
    parts.push(chunk);
    length += chunk.length;
    if (length > bound.maxBytes) throw tooBig(name, bound);
  }
  return Buffer.concat(parts, length);
}

function tooBig(name: string, bound: ReadBound): EspalierError {
  return new EspalierError(
    "LIMIT_EXCEEDED",
    `${bound.what} ${name === "-" ? "on standard input" : name} is longer than ${bound.maxBytes} bytes, more than it can need`,
    { file: name },
  );
}
