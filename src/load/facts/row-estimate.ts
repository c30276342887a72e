import { open } from "node:fs/promises";
import { EspalierError } from "../../errors.js";

/** Bytes of a text table read to measure its lines. */
const SAMPLE = 1 << 20;

/**
 * About how many lines a text table (CSV, TSV, JSON lines) has, read from its first MiB: all of them for
 * a smaller file; for a larger one, its size over the sample's mean line length, times 1.5 (later lines
 * may be shorter). An estimate for sizing the engine's work (how many parts a grouping takes), never a
 * count anything is computed from.
 */
export async function textRowEstimate(file: string): Promise<number> {
  const handle = await open(file).catch((err: NodeJS.ErrnoException) => {
    throw new EspalierError("IO", `cannot read ${file}: ${err.code ?? err.message}`, { file });
  });
  try {
    const { size } = await handle.stat();
    const buffer = new Uint8Array(Math.min(SAMPLE, size));
    const { bytesRead } = await handle.read(buffer, 0, buffer.length, 0);
    let lines = 0;
    for (let i = 0; i < bytesRead; i++) if (buffer[i] === 10) lines++;
    if (bytesRead >= size) return lines + 1;
    return Math.ceil((size / bytesRead) * Math.max(1, lines) * 1.5);
  } finally {
    await handle.close();
  }
}
