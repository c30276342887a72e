import type { LinkedNodes } from "../model/linked-nodes.js";
import { JsonLoader } from "./json/json-loader.js";
import { JsonPathMapLoader } from "./json/json-path-map-loader.js";
import { sampleJson } from "./json/json-sample.js";
import { JsonValueLoader } from "./json/json-value-loader.js";
import type { KeptJson } from "./json/kept-json.js";
import type { InputFormat, LoadOptions } from "./load-options.js";
import { PathListReader } from "./path-list/path-list-reader.js";
import { chooseReading } from "./shape/choose-reading.js";

/** A loader fed UTF-8 bytes, whole or in chunks cut anywhere, synchronously. */
export interface ByteLoader {
  write(chunk: Uint8Array): void;
  /** Ends the input; the nodes, ready for `buildTree`. */
  end(): LinkedNodes;
}

/**
 * The byte loader for `format`, or undefined for the formats read another way (CSV and TSV through
 * their record reader, YAML as text). `head` is the start of the input (at least its first 64 KiB, when
 * it has them): JSON is read as {@link chooseReading} decides from a sample of it, as nodes (with the
 * configured or a found children field), values, rows or a map keyed by path. Rows and nodes are one
 * loader: unless `options.format` forces one, the first element decides. `earlier`: what the load of
 * an earlier version of this input kept for this one (kept-json.ts), which node objects may be taken from.
 */
export function byteLoader(
  format: InputFormat,
  options: LoadOptions,
  head: Uint8Array,
  earlier?: KeptJson,
): ByteLoader | undefined {
  switch (format) {
    case "json":
    case "rows": {
      const as = options.format === undefined ? undefined : format;
      if (as === "rows") return new JsonLoader(options, as);
      const reading = chooseReading(sampleJson(head), options);
      switch (reading.kind) {
        case "values":
          return new JsonValueLoader(options);
        case "path-map":
          return new JsonPathMapLoader(options, reading.field);
        case "rows":
          // Read as rows because OLD was: the first element must not decide otherwise.
          return new JsonLoader(options, options.sameReading?.kind === "rows" ? "rows" : as);
        case "nodes":
          return new JsonLoader(
            { ...options, childrenField: reading.childrenField },
            as,
            reading.found,
            earlier,
          );
      }
      break;
    }
    case "paths":
      return new PathListReader(options);
    default:
      return undefined;
  }
}
