/**
 * Memory for what a load keeps for a later one (kept-table.ts, json/kept-json.ts), which {@link releaseMemory} gives back at once: resizable, so that it
 * can be resized to nothing. Not detached (moved away by a transfer), as it once was: the first
 * ArrayBuffer detached in a process throws away the engine's optimized code of every function that
 * reads a typed array, and a diff's NEW load compiled it all again (docs/performance.md). A plain
 * ArrayBuffer where the engine cannot reserve the room (the collector frees it then).
 */
export function releasableMemory(byteLength: number): ArrayBuffer {
  try {
    return new ArrayBuffer(byteLength, { maxByteLength: Math.max(1, byteLength) });
  } catch {
    return new ArrayBuffer(byteLength);
  }
}

/** Gives the memory of `buffer` back now, when it is resizable ({@link releasableMemory}). */
export function releaseMemory(buffer: ArrayBufferLike): void {
  if (buffer instanceof ArrayBuffer && buffer.resizable) buffer.resize(0);
}
