/**
 * Whether the line is a count of blocks and a name, as `ls -s` prints each entry after its `total N`
 * line (GNU ls, seen here: `  4 README.md`, and with -h `4.0K README.md`, `68K [`): spaces, a number
 * (a fraction and a unit letter allowed), spaces and a name.
 */
export function blockCountLine(text: string): boolean {
  return BLOCKS.test(text);
}

const BLOCKS = /^ *[0-9]+(?:[.,][0-9]+)?[KMGTPEZY]? +\S/;

/** Whether the line is `total N` (N as {@link blockCountLine} reads it), as `ls -s` and `ls -l` print first. */
export function blockTotalLine(text: string): boolean {
  return /^total [0-9]+(?:[.,][0-9]+)?[KMGTPEZY]?$/.test(text);
}

/** The PARSE_PATHS message for `ls -s` output read as a path list. */
export const BLOCK_COUNTS =
  "the first line is total and a number, and every later line a number and a name, as ls -s prints: the numbers count disk blocks (1,024 bytes by default), not each file's size, and the names hold no folder; read as a path list, each line would be one name, its number part of it. List sizes and paths: find DIR -printf '%s\\t%p\\n' (each entry's own size) or du -ab DIR (folders with their contents); to read each line as a path, pass --input-format paths";
