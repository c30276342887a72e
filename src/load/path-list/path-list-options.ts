import { EspalierError } from "../../errors.js";
import type { InputFormat, LoadOptions } from "../load-options.js";

type PathListOptions = Pick<LoadOptions, "folderSizes" | "nulSeparated">;

/**
 * `--nul-separated` says how a path list is read, and `--folder-sizes` how a path list, node objects or
 * rows count a node's size; on any other format they would be ignored, and a user who asked for totals
 * (or for NUL-ended entries) would get the input read another way with exit 0: USAGE instead, naming
 * the format the input is read as. (A JSON or YAML document read as values or as a graph is refused
 * once read: load/size-totals.ts.)
 */
export function checkPathListOptions(format: InputFormat | "fact table", options: PathListOptions): void {
  if (format === "paths") return;
  const sized = format !== "edges" && format !== "fact table";
  const given = [
    ...(options.folderSizes !== undefined && !sized ? ["--folder-sizes"] : []),
    ...(options.nulSeparated === true ? ["--nul-separated"] : []),
  ];
  if (given.length === 0) return;
  const how = format === "fact table" ? "" : " (--input-format paths reads it as a path list)";
  const what = options.nulSeparated === true ? "path lists only" : "path lists, node objects and tables only";
  throw new EspalierError(
    "USAGE",
    `${given.join(" and ")} ${given.length === 1 ? "reads" : "read"} ${what}; this input is read as ${format}${how}`,
  );
}
