/**
 * The `ps -o` keyword for each column header procps-ng prints (seen here: `PID`, `PPID`, `RSS` and
 * `COMMAND` from `ps -eo pid,ppid,rss,comm`; the rest from memory of ps(1)), with the column the
 * converted table names it by: the id, the parent, the name, or the keyword itself.
 */
const psColumns: Readonly<Record<string, { key: string; column: string }>> = {
  PID: { key: "pid", column: "id" },
  PPID: { key: "ppid", column: "parent" },
  RSS: { key: "rss", column: "rss" },
  VSZ: { key: "vsz", column: "vsz" },
  "%CPU": { key: "pcpu", column: "pcpu" },
  "%MEM": { key: "pmem", column: "pmem" },
  USER: { key: "user", column: "user" },
  UID: { key: "uid", column: "uid" },
  STAT: { key: "stat", column: "stat" },
  TIME: { key: "time", column: "time" },
  NI: { key: "ni", column: "ni" },
  COMMAND: { key: "comm", column: "name" },
  CMD: { key: "cmd", column: "name" },
};

/** Columns whose numbers can stand for a process's size (resident, then virtual memory, in KiB). */
const SIZE_KEYS = ["rss", "vsz"];

/**
 * The PARSE_PATHS message for a listing of columns aligned with spaces, a number first on every line
 * after the header (`ps -eo pid,ppid,comm`), or a header of capitals whose columns every later line
 * fills (`ps -ef`, `ps aux`): how to make it a table. When the header names only
 * columns of the table above, with PID, PPID and a last command column (which may hold spaces), the
 * conversion keeps every column the listing has, in its order, and names the size column; else it
 * gives the one for `pid,ppid,comm`. Only the table's own words are printed, never the input's.
 */
export function columnsAlignedMessage(header: readonly string[], lines: "number" | "filled"): string {
  const words = header.map((word) => word.toUpperCase());
  // No process id: no ps listing, so no conversion from ps (findmnt's TARGET SOURCE FSTYPE OPTIONS).
  if (!words.includes("PID"))
    return words.includes("TARGET") && words.includes("FSTYPE") ? FINDMNT : OTHER_COLUMNS;
  const known = header.map((word) => psColumns[word.toUpperCase()]);
  const fits =
    known.every((c) => c !== undefined) &&
    known.some((c) => c.column === "id") &&
    known.some((c) => c.column === "parent") &&
    known[known.length - 1].column === "name" &&
    known.filter((c) => c.column === "name").length === 1;
  const columns = fits ? known : [psColumns.PID, psColumns.PPID, psColumns.COMMAND];
  const keys = columns.map((c) => `${c.key}=`).join(",");
  const names = columns.map((c) => `"${c.column}"`).join(", ");
  const splits = columns
    .slice(1)
    .map(() => 'sub(/ +/, "\\t"); ')
    .join("");
  const size = columns.find((c) => SIZE_KEYS.includes(c.key));
  const sized = size ? ` --size-field ${size.column}` : "";
  const rows =
    lines === "number"
      ? "every later line starts with a number, as ps -eo pid,ppid,comm prints"
      : "every later line fills its columns, as ps -ef and ps aux print";
  return `the first line reads as a header of columns aligned with spaces and ${rows}: read as a path list, each line would be one path. A table is read as CSV or TSV whose header names the id and parent columns: ps -eo ${keys} | awk -v OFS='\\t' 'BEGIN {print ${names}} {sub(/^ +/, ""); ${splits}print}' | espalier - --null-parent 0${sized}; to read each line as a path, pass --input-format paths`;
}

/** A header of columns with no process id (see {@link columnsAlignedMessage}): no conversion named. */
const OTHER_COLUMNS =
  "the first line reads as a header of columns aligned with spaces and every later line fills its columns: read as a path list, each line would be one path. Give espalier a table whose header row names its columns (CSV or TSV: the id and parent columns, or a path column), or a size and a path separated by a tab a line (find DIR -printf '%s\\t%p\\n', du -ab); to read each line as a path, pass --input-format paths";

/** findmnt's own listing (util-linux, seen here): its header, then each mount drawn under its parent. */
const FINDMNT =
  "the first line names the columns of a mount table (TARGET, SOURCE, FSTYPE), as findmnt prints each mount under the one it is mounted on: read as a path list, each line would be one path, its drawing and columns part of the names. findmnt -J lists the same mounts as nested JSON: findmnt -J | espalier - --start-at /filesystems --name-field target; to read each line as a path, pass --input-format paths";
