import { EspalierError } from "../errors.js";
import type { CliIO, StreamedInput } from "./io.js";

/**
 * Opens a named input ("-" is standard input) to be read in chunks; a failure to open or to read is IO.
 * Without `io.openInput`, reads it whole and hands it over as one chunk.
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
  return { size: input.size, chunks: guarded(input.chunks, name) };
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

function ioError(name: string, err: unknown): EspalierError {
  const reason = (err as NodeJS.ErrnoException).code ?? (err as Error).message;
  return new EspalierError("IO", `cannot read ${name === "-" ? "standard input" : name}: ${reason}`, {
    file: name,
  });
}
