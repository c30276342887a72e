// What bin/espalier.js needs, as one module: the launcher imports it once, as the single-file bundle
// that `npm run build` makes of it (scripts/bundle.js), so a start reads one file, not hundreds.
import type { loadInWorker as LoadInWorkerFn } from "./load-in-worker.js";

type LoadInWorker = typeof LoadInWorkerFn;

export { fileReadAgain } from "./file-read-again.js";
export { heapToRestartWith } from "./heap-to-restart-with.js";
export { run } from "./main.js";
export { openFile } from "./open-file.js";
export { readBounded, readStreamBounded } from "./read-bounded.js";
export { standardStreams, TERMINAL_INPUT_HINT } from "./std-streams.js";

/**
 * Loads a file on another thread (load-in-worker.ts); the worker-thread modules load on the first call
 * (only a diff makes one), not with the command line (start-up, issue 14).
 */
export async function loadInWorker(...args: Parameters<LoadInWorker>): ReturnType<LoadInWorker> {
  return (await import("./load-in-worker.js")).loadInWorker(...args);
}
