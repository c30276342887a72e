// A worker thread's entry: loads one named file as the command line loads its input (streamed, the
// same encoding checks) and posts the tree back as plain data, or the error as data (its code, message parts and place).
import { readFile } from "node:fs/promises";
import { parentPort, workerData } from "node:worker_threads";
import { EspalierError } from "../errors.js";
import type { LoadOptions } from "../load/load-options.js";
import { loadTreeFromStream } from "../load/stream/index.js";
import { treeToMessage, treeTransferList } from "../model/tree-message.js";
import { readAgain } from "./input.js";
import type { CliIO } from "./io.js";
import { openFile } from "./open-file.js";
import { readInputStream } from "./read-input-stream.js";

const { name, options } = workerData as { name: string; options: LoadOptions };
const quiet = { write: () => true };
const io: CliIO = {
  stdout: quiet,
  stderr: quiet,
  readStdin: () => Promise.reject(new Error("a worker reads no standard input")),
  readFile: (path) => readFile(path),
  openInput: openFile,
  env: {},
};

try {
  const source = await readInputStream(io, name);
  // The input's length lets a reader size its arrays, as on the main thread (input.ts, streamTree).
  const sized = source.size === undefined ? options : { ...options, inputBytes: source.size };
  const tree = await loadTreeFromStream(source.chunks, sized, readAgain(io, name, source.size));
  // The arrays move to the main thread (no copy of a million-node tree); this thread ends after.
  const message = treeToMessage(tree);
  parentPort!.postMessage({ tree: message }, treeTransferList(message));
} catch (err) {
  if (err instanceof EspalierError) parentPort!.postMessage({ error: err.toData() });
  else parentPort!.postMessage({ failure: err instanceof Error ? (err.stack ?? err.message) : String(err) });
}
