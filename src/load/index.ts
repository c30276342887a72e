import { EspalierError } from "../errors.js";
import { buildTree } from "../model/build-tree.js";
import type { Tree } from "../model/tree.js";
import { detectFormat } from "./detect-format.js";
import { linkTable } from "./link-table.js";
import { loadJson } from "./load-json.js";
import type { LoadOptions } from "./load-options.js";
import { loadPathList } from "./load-path-list.js";
import { loadYaml } from "./load-yaml.js";
import { csvTable } from "./table.js";

export { detectFormat } from "./detect-format.js";
export { defaultLoadOptions, type InputFormat, inputFormats, type LoadOptions } from "./load-options.js";

/**
 * Reads already-decoded text into a {@link Tree}: strips a leading byte order mark, detects the format
 * unless `options.format` forces one, links the nodes and orders them. Every failure is an
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

function linkedNodes(body: string, format: LoadOptions["format"] & string, options: LoadOptions) {
  switch (format) {
    case "json":
    case "rows":
      // A detected format is a guess from the first record; the parsed value decides.
      return loadJson(body, options, options.format === undefined ? undefined : format);
    case "yaml":
      return loadYaml(body, options);
    case "csv":
      return linkTable(csvTable(body, ",", options.maxNodes), options);
    case "tsv":
      return linkTable(csvTable(body, "\t", options.maxNodes), options);
    case "paths":
      return loadPathList(body, options);
  }
}
