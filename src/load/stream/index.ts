import { Buffer, constants } from "node:buffer";
import { EspalierError, placedAtRow, placingDone } from "../../errors.js";
import { buildGraphTree } from "../../model/build-graph.js";
import { buildTree } from "../../model/build-tree.js";
import type { GraphNodes } from "../../model/graph-nodes.js";
import type { LinkedNodes } from "../../model/linked-nodes.js";
import type { ReadingNote } from "../../model/reading-note.js";
import type { Tree } from "../../model/tree.js";
import { noteApartFirstLine } from "../apart-first-line.js";
import { byteLoader } from "../byte-loader.js";
import { mayBeSbom } from "../cyclonedx.js";
import { detectFormat } from "../detect-format.js";
import {
  checkPlainEdgeList,
  edgeTableDelimiter,
  edgeTableFields,
  isGraph,
  jsonGraph,
  jsonSbom,
  withNodeRecords,
} from "../graph-input.js";
import { linkGraphTable } from "../graph-table.js";
import { JsonLoader } from "../json/json-loader.js";
import { type KeptJson, keptJsons } from "../json/kept-json.js";
import { valueAtPointer } from "../json/value-at-pointer.js";
import { parsePointer, readAtPointer, startAtFormat } from "../json-pointer.js";
import type { InputFormat, LoadOptions } from "../load-options.js";
import { documentNotUtf8Note } from "../not-utf8-note.js";
import { checkPathListOptions } from "../path-list/path-list-options.js";
import { jsonGraphTooLong, limitsOf } from "../read-limits.js";
import { checkReadingOptions } from "../reading-options.js";
import { loadSavedOutput, readsAsSaved } from "../saved-output.js";
import { readSizeTotals } from "../size-totals.js";
import { csvTableFromStream } from "../table/csv-table.js";
import { type KeptTable, keptTables } from "../table/kept-table.js";
import { linkTable, tableReading } from "../table/link-table.js";
import { placeInTable } from "../table/locate-cell.js";
import { checkNullParentUse } from "../table/null-parent.js";
import { type ReadAsEarlier, readAsEarlier, readsAsEarlier } from "../table/read-as-earlier.js";
import { checkShortRowsFormat } from "../table/short-rows-format.js";
import type { Table } from "../table/table.js";
import { withNotes } from "../with-notes.js";
import { edgeListStream } from "./edge-list-stream.js";
import { outputFormatOfStream } from "./output-start.js";
import { readStart, type StreamStart } from "./read-start.js";

/**
 * Reads a byte stream into a {@link Tree}, never holding the input as one string: the streaming
 * counterpart of `loadTree`, with the same loaders, so both give the same tree for the same bytes. The
 * format is detected from the file name and the first bytes unless `options.format` forces one. JSON,
 * JSON rows, CSV, TSV and path lists stream; YAML is read whole (it cannot be longer than the engine's
 * longest string).
 */
export async function loadTreeFromStream(
  chunks: AsyncIterable<Uint8Array>,
  options: LoadOptions,
  again?: () => Promise<AsyncIterable<Uint8Array>>,
): Promise<Tree> {
  const file = options.file === undefined || options.file === "-" ? undefined : options.file;
  const table: TableSeen = {};
  let placeRow: LinkedNodes["placeRow"];
  // What an earlier version's load kept for this one (a table's), taken whatever this input turns out
  // to be, so that it is held no longer than this load.
  if (options.earlierVersion) {
    table.earlier = keptTables.take(options.earlierVersion);
    table.earlierJson = keptJsons.take(options.earlierVersion);
  }
  try {
    let start = await readStart(chunks);
    let linked: LinkedNodes | GraphNodes;
    try {
      if (start.complete && !/\S/.test(start.text))
        throw new EspalierError("INPUT_EMPTY", "the input is empty");
      const format = options.format ?? detectFormat(start.text, file, options);
      checkPathListOptions(format, options);
      checkShortRowsFormat(format, options);
      // espalier's own summary JSON: read whole as the view it holds (saved-output.ts), told by its
      // format member; a summary is as long as its budget, and JSON graphs' bound holds it.
      let saved: string | undefined;
      if (format === "json")
        ({ format: saved, start } = await outputFormatOfStream(
          start,
          limitsOf(options.limits).maxJsonGraphBytes,
        ));
      if (readsAsSaved(saved, options)) {
        const bytes = await wholeBytes(start.chunks, "JSON", limitsOf(options.limits).maxJsonGraphBytes);
        return loadSavedOutput(new TextDecoder("utf-8", { ignoreBOM: true }).decode(bytes), saved!, options);
      }
      const part = await partAtPointer(start, format, options);
      const read = await linkedNodes(part.chunks, format, options, Buffer.from(part.text, "utf8"), table);
      if ("later" in read) {
        checkReadingOptions({ parentColumnRead: true, reading: read.later.reading }, format, options);
        return read.later;
      }
      linked = readAtPointer(read, options);
      checkNullParentUse(linked, format, options);
      checkReadingOptions(linked, format, options);
    } catch (error) {
      await start.close();
      throw error;
    }
    placeRow = linked.placeRow;
    if (isGraph(linked))
      return readSizeTotals(buildGraphTree(withNodeRecords(linked, options), file), options.folderSizes);
    const tree = readSizeTotals(buildTree(linked, file), options.folderSizes);
    if (table.kept) keptTables.keep(tree, table.kept);
    if (table.keptJson) keptJsons.keep(tree, table.keptJson);
    return tree;
  } catch (caught) {
    // An error about a row of this input (not of a --nodes file, which names itself): at its line,
    // and at its cell when the table's bytes can be read again.
    let error = caught;
    if (!(error instanceof EspalierError) || error.pos?.file === undefined || error.pos.file === file) {
      error = placedAtRow(error, placeRow);
      if (table.delimiter !== undefined && again) error = await placeInTable(error, table.delimiter, again);
    }
    error = placingDone(error);
    if (error instanceof EspalierError && file !== undefined) throw error.inFile(file);
    throw error;
  } finally {
    // Read no more: its memory back at once, not when the collector finds it.
    table.earlierJson?.release();
  }
}

