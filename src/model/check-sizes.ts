import { EspalierError, type MessagePart, quoted, type SourcePos } from "../errors.js";
import type { LinkedNodes } from "./linked-nodes.js";
import type { Names } from "./names.js";
import { isSize, MAX_SIZE } from "./size-rule.js";

/**
 * Checks the own sizes of linked nodes in input order: each must be a number from 0 to 2^53 − 1, and so
 * must their sum, the root's total. Whole numbers in that range, and sums that stay in it, are exact in a
 * double, so every subtree total is exact; beyond it a total would be silently rounded. Loaders reject
 * bad sizes themselves, with the field's position; this is the guard every loader passes. A size of -0
 * becomes 0.
 */
export function checkSizes(input: LinkedNodes & { name: Names }, file?: string): void {
  const { ownSize } = input;
  let total = 0;
  for (let i = 0; i < ownSize.length; i++) {
    const size = ownSize[i];
    if (!isSize(size)) {
      throw new EspalierError(
        "BAD_SIZE",
        [
          "the size of ",
          where(input, i),
          " must be a number from 0 to 2^53 - 1, got ",
          quoted.value(String(size)),
        ],
        position(input, i, file),
      );
    }
    if (size === 0) {
      ownSize[i] = 0;
      continue;
    }
    total += size;
    if (total > MAX_SIZE) {
      throw new EspalierError(
        "BAD_SIZE",
        [
          `the sizes add up to more than 2^53 - 1 (${MAX_SIZE}) by `,
          where(input, i),
          "; totals beyond that cannot be exact",
        ],
        position(input, i, file),
      );
    }
  }
}

function where(input: LinkedNodes & { name: Names }, i: number): MessagePart {
  const at = input.origin[i];
  if (at > 0) return `${input.originIsRow ? "row" : "line"} ${at}`;
  return quoted.name(input.name.get(i));
}

function position(input: LinkedNodes, i: number, file: string | undefined): SourcePos | undefined {
  const at = input.origin[i];
  const pos: SourcePos = file === undefined ? {} : { file };
  if (at > 0) {
    if (input.originIsRow) pos.row = at;
    else pos.line = at;
  }
  return Object.keys(pos).length > 0 ? pos : undefined;
}
