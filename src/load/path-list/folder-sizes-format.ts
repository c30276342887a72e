import { EspalierError } from "../../errors.js";
import type { InputFormat, LoadOptions } from "../load-options.js";

/**
 * `--folder-sizes` says how a path list's sizes count; on any other format it would be ignored, and a
 * user who asked for totals would get the sizes read another way with exit 0: USAGE instead.
 */
export function checkFolderSizesFormat(format: InputFormat, options: LoadOptions): void {
  if (options.folderSizes === undefined || format === "paths") return;
  throw new EspalierError(
    "USAGE",
    `--folder-sizes reads path lists only; this input is read as ${format} (--input-format paths reads it as a path list)`,
  );
}
