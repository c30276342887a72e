import { Buffer } from "node:buffer";
import { EspalierError } from "../errors.js";
import { buildTree } from "../model/build-tree.js";
import type { LinkedNodes } from "../model/linked-nodes.js";
import type { Tree } from "../model/tree.js";
import { byteLoader } from "./byte-loader.js";
import { detectFormat } from "./detect-format.js";
import type { InputFormat, LoadOptions } from "./load-options.js";
import { loadYaml } from "./load-yaml.js";
import { csvTableFromBytes } from "./table/csv-table.js";
import { linkTable } from "./table/link-table.js";

export { detectFormat } from "./detect-format.js";
export { defaultLoadOptions, type InputFormat, inputFormats, type LoadOptions } from "./load-options.js";

/**
 * Reads already-decoded text into a {@link Tree}: strips a leading byte order mark, detects the format
 * unless `options.format` forces one, and reads the text's UTF-8 bytes with the same loaders the
 * streaming `loadTreeFromStream` uses (YAML as text), so both give the same tree and the same errors.
 * A lone surrogate in the text reads as U+FFFD, as it would from a file. Every failure is an
 * {@link EspalierError} whose position names `options.file`.
 */
export function loadTree(text: string, options: LoadOptions): Tree {
  const file = options.file === undefined || options.file === "-" ? undefined : options.file;
  try {
    const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
    if (!/\S/.test(body)) throw new EspalierError("INPUT_EMPTY", "the input is empty");
    const format = options.format ?? detectFormat(body, file, options);
    return buildTree(linkedNodes(body, format, options), file);
  } catch (error) {
    if (error instanceof EspalierError && file !== undefined) throw error.inFile(file);
    throw error;
  }
}

function linkedNodes(body: string, format: InputFormat, options: LoadOptions): LinkedNodes {
  if (format === "yaml") return loadYaml(body, options);
  const bytes = Buffer.from(body, "utf8");
  const loader = byteLoader(format, options, bytes);
  if (loader) {
    loader.write(bytes);
    return loader.end();
  }
  const table = csvTableFromBytes(bytes, format === "csv" ? "," : "\t", options);
  try {
    return linkTable(table, options);
  } finally {
    table.release?.();
  }
}
