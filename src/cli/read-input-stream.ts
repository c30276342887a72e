import { EspalierError } from "../errors.js";
import type { CliIO, StreamedInput } from "./io.js";
import { type UnicodeEncoding, unicodeEncoding } from "./unicode-encoding.js";

/** Largest piece of UTF-16 decoded at once, so that no string grows with the chunk. */
const PIECE = 1 << 20;

/**
 * Opens a named input ("-" is standard input) to be read in chunks; a failure to open or to read is IO.
 * Without `io.openInput`, reads it whole and hands it over as one chunk. The loaders read UTF-8: input
 * that starts with a UTF-16 byte-order mark is decoded and handed over as UTF-8 (mark dropped), and
 * then its size is unknown, as its UTF-8 bytes are not the file's.
 */
export async function readInputStream(io: CliIO, name: string): Promise<StreamedInput> {
  let input: StreamedInput;
  try {
    if (io.openInput) {
      input = await io.openInput(name);
    } else {
      const bytes = name === "-" ? await io.readStdin() : await io.readFile(name);
      input = { size: bytes.length, chunks: once(bytes) };
    }
  } catch (err) {
    throw ioError(name, err);
  }
  const { start, chunks } = await peek(guarded(input.chunks, name), 2);
  // Not one byte from a pipe: the command before it failed or found nothing, which its own error says.
  if (name === "-" && start.length === 0)
    throw new EspalierError(
      "INPUT_EMPTY",
      "nothing came on standard input: a command before the pipe that failed or found nothing writes nothing (its own error, if any, is above)",
      { file: "<stdin>" },
    );
  const encoding = unicodeEncoding(start);
  if (encoding === "utf-8") return { size: input.size, chunks };
  return { size: undefined, chunks: toUtf8(chunks, encoding) };
}

async function* once(bytes: Uint8Array): AsyncGenerator<Uint8Array> {
  yield bytes;
}

/** The chunks, with a read failure (not a load error) turned into IO. */
async function* guarded(chunks: AsyncIterable<Uint8Array>, name: string): AsyncGenerator<Uint8Array> {
  const iterator = chunks[Symbol.asyncIterator]();
  for (;;) {
    let next: IteratorResult<Uint8Array>;
    try {
      next = await iterator.next();
    } catch (err) {
      throw ioError(name, err);
    }
    if (next.done) return;
    yield next.value;
  }
}

/** The first `want` bytes (fewer when the input is shorter), and every chunk again from the start. */
async function peek(
  source: AsyncGenerator<Uint8Array>,
  want: number,
): Promise<{ start: Uint8Array; chunks: AsyncGenerator<Uint8Array> }> {
  const head: Uint8Array[] = [];
  const start: number[] = [];
  let done = false;
  while (start.length < want) {
    const next = await source.next();
    if (next.done) {
      done = true;
      break;
    }
    head.push(next.value);
    for (let k = 0; k < next.value.length && start.length < want; k++) start.push(next.value[k]);
  }
  async function* chunks(): AsyncGenerator<Uint8Array> {
    try {
      yield* head;
      if (!done) yield* source;
    } finally {
      await source.return(undefined);
    }
  }
  return { start: Uint8Array.from(start), chunks: chunks() };
}

/** UTF-16 chunks as UTF-8 chunks; a code unit or surrogate pair cut between chunks is joined up. */
async function* toUtf8(
  chunks: AsyncIterable<Uint8Array>,
  encoding: UnicodeEncoding,
): AsyncGenerator<Uint8Array> {
  // ignoreBOM false: the decoder drops the byte-order mark; what does not decode becomes U+FFFD.
  const decoder = new TextDecoder(encoding, { ignoreBOM: false });
  const encoder = new TextEncoder();
  for await (const chunk of chunks) {
    for (let at = 0; at < chunk.length; at += PIECE) {
      const text = decoder.decode(chunk.subarray(at, at + PIECE), { stream: true });
      if (text !== "") yield encoder.encode(text);
    }
  }
  const rest = decoder.decode();
  if (rest !== "") yield encoder.encode(rest);
}

/**
 * IO: an input that could not be read, by its name as given; an empty name (a script's unset variable,
 * `espalier "$TREE"`) is said to be one, not printed as nothing.
 */
export function ioError(name: string, err: unknown): EspalierError {
  const reason = (err as NodeJS.ErrnoException).code ?? (err as Error).message;
  const what = name === "-" ? "standard input" : name === "" ? 'an empty file name ("")' : name;
  return new EspalierError("IO", `cannot read ${what}: ${reason}`, { file: name });
}
