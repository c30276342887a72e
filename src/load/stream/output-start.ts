import { OutputHead } from "../output-head.js";
import type { StreamStart } from "./read-start.js";

/**
 * The format id of espalier's own output a JSON stream holds (load/output-head.ts), else undefined,
 * and the stream again from its start. Told from the start read for detection; when that cannot tell
 * (members espalier writes fill it before any `format`, as a long list of foci does once `jq -S`
 * sorts them first), from as many more chunks as it takes, held to be read again, up to `most` bytes:
 * an output longer than that is not read back whole anyway, so such a text is read as it is.
 */
export async function outputFormatOfStream(
  start: StreamStart,
  most: number,
): Promise<{ format: string | undefined; start: StreamStart }> {
  const first = new OutputHead().read(start.text);
  if (first !== undefined || start.complete) return { format: first ?? undefined, start };
  const head = new OutputHead();
  const decoder = new TextDecoder("utf-8");
  const iterator = start.chunks[Symbol.asyncIterator]();
  const held: Uint8Array[] = [];
  let length = 0;
  let verdict: string | null | undefined;
  let ended = false;
  while (verdict === undefined && length <= most) {
    const next = await iterator.next();
    if (next.done) {
      ended = true;
      verdict = head.read(decoder.decode()) ?? null;
      break;
    }
    held.push(next.value);
    length += next.value.length;
    verdict = head.read(decoder.decode(next.value, { stream: true }));
  }
  async function* again(): AsyncGenerator<Uint8Array> {
    yield* held;
    if (ended) return;
    for (;;) {
      const next = await iterator.next();
      if (next.done) return;
      yield next.value;
    }
  }
  return { format: verdict ?? undefined, start: { ...start, chunks: again() } };
}
