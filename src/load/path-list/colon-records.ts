/**
 * How many colons separate the fields of a line shaped as a colon-separated record whose first field
 * is a name, as `/etc/passwd`, `/etc/group` and `getent` print one (`quay:x:1001:1001::/srv/quay:/bin/sh`;
 * passwd(5), group(5)): two or more colons, none after a "/" (a path's folder) before the first. -1 for
 * any other line.
 */
export function colonFields(text: string): number {
  const first = text.indexOf(":");
  if (first <= 0 || text.lastIndexOf("/", first) !== -1) return -1;
  let n = 0;
  for (let k = first; k !== -1; k = text.indexOf(":", k + 1)) n++;
  return n >= 2 ? n : -1;
}

/**
 * The PARSE_PATHS message for such records read as a path list. It quotes none of the input: such
 * files list people's accounts.
 */
export function colonRecordsMessage(colons: number): string {
  return `every line is ${colons + 1} fields separated by colons, the first a name, as /etc/passwd, /etc/group and getent print accounts and groups: read as a path list, each whole line would be one path split at the '/'s of its fields. Such records link no node to another: espalier reads a table whose header row names the id and parent columns (or a path column), CSV or TSV, or a list of paths; to read each line as a path, pass --input-format paths`;
}
