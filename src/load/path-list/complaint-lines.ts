import { EspalierError, quoted, say } from "../../errors.js";
import type { NodeSink } from "../node-sink.js";

/**
 * Commands that list files and write their complaints to standard error as `COMMAND: message` (GNU
 * coreutils, findutils, tar; seen here: `find: ‘/root/x’: Permission denied`, `du: cannot read
 * directory '/root/x': Permission denied`, `ls: cannot open directory '/root': Permission denied`).
 */
const LISTERS =
  /^(?:find|du|ls|stat|wc|tar|bsdtar|cpio|unzip|zipinfo|file|realpath|xargs|sha(?:1|224|256|384|512)sum|md5sum|b2sum|cksum): /;

/**
 * The command whose complaint `text` (one whole line, or its start up to a "/") is, as {@link LISTERS}
 * names them and {@link COMPLAINT} or {@link ERRNO} reads the rest: undefined for any other text. `find / -printf '%s\t%p\n' > list 2>&1` (or `|&`) puts them among the
 * entries, where each would read as a path (unsized) or stop the listing at a line without a size.
 */
export function complaintOf(text: string): string | undefined {
  const m = LISTERS.exec(text);
  if (m === null) return undefined;
  const rest = text.slice(m[0].length);
  return COMPLAINT.test(rest) || ERRNO.test(rest) ? m[0].slice(0, -2) : undefined;
}

/**
 * How such a message goes on after `COMMAND: ` (GNU, seen here): a quoted name (‘x’ in a UTF-8 locale,
 * 'x' in C), or `cannot …`, `warning: …`, `fts_read failed: …`, `File system loop detected; …`.
 */
const COMPLAINT = /^(?:[‘'`"]|cannot |warning: |fts_read|File system loop)/;

/** How such a message ends: the system's error text (strerror; from memory, as glibc words them). */
const ERRNO =
  /: (?:Permission denied|No such file or directory|Input\/output error|Not a directory|Too many levels of symbolic links|Operation not permitted|File name too long|Stale file handle|No such device)$/;

/**
 * PARSE_PATHS for a path list holding a line a listing command wrote to standard error, when any
 * top-level entry's name is one ({@link complaintOf}: names split at "/", so the line's text up to its
 * first "/"); `root` is the node an empty path named (-1 for none). At the first such line, the line
 * rebuilt from the entry and its first entries below it. Undefined when there is none.
 */
export function complaintLines(sink: NodeSink, root: number): EspalierError | undefined {
  const { parentOf, origin } = sink;
  let first = -1;
  for (let i = 0; i < sink.length; i++) {
    if (i === root || (parentOf[i] !== -1 && parentOf[i] !== root)) continue;
    if (complaintOf(sink.name.get(i)) !== undefined && (first === -1 || origin[i] < origin[first])) first = i;
  }
  if (first === -1) return undefined;
  // The line that made the entry: its names down to a leaf, each the first made below the one above.
  const names = [sink.name.get(first)];
  for (let at = first, i = first + 1; i < sink.length; i++) {
    if (parentOf[i] !== at || origin[i] !== origin[first]) continue;
    names.push(sink.name.get(i));
    at = i;
  }
  return complaintError(names.join("/"), origin[first]);
}

/** PARSE_PATHS at `line`, whose text is a listing command's complaint (see {@link complaintOf}). */
export function complaintError(text: string, line: number): EspalierError {
  const command = complaintOf(text) ?? "";
  return new EspalierError(
    "PARSE_PATHS",
    say`line ${line} is a message ${command} wrote to standard error (${quoted.excerpt(text)}), as 2>&1 or |& puts among the entries: read as a path, it would be an entry of its own. List without it (${command} ... 2>/dev/null, or grep -v '^${command}: ' LIST), and mind the folders it could not read, which the list leaves out`,
    { line, column: 1 },
  );
}