/**
 * The input as the loaders read it under `--start-at`: a JSON text with every byte outside the value the
 * pointer refers to blanked (json/value-at-pointer.ts), its start read again for the loader's sample;
 * YAML as it is (load-yaml.ts takes the part); any other format USAGE (startAtFormat).
 */
async function partAtPointer(
  start: StreamStart,
  format: InputFormat,
  options: LoadOptions,
): Promise<StreamStart> {
  if (!options.startAt || format === "yaml") return start;
  startAtFormat(format);
  return readStart(
    valueAtPointer(start.chunks, parsePointer(options.startAt), options.startAt, options.limits, true),
  );
}

/**
 * The delimiter of the CSV or TSV table an input was read as, once known; what an earlier version's
 * load kept for this one, and what this one kept for a later one (kept-table.ts).
 */
interface TableSeen {
  delimiter?: "," | "\t";
  earlier?: KeptTable;
  kept?: KeptTable;
  /** The same for JSON node objects (json/kept-json.ts). */
  earlierJson?: KeptJson;
  keptJson?: KeptJson;
}

async function linkedNodes(
  chunks: AsyncIterable<Uint8Array>,
  format: InputFormat,
  options: LoadOptions,
  head: Uint8Array,
  seen: TableSeen,
): Promise<LinkedNodes | GraphNodes | { later: Tree }> {
  if (format === "yaml") {
    // The YAML parser is loaded only for YAML input (a start reads no code it does not run).
    const { loadYaml } = await import("../load-yaml.js");
    const bytes = await wholeBytes(chunks, "YAML", limitsOf(options.limits).maxYamlBytes);
    const text = new TextDecoder("utf-8", { ignoreBOM: true }).decode(bytes);
    return withNotes(loadYaml(text, options), notUtf8Lines(bytes));
  }
  if (format === "edges") {
    const start = new TextDecoder("utf-8", { ignoreBOM: true }).decode(head);
    const delimiter = edgeTableDelimiter(start, options);
    if (delimiter === null) {
      checkPlainEdgeList(start, options);
      return noteApartFirstLine(await edgeListStream(chunks, options), start);
    }
    seen.delimiter = delimiter;
    const table = await csvTableFromStream(chunks, delimiter, edgeTableFields(options));
    try {
      return linkGraphTable(table, options, true);
    } finally {
      table.release?.();
    }
  }
  const loader = byteLoader(format, options, head, seen.earlierJson);
  if (format === "json" && mayBeSbom(new TextDecoder().decode(head), options)) {
    // A CycloneDX SBOM: read whole, as a JSON graph is, and read as its dependency graph when it has one.
    const bytes = await wholeBytes(chunks, "JSON", limitsOf(options.limits).maxJsonGraphBytes);
    const graph = jsonSbom(bytes, options);
    if (graph) return withNotes(graph, notUtf8Lines(bytes));
    loader!.write(bytes);
    const linked = loader!.end();
    if (loader instanceof JsonLoader) seen.keptJson = loader.keptForLater;
    return linked;
  }
  // A JSON graph (rows or an adjacency map) is read whole and parsed.
  if ((format === "json" || format === "rows") && options.graph) {
    const bytes = await wholeBytes(chunks, "JSON", limitsOf(options.limits).maxJsonGraphBytes);
    const graph = jsonGraph(new TextDecoder("utf-8", { ignoreBOM: true }).decode(bytes), options, bytes);
    if (graph) return withNotes(graph, notUtf8Lines(bytes));
    // No JSON: the JSON loader reads the same bytes and places the error.
    loader!.write(bytes);
    return loader!.end();
  }
  if (loader) {
    for await (const chunk of chunks) loader.write(chunk);
    const linked = loader.end();
    if (loader instanceof JsonLoader) seen.keptJson = loader.keptForLater;
    return linked;
  }
  seen.delimiter = format === "csv" ? "," : "\t";
  const earlier = seen.earlier;
  seen.earlier = undefined;
  const table = await csvTableFromStream(
    chunks,
    seen.delimiter,
    options.graph ? edgeTableFields(options) : options,
    options.graph
      ? {}
      : {
          keep: options.keepForLaterVersion === true,
          readAgain: options.inputReadAgain === true,
          earlier,
          earlierInput: options.earlierInput,
        },
  );
  seen.kept = table.keptForLater;
  const asEarlier = options.graph ? undefined : readAsEarlier(table, options, options.earlierVersion);
  if (asEarlier !== undefined) return { later: treeAsEarlier(table, options, asEarlier) };
  try {
    return options.graph ? linkGraphTable(table, options) : linkTable(table, options);
  } finally {
    table.release?.();
  }
}

