import { EspalierError, quoted, say } from "../../errors.js";
import type { NodeSink } from "../node-sink.js";

/**
 * PARSE_PATHS for a path list that names the folder it was listed in two ways: paths that start with
 * `./` (as `find .` prints them) beside relative paths that do not (as `git ls-files` or `find -printf
 * '%P'` print them). Read as written, `.` would be one top-level folder and the others its siblings, and
 * an entry listed both ways (`./src/a.ts` and `src/a.ts`) two entries, its size counted twice, with
 * exit 0. At the first line of a top-level name other than `.` and `/`; `root` is the node an empty
 * path named (-1 for none), whose children are top-level too. `sized`: the lines give a size before the
 * path, so the way out drops ./ after it. Undefined when the list names no `./` path with something in
 * it, or no other relative one.
 */
export function dotAndPlain(sink: NodeSink, root: number, sized: boolean): EspalierError | undefined {
  let dot = -1;
  let plain = -1;
  const { parentOf, origin } = sink;
  for (let i = 0; i < sink.length; i++) {
    if (i === root || (parentOf[i] !== -1 && parentOf[i] !== root)) continue;
    const name = sink.name.get(i);
    if (name === ".") dot = i;
    else if (name !== "/" && name !== "" && (plain === -1 || origin[i] < origin[plain])) plain = i;
  }
  if (dot === -1 || plain === -1) return undefined;
  // The first entry below "." (a "." line alone, as find . prints the folder itself, is no such path).
  let inDot = -1;
  for (let i = dot + 1; i < sink.length && inDot === -1; i++) if (parentOf[i] === dot) inDot = i;
  if (inDot === -1) return undefined;
  const twice = namedBothWays(sink, dot, root);
  const both =
    twice === undefined
      ? ", so what is in it would show under two folders"
      : say`, so ${quoted.path(`./${twice}`)} and ${quoted.path(twice)}, one entry, would show as two, its size counted twice`;
  const line = origin[plain];
  return new EspalierError(
    "PARSE_PATHS",
    say`line ${line} names ${quoted.path(sink.name.get(plain))} without a leading ./ where line ${origin[inDot]} names ${quoted.path(`./${sink.name.get(inDot)}`)} with one: both name entries of the folder the list was made in (as find . and git ls-files list it)${both}. Drop the leading ./ from every path (${sized ? SIZED : UNSIZED} LIST | espalier -), or list the paths one way`,
    { line, column: 1 },
  );
}

/** The first top-level name (by line) that is also a name inside `dot`. */
function namedBothWays(sink: NodeSink, dot: number, root: number): string | undefined {
  const inDot = new Set<string>();
  const { parentOf, origin } = sink;
  for (let i = 0; i < sink.length; i++) if (parentOf[i] === dot) inDot.add(sink.name.get(i));
  let found = -1;
  for (let i = 0; i < sink.length; i++) {
    if (i === dot || i === root || (parentOf[i] !== -1 && parentOf[i] !== root)) continue;
    if (inDot.has(sink.name.get(i)) && (found === -1 || origin[i] < origin[found])) found = i;
  }
  return found === -1 ? undefined : sink.name.get(found);
}

const UNSIZED = "sed 's|^\\./||'";
// A size, a tab and the path (GNU sed reads \t as a tab).
const SIZED = "sed 's|\\t\\./|\\t|'";
