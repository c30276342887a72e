import { EspalierError, type MessagePart, type SourcePos, say } from "../errors.js";
import type { Names } from "../model/names.js";
import { describeNode } from "./describe-node.js";
import { nodePath } from "./node-path.js";

/**
 * BAD_SIZE for node `i` of a nested document (JSON or YAML): its size `shown` as written (or "a
 * non-number"), read from the field `field` or, with none, written as the node's own value (`"a": 12`
 * under children keyed by name). `details.path` is the node's path (see {@link nodePath}) when it has a
 * name, and `details.field` the size field read.
 */
export function badNodeSize(
  parentOf: ArrayLike<number>,
  name: Names,
  i: number,
  shown: MessagePart,
  field: string | undefined,
  pos: SourcePos | undefined,
): EspalierError {
  const where = describeNode(parentOf, name, i);
  const what = field === undefined ? "the size" : `the "${field}"`;
  return new EspalierError(
    "BAD_SIZE",
    say`${what} of ${where} must be a number from 0 to 2^53 - 1, got ${shown}${withUnit(shown) ? UNIT_HINT : ""}`,
    pos,
    {
      ...(name.get(i) === "" ? {} : { path: nodePath(parentOf, name, i) }),
      ...(field === undefined ? {} : { field }),
    },
  );
}

/**
 * Whether the size was written as text with a unit (`"12 KB"`, `"1.5GiB"`, `"256G"`, `"0B"`), as
 * `lsblk -J` writes sizes without `-b` (util-linux, seen here) and spreadsheets do (common practice, no
 * source). Only the shape is looked at; the message quotes the text through `shown`.
 */
function withUnit(shown: MessagePart): boolean {
  return (
    typeof shown !== "string" &&
    /^\d+(?:[.,]\d+)?\s*(?:[kKMGTPEZY](?:i?B)?|B|bytes?)$/.test(shown.text.trim())
  );
}

const UNIT_HINT =
  "; sizes are plain numbers, not text with a unit: write them in bytes (lsblk -J -b, for one, prints bytes where lsblk -J prints 256G)";