/**
 * The tree of a table read as an earlier version with known changes (table/read-as-earlier.ts), its
 * arrays made when first read: a diff lays both versions out together from what the reading found
 * (diff/direct-combine.ts) and mostly reads none of them. Made, they are the tree `linkTable` and
 * `buildTree` make of the table, as for any table: the reading found that its rows link without an
 * error. The reading is kept for the diff by the tree (`readsAsEarlier`).
 */
function treeAsEarlier(table: Table, options: LoadOptions, asEarlier: ReadAsEarlier): Tree {
  const file = options.file === undefined || options.file === "-" ? undefined : options.file;
  let built: Tree | undefined;
  const whole = (): Tree => {
    if (built === undefined) {
      try {
        built = readSizeTotals(buildTree(linkTable(table, options), file), options.folderSizes);
      } finally {
        table.release?.();
      }
    }
    return built;
  };
  const tree: Tree = {
    length: asEarlier.rows,
    hasSizes: asEarlier.sizes !== null,
    originIsRow: true,
    syntheticRoot: false,
    fields: new Map(),
    reading: tableReading(table, options, "table", []),
    get parent() {
      return whole().parent;
    },
    get depth() {
      return whole().depth;
    },
    get name() {
      return whole().name;
    },
    get ownSize() {
      return whole().ownSize;
    },
    get ids() {
      return whole().ids;
    },
    get origin() {
      return whole().origin;
    },
  };
  readsAsEarlier.keep(tree, asEarlier);
  return tree;
}

/**
 * The whole input as bytes (YAML, JSON graphs), at most `maxBytes` (read-limits.ts maxYamlBytes,
 * maxJsonGraphBytes: the parser holds the whole document and several times its size in values) and
 * what a string can hold; else LIMIT_EXCEEDED, checked as the chunks arrive (an endless input stops
 * there).
 */
async function wholeBytes(
  chunks: AsyncIterable<Uint8Array>,
  what: "YAML" | "JSON",
  maxBytes: number = constants.MAX_STRING_LENGTH,
): Promise<Buffer> {
  const most = Math.min(maxBytes, constants.MAX_STRING_LENGTH);
  const parts: Uint8Array[] = [];
  let length = 0;
  for await (const chunk of chunks) {
    parts.push(chunk);
    length += chunk.length;
    if (length > most) {
      throw new EspalierError(
        "LIMIT_EXCEEDED",
        what === "YAML"
          ? `YAML input longer than ${most} bytes is not read (its parser holds the whole document); convert it to JSON, which streams`
          : jsonGraphTooLong(most).message,
      );
    }
  }
  return Buffer.concat(parts, length);
}

/** The UNDECODABLE_BYTES note of a document read whole (YAML, a JSON graph), as a list: none when its bytes are UTF-8. */
function notUtf8Lines(bytes: Uint8Array): ReadingNote[] {
  const note = documentNotUtf8Note(bytes);
  return note ? [note] : [];
}
