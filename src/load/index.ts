import { Buffer } from "node:buffer";
import { EspalierError, placedAtRow, placingDone } from "../errors.js";
import { buildGraphTree } from "../model/build-graph.js";
import { buildTree } from "../model/build-tree.js";
import type { GraphNodes } from "../model/graph-nodes.js";
import type { LinkedNodes } from "../model/linked-nodes.js";
import type { Tree } from "../model/tree.js";
import { noteApartFirstLine } from "./apart-first-line.js";
import { byteLoader } from "./byte-loader.js";
import { mayBeSbom } from "./cyclonedx.js";
import { detectFormat } from "./detect-format.js";
import {
  edgeTableDelimiter,
  edgeTableFields,
  isGraph,
  jsonGraph,
  jsonSbom,
  loadEdges,
  withNodeRecords,
} from "./graph-input.js";
import { linkGraphTable } from "./graph-table.js";
import { valueAtPointerInBytes } from "./json/value-at-pointer.js";
import { parsePointer, readAtPointer, startAtFormat } from "./json-pointer.js";
import type { InputFormat, LoadOptions } from "./load-options.js";
import { loadYaml } from "./load-yaml.js";
import { checkPathListOptions } from "./path-list/path-list-options.js";
import { jsonGraphTooLong, limitsOf } from "./read-limits.js";
import { checkReadingOptions } from "./reading-options.js";
import { loadSavedOutput, readsAsSaved, savedOutputFormat } from "./saved-output.js";
import { readSizeTotals } from "./size-totals.js";
import { csvTableFromBytes } from "./table/csv-table.js";
import { linkTable } from "./table/link-table.js";
import { placeInTableBytes } from "./table/locate-cell.js";
import { checkNullParentUse } from "./table/null-parent.js";
import { checkShortRowsFormat } from "./table/short-rows-format.js";

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
  const table: TableText = {};
  let placeRow: LinkedNodes["placeRow"];
  try {
    const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
    if (!/\S/.test(body)) throw new EspalierError("INPUT_EMPTY", "the input is empty");
    const format = options.format ?? detectFormat(body, file, options);
    checkPathListOptions(format, options);
    checkShortRowsFormat(format, options);
    // espalier's own summary JSON: read as the view it holds (saved-output.ts), told by its format member.
    const saved = format === "json" ? savedOutputFormat(body) : undefined;
    if (readsAsSaved(saved, options)) return loadSavedOutput(body, saved!, options);
    const nodes = readAtPointer(
      linkedNodes(partAtPointer(body, format, options), format, options, table),
      options,
    );
    checkNullParentUse(nodes, format, options);
    checkReadingOptions(nodes, format, options);
    placeRow = nodes.placeRow;
    return readSizeTotals(
      isGraph(nodes) ? buildGraphTree(withNodeRecords(nodes, options), file) : buildTree(nodes, file),
      options.folderSizes,
    );
  } catch (caught) {
    // An error about a row of this input (not of node records, which name their file): at its cell.
    let error = caught;
    if (!(error instanceof EspalierError) || error.pos?.file === undefined || error.pos.file === file) {
      error = placedAtRow(error, placeRow);
      if (table.bytes !== undefined && table.delimiter !== undefined)
        error = placeInTableBytes(error, table.delimiter, table.bytes);
    }
    error = placingDone(error);
    if (error instanceof EspalierError && file !== undefined) throw error.inFile(file);
    throw error;
  }
}

/**
 * The text as the loaders read it under `--start-at`: JSON with every byte outside the value the pointer
 * refers to blanked (json/value-at-pointer.ts); YAML as it is (load-yaml.ts takes the part); any other
 * format USAGE (startAtFormat).
 */
function partAtPointer(body: string, format: InputFormat, options: LoadOptions): string {
  if (!options.startAt || format === "yaml") return body;
  startAtFormat(format);
  const bytes = Buffer.from(body, "utf8");
  valueAtPointerInBytes(bytes, parsePointer(options.startAt), options.startAt, options.limits, true);
  return bytes.toString("utf8");
}

/** The CSV or TSV table an input was read as, once known: its bytes, to place a row's error. */
interface TableText {
  delimiter?: "," | "\t";
  bytes?: Uint8Array;
}

function linkedNodes(
  body: string,
  format: InputFormat,
  options: LoadOptions,
  table: TableText,
): LinkedNodes | GraphNodes {
  if (format === "yaml") return loadYaml(body, options);
  if (format === "edges") {
    const delimiter = edgeTableDelimiter(body, options);
    if (delimiter !== null) {
      table.delimiter = delimiter;
      table.bytes = Buffer.from(body, "utf8");
    }
    return noteApartFirstLine(loadEdges(body, options), body);
  }
  // A CycloneDX SBOM is read as its dependency graph when it has one (cyclonedx.ts).
  if (format === "json" && mayBeSbom(body.slice(0, 65536), options)) {
    const graph = jsonSbom(Buffer.from(body, "utf8"), options);
    if (graph) return graph;
  }
  // A JSON graph (rows or an adjacency map) is parsed whole; a text that is no JSON goes to the JSON
  // loader, which places the error.
  if ((format === "json" || format === "rows") && options.graph) {
    // The same bound as a streamed graph's (counted in UTF-8 bytes, as read from a file).
    const limit = limitsOf(options.limits).maxJsonGraphBytes;
    if (body.length * 3 > limit && Buffer.byteLength(body, "utf8") > limit) throw jsonGraphTooLong(limit);
    const graph = jsonGraph(body, options);
    if (graph) return graph;
  }
  const bytes = Buffer.from(body, "utf8");
  const loader = byteLoader(format, options, bytes);
  if (loader) {
    loader.write(bytes);
    return loader.end();
  }
  table.delimiter = format === "csv" ? "," : "\t";
  table.bytes = bytes;
  const csv = csvTableFromBytes(bytes, table.delimiter, options.graph ? edgeTableFields(options) : options);
  try {
    return options.graph ? linkGraphTable(csv, options) : linkTable(csv, options);
  } finally {
    csv.release?.();
  }
}
