import { open } from "node:fs/promises";
import type { StreamedInput } from "./io.js";

/** A named file read in 1 MiB chunks, with its size when it is a regular file; a directory is EISDIR. */
export async function openFile(name: string): Promise<StreamedInput> {
  const handle = await open(name, "r");
  const stat = await handle.stat();
  if (stat.isDirectory()) {
    await handle.close();
    throw Object.assign(new Error(`${name} is a directory`), { code: "EISDIR" });
  }
  return {
    size: stat.isFile() ? stat.size : undefined,
    chunks: handle.createReadStream({ highWaterMark: 1 << 20 }),
  };
}
