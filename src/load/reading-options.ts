import { EspalierError } from "../errors.js";
import type { GraphNodes } from "../model/graph-nodes.js";
import type { InputFormat, LinkOption, LoadOptions } from "./load-options.js";

/** What the check needs to know of how a loader read the input. */
interface ReadNodes {
  parentColumnRead?: boolean;
  reading?: { shape: string };
  linkedBy?: GraphNodes["linkedBy"];
}

/**
 * Options that say how some reading links its nodes (`--id-field`, `--parent-field`, `--path-field`,
 * `--child-field`, `--children-field`), or that the input is a graph (`--graph`, `--nodes`), or how a
 * JSON/YAML document is read (`--read-as`), given on an input read another way: each would be
 * ignored, and a user who named a column (say, `ps` output with `--id-field pid --parent-field ppid`,
 * read as a path list because it is no CSV) would get another tree with exit 0. USAGE instead, naming
 * the options and what the input was read as. A graph is checked by how it links its nodes (an
 * adjacency map given `--parent-field`, a `--graph` table given `--read-as`).
 */
export function checkReadingOptions(nodes: ReadNodes, format: InputFormat, options: LoadOptions): void {
  if (nodes.linkedBy !== undefined) {
    const linkedBy = nodes.linkedBy;
    const unused: string[] = (options.linkOptionsNamed ?? []).filter(
      (flag) => !graphReads(flag, linkedBy, options.nodeRecords !== undefined),
    );
    if (options.readAs !== undefined) unused.push("--read-as");
    refuse(unused, graphReadingName(linkedBy), "");
    return;
  }
  const shape = nodes.reading?.shape;
  if (shape === undefined) return;
  const byId = nodes.parentColumnRead === true;
  const unused: string[] = (options.linkOptionsNamed ?? []).filter((flag) => !reads(flag, shape, byId));
  if (options.graph) unused.push("--graph");
  if (options.nodeRecords !== undefined) unused.push("--nodes");
  if (options.readAs !== undefined && (shape === "table" || shape === "paths")) unused.push("--read-as");
  refuse(unused, readingName(shape, byId, format), hint(shape));
}

/** USAGE naming the options `unused` and the reading (`what`) that does not read them; none: nothing. */
function refuse(unused: readonly string[], what: string, hint: string): void {
  if (unused.length === 0) return;
  const list = unused.length === 1 ? unused[0] : `${unused.slice(0, -1).join(", ")} and ${unused.at(-1)}`;
  throw new EspalierError(
    "USAGE",
    `${list} ${unused.length === 1 ? "does" : "do"} not apply: this input is read as ${what}, which does not read ${unused.length === 1 ? "it" : "them"}${hint}`,
    undefined,
    { options: [...unused] },
  );
}

/**
 * Whether a graph linked so reads the column or field a link option names; `--id-field` also names
 * the id column of node records (`--nodes`).
 */
function graphReads(flag: LinkOption, linkedBy: GraphNodes["linkedBy"], records: boolean): boolean {
  switch (flag) {
    case "--id-field":
      return linkedBy === "id-parent" || linkedBy === "id-children" || records;
    case "--parent-field":
      return linkedBy === "id-parent" || linkedBy === "parent-child";
    case "--child-field":
      return linkedBy === "parent-child";
    case "--children-field":
      return linkedBy === "map" || linkedBy === "id-children";
    case "--path-field":
      return false;
  }
}

function graphReadingName(linkedBy: GraphNodes["linkedBy"]): string {
  switch (linkedBy) {
    case "pairs":
      return "an edge list (pairs of ids separated by spaces or a tab)";
    case "parent-child":
      return "an edge table (a parent and a child column)";
    case "id-parent":
      return "a graph linked by id and parent columns";
    case "map":
      return "an adjacency map (each key an id, its value its children)";
    case "id-children":
      return "records naming their children (each an id and a list of child ids)";
    case "sbom":
      return "a CycloneDX SBOM's dependency graph (--read-as values reads its values)";
  }
}

/** Whether a reading reads the column or field a link option names. */
function reads(flag: LinkOption, shape: string, byId: boolean): boolean {
  const table = shape === "table" || shape === "rows";
  switch (flag) {
    case "--id-field":
    case "--parent-field":
      return table && byId;
    case "--path-field":
      return table && !byId;
    case "--children-field":
      return shape === "nodes";
    case "--child-field":
      return false;
  }
}

function readingName(shape: string, byId: boolean, format: InputFormat): string {
  switch (shape) {
    case "paths":
      return "a path list (one path per line, with or without a size)";
    case "table":
    case "rows": {
      const what = shape === "rows" ? "JSON rows" : `a ${format === "tsv" ? "TSV" : "CSV"} table`;
      return byId ? `${what} linked by id and parent columns` : `${what} linked by a path column`;
    }
    case "nodes":
      return "nested nodes (children inside their parent)";
    case "values":
      return "values (every value of the document a node)";
    case "path-map":
      return "an object keyed by path";
    default:
      return shape;
  }
}

function hint(shape: string): string {
  if (shape === "paths")
    return " (a table is read as CSV or TSV with a header row; columns aligned with spaces, as ps prints them, read as paths until converted; --input-format names the format)";
  if (shape === "table" || shape === "rows")
    return " (rows are linked by id and parent when the table has both columns, else by the path column)";
  return "";
}
