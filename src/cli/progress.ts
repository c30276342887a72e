import type { CliIO } from "./io.js";

const QUIET_MS = 1000;
const EVERY_MS = 250;

/**
 * Passes chunks through, and once reading has taken longer than a second shows on standard error how
 * many bytes are read (of how many, when known) and at what rate, redrawn in place, then erased at the
 * end. Only when standard error is a terminal and a clock is given; otherwise the chunks pass untouched.
 */
export async function* withProgress(
  chunks: AsyncIterable<Uint8Array>,
  io: CliIO,
  label: string,
  total: number | undefined,
): AsyncGenerator<Uint8Array> {
  const now = io.now;
  if (!io.stderr.isTTY || !now) {
    yield* chunks;
    return;
  }
  const start = now();
  let read = 0;
  let shownAt = 0;
  let shown = false;
  try {
    for await (const chunk of chunks) {
      read += chunk.length;
      const t = now();
      if (t - start >= QUIET_MS && t - shownAt >= EVERY_MS) {
        io.stderr.write(`\r\x1b[K${progressLine(label, read, total, t - start)}`);
        shownAt = t;
        shown = true;
      }
      yield chunk;
    }
  } finally {
    if (shown) io.stderr.write("\r\x1b[K");
  }
}

/** `espalier: reading big.json: 412 MiB of 1.0 GiB (40%), 96 MiB/s`. */
export function progressLine(label: string, read: number, total: number | undefined, ms: number): string {
  const rate = ms > 0 ? `, ${mib(read / (ms / 1000))}/s` : "";
  const of = total ? ` of ${mib(total)} (${Math.floor((100 * read) / total)}%)` : "";
  return `espalier: reading ${label}: ${mib(read)}${of}${rate}`;
}

function mib(bytes: number): string {
  if (bytes >= 2 ** 30) return `${(bytes / 2 ** 30).toFixed(1)} GiB`;
  return `${Math.round(bytes / 2 ** 20)} MiB`;
}
