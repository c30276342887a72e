import { Buffer, constants } from "node:buffer";
import { EspalierError } from "../../errors.js";
import { buildGraphTree } from "../../model/build-graph.js";
import { buildTree } from "../../model/build-tree.js";
import type { GraphNodes } from "../../model/graph-nodes.js";
import type { LinkedNodes } from "../../model/linked-nodes.js";
import type { Tree } from "../../model/tree.js";
import { detectFormat } from "../detect-format.js";
import { edgeTableDelimiter, isGraph, withNodeRecords } from "../graph-input.js";
import { linkGraphTable } from "../graph-table.js";
import { linkTable } from "../link-table.js";
import { loadJson } from "../load-json.js";
import type { InputFormat, LoadOptions } from "../load-options.js";
import { loadYaml } from "../load-yaml.js";
import { csvStreamTable } from "./csv-stream-table.js";
import { edgeListStream } from "./edge-list-stream.js";
import { JsonStreamLoader } from "./json-stream-loader.js";
import { pathListStream } from "./path-list-stream.js";
import { readStart } from "./read-start.js";

/**
 * Reads a byte stream into a {@link Tree}, never holding the input as one string: the streaming
 * counterpart of `loadTree`, giving the same tree for the same bytes. The format is detected from the
 * file name and the first bytes unless `options.format` forces one. JSON, JSON rows, CSV, TSV and path
 * lists stream; YAML is read whole (it cannot be longer than the engine's longest string).
 */
export async function loadTreeFromStream(
  chunks: AsyncIterable<Uint8Array>,
  options: LoadOptions,
): Promise<Tree> {
  const file = options.file === undefined || options.file === "-" ? undefined : options.file;
  try {
    const start = await readStart(chunks);
    let linked: LinkedNodes | GraphNodes;
    try {
      if (start.complete && !/\S/.test(start.text))
        throw new EspalierError("INPUT_EMPTY", "the input is empty");
      const format = options.format ?? detectFormat(start.text, file, options);
      linked = await linkedNodes(start.chunks, format, options, start.text);
    } catch (error) {
      await start.close();
      throw error;
    }
    return isGraph(linked) ? buildGraphTree(withNodeRecords(linked, options), file) : buildTree(linked, file);
  } catch (error) {
    if (error instanceof EspalierError && file !== undefined) throw error.inFile(file);
    throw error;
  }
}

async function linkedNodes(
  chunks: AsyncIterable<Uint8Array>,
  format: InputFormat,
  options: LoadOptions,
  head: string,
): Promise<LinkedNodes | GraphNodes> {
  switch (format) {
    case "json":
    case "rows": {
      // Graph rows and adjacency maps are read whole (see mayBeAdjacency).
      if (options.graph || (format === "json" && mayBeAdjacency(head, options)))
        return loadJson(
          await wholeText(chunks, "JSON"),
          options,
          options.format === undefined ? undefined : format,
        );
      // A detected format is a guess from the first bytes; the first element decides, as in memory.
      const loader = new JsonStreamLoader(options, options.format === undefined ? undefined : format);
      for await (const chunk of chunks) loader.write(chunk);
      return loader.end();
    }
    case "csv":
    case "tsv": {
      const table = await csvStreamTable(chunks, format === "csv" ? "," : "\t", options);
      try {
        return options.graph ? linkGraphTable(table, options) : linkTable(table, options);
      } finally {
        table.release?.();
      }
    }
    case "paths":
      return pathListStream(chunks, options);
    case "edges": {
      const delimiter = edgeTableDelimiter(head, options);
      if (delimiter === null) return edgeListStream(chunks, options);
      // The child column is read too (a table streamed keeps only the columns it is told of).
      const table = await csvStreamTable(chunks, delimiter, {
        ...options,
        keepFields: [...options.keepFields, options.childField],
        maxNodes: Number.POSITIVE_INFINITY,
      });
      try {
        return linkGraphTable(table, options, true);
      } finally {
        table.release?.();
      }
    }
    case "yaml":
      return loadYaml(await wholeText(chunks, "YAML"), options);
  }
}

/**
 * Whether a JSON input may be an adjacency map, judged from its first bytes: a top-level object whose
 * first key is not the name, children or size field (a nested root almost always starts with one). Such
 * an input is read whole and the parsed value decides (a nested tree still loads as one).
 */
function mayBeAdjacency(head: string, options: LoadOptions): boolean {
  const m = /^\s*\{\s*("(?:[^"\\]|\\.)*")\s*:/.exec(head.charCodeAt(0) === 0xfeff ? head.slice(1) : head);
  if (!m) return false;
  let key: string;
  try {
    key = JSON.parse(m[1]) as string;
  } catch {
    return false;
  }
  return key !== options.nameField && key !== options.childrenField && key !== options.sizeField;
}

/** The whole input as one string (YAML, adjacency maps); LIMIT_EXCEEDED when no string can hold it. */
async function wholeText(chunks: AsyncIterable<Uint8Array>, what: "YAML" | "JSON"): Promise<string> {
  const parts: Uint8Array[] = [];
  let length = 0;
  for await (const chunk of chunks) {
    parts.push(chunk);
    length += chunk.length;
    if (length > constants.MAX_STRING_LENGTH) {
      throw new EspalierError(
        "LIMIT_EXCEEDED",
        what === "YAML"
          ? `YAML input longer than ${constants.MAX_STRING_LENGTH} bytes cannot be read; convert it to JSON, which streams`
          : `a JSON adjacency map or graph table longer than ${constants.MAX_STRING_LENGTH} bytes cannot be read; write it as an edge list, which streams`,
      );
    }
  }
  return new TextDecoder("utf-8", { ignoreBOM: true }).decode(Buffer.concat(parts, length));
}
