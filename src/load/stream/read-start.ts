import { Buffer } from "node:buffer";

/** The start of a byte stream, decoded for format detection, and the whole stream again from its start. */
export interface StreamStart {
  /** The first bytes (at least 64 KiB and a whole first line, when the input has them) as text. */
  text: string;
  /** Whether `text` is the whole input. */
  complete: boolean;
  /** Every chunk of the input, byte-order marks dropped. */
  chunks: AsyncIterable<Uint8Array>;
  /** Lets go of the input when it will not be read to its end. */
  close(): Promise<void>;
}

const WANT = 1 << 16;
const MOST = 1 << 24;

/**
 * Reads the first chunks of a stream, enough to tell its format: 64 KiB or more, and past the first
 * non-blank byte and the end of the first line unless the input starts like JSON (at most 16 MiB).
 * Up to two UTF-8 byte-order marks are dropped, as decoding the whole text drops one and `loadTree`
 * one more.
 */
export async function readStart(chunks: AsyncIterable<Uint8Array>): Promise<StreamStart> {
  const iterator = chunks[Symbol.asyncIterator]();
  const head: Uint8Array[] = [];
  let length = 0;
  let complete = false;
  let firstByte = -1;
  let lineEnded = false;
  for (;;) {
    const next = await iterator.next();
    if (next.done) {
      complete = true;
      break;
    }
    const chunk = next.value;
    head.push(chunk);
    length += chunk.length;
    for (let k = 0; k < chunk.length && firstByte < 0; k++) {
      const c = chunk[k];
      if (c !== 0x20 && c !== 0x09 && c !== 0x0a && c !== 0x0d && c !== 0xef && c !== 0xbb && c !== 0xbf) {
        firstByte = c;
      }
    }
    if (!lineEnded) lineEnded = chunk.includes(0x0a);
    const json = firstByte === 0x7b || firstByte === 0x5b;
    if ((length >= WANT && firstByte >= 0 && (lineEnded || json)) || length >= MOST) break;
  }
  const joined = Buffer.concat(head);
  let skip = 0;
  while (skip < 6 && joined[skip] === 0xef && joined[skip + 1] === 0xbb && joined[skip + 2] === 0xbf)
    skip += 3;
  const text = new TextDecoder("utf-8", { ignoreBOM: true }).decode(joined.subarray(skip), {
    stream: !complete,
  });
  // The chunks as they came (a loader must cope with any cut), less the byte-order marks.
  async function* all(): AsyncGenerator<Uint8Array> {
    for (const chunk of head) {
      if (skip >= chunk.length) {
        skip -= chunk.length;
        continue;
      }
      yield skip > 0 ? chunk.subarray(skip) : chunk;
      skip = 0;
    }
    if (complete) return;
    for (;;) {
      const next = await iterator.next();
      if (next.done) return;
      yield next.value;
    }
  }
  const close = async () => {
    await iterator.return?.();
  };
  return { text, complete, chunks: all(), close };
}
