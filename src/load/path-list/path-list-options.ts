import { EspalierError } from "../../errors.js";
import type { InputFormat, LoadOptions } from "../load-options.js";

type PathListOptions = Pick<LoadOptions, "folderSizes" | "nulSeparated">;

/**
 * `--folder-sizes` and `--nul-separated` say how a path list is read; on any other format they would be
 * ignored, and a user who asked for totals (or for NUL-ended entries) would get the input read another
 * way with exit 0: USAGE instead, naming the format the input is read as.
 */
export function checkPathListOptions(format: InputFormat | "fact table", options: PathListOptions): void {
  if (format === "paths") return;
  const given = [
    ...(options.folderSizes !== undefined ? ["--folder-sizes"] : []),
    ...(options.nulSeparated === true ? ["--nul-separated"] : []),
  ];
  if (given.length === 0) return;
  const how = format === "fact table" ? "" : " (--input-format paths reads it as a path list)";
  throw new EspalierError(
    "USAGE",
    `${given.join(" and ")} ${given.length === 1 ? "reads" : "read"} path lists only; this input is read as ${format}${how}`,
  );
}
