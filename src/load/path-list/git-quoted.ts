import { Buffer } from "node:buffer";

const backslash = 92;
const quote = 34;

/** The byte each one-letter escape stands for, as git writes them (quote.c; from memory). */
const LETTERS: Readonly<Record<number, number>> = {
  97: 7, // \a
  98: 8, // \b
  116: 9, // \t
  110: 10, // \n
  118: 11, // \v
  102: 12, // \f
  114: 13, // \r
  34: 34, // \"
  92: 92, // \\
};

/**
 * The name inside a path that git wrote quoted, `bytes[start, end)` being what lies between the
 * quotes: git ls-files, ls-tree and diff --name-only quote a path holding a byte other than printable
 * ASCII (core.quotepath, on by default), a `"` or a `\` as a C string, each such byte an escape
 * (`"docs/\346\227\245.txt"`, `"a\tb"`). Undefined when the bytes are no such string: an unescaped
 * `"`, an escape git does not write, or no escape at all (git quotes a name only for one).
 */
export function gitUnquoted(bytes: Uint8Array, start: number, end: number): Buffer | undefined {
  const out: number[] = [];
  let escapes = 0;
  for (let k = start; k < end; k++) {
    const c = bytes[k];
    if (c === quote) return undefined;
    if (c !== backslash) {
      out.push(c);
      continue;
    }
    if (++k >= end) return undefined;
    const e = bytes[k];
    escapes++;
    if (e >= 48 && e <= 51 && k + 2 < end && isOctal(bytes[k + 1]) && isOctal(bytes[k + 2])) {
      out.push((e - 48) * 64 + (bytes[k + 1] - 48) * 8 + (bytes[k + 2] - 48));
      k += 2;
    } else if (LETTERS[e] !== undefined) {
      out.push(LETTERS[e]);
    } else {
      return undefined;
    }
  }
  return escapes > 0 ? Buffer.from(out) : undefined;
}

function isOctal(c: number): boolean {
  return c >= 48 && c <= 55;
}
