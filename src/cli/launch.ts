// What bin/espalier.js needs, as one module: the launcher imports it once, as the single-file bundle
// that `npm run build` makes of it (scripts/bundle.js), so a start reads one file, not hundreds.
export { heapToRestartWith } from "./heap-to-restart-with.js";
export { loadInWorker } from "./load-in-worker.js";
export { run } from "./main.js";
export { openFile } from "./open-file.js";
export { readBounded, readStreamBounded } from "./read-bounded.js";
export { standardStreams, TERMINAL_INPUT_HINT } from "./std-streams.js";
