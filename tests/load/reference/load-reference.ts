import { EspalierError } from "../../../src/errors.js";
import { detectFormat } from "../../../src/load/detect-format.js";
import type { InputFormat, LoadOptions } from "../../../src/load/load-options.js";
import { loadYaml } from "../../../src/load/load-yaml.js";
import { linkTable } from "../../../src/load/table/link-table.js";
import { buildTree } from "../../../src/model/build-tree.js";
import type { LinkedNodes } from "../../../src/model/linked-nodes.js";
import type { Tree } from "../../../src/model/tree.js";
import { csvTable } from "./csv-reference.js";
import { loadJson } from "./json-reference.js";
import { PathListTextReader } from "./path-list-text-reader.js";

/**
 * The reference answer for a load: the whole-text readers espalier had before every load went through
 * the byte loaders (JSON.parse and a walk over its value, csv-parse's synchronous parser, a path-list
 * reader on text), so the byte loaders are checked against an independent reading of the same text.
 * Structure errors in JSON carry no position here (JSON.parse keeps none).
 */
export function loadReference(text: string, options: LoadOptions): Tree {
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
  switch (format) {
    case "json":
    case "rows":
      return loadJson(body, options, options.format === undefined ? undefined : format);
    case "yaml": {
      // The reference reads trees; a YAML adjacency map is a graph (tests/graph).
      const nodes = loadYaml(body, options);
      if ("edgeFrom" in nodes) throw new Error("the reference loader reads trees only");
      return nodes;
    }
    case "csv":
      return linkTable(csvTable(body, ",", options.maxNodes), options);
    case "tsv":
      return linkTable(csvTable(body, "\t", options.maxNodes), options);
    case "paths": {
      const reader = new PathListTextReader(options);
      reader.lines(body, 0, body.length);
      return reader.finish(options.rootName);
    }
    case "edges":
      throw new Error("the reference loader reads trees only; an edge list is a graph (tests/graph)");
  }
}
