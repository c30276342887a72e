import type { LinkedNodes } from "../model/linked-nodes.js";
import { JsonLoader } from "./json/json-loader.js";
import type { InputFormat, LoadOptions } from "./load-options.js";
import { PathListReader } from "./path-list/path-list-reader.js";

/** A loader fed UTF-8 bytes, whole or in chunks cut anywhere, synchronously. */
export interface ByteLoader {
  write(chunk: Uint8Array): void;
  /** Ends the input; the nodes, ready for `buildTree`. */
  end(): LinkedNodes;
}

/**
 * The byte loader for `format`, or undefined for the formats read another way (CSV and TSV through
 * their record reader, YAML as text). JSON and rows are one loader: a detected format is a guess from
 * the first bytes, so unless `options.format` forces one, the input itself decides.
 */
export function byteLoader(format: InputFormat, options: LoadOptions): ByteLoader | undefined {
  switch (format) {
    case "json":
    case "rows":
      return new JsonLoader(options, options.format === undefined ? undefined : format);
    case "paths":
      return new PathListReader(options);
    default:
      return undefined;
  }
}
