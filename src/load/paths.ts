import { EspalierError } from "../errors.js";
import type { LinkedNodes } from "../model/build.js";
import { NodeSink } from "./nodeSink.js";
import { PathIndex } from "./pathIndex.js";
import { parseSize } from "./size.js";
import type { LoadOptions } from "./types.js";

/**
 * Loads a path list: one "/"-separated path per line, blank lines ignored. When the first non-blank line
 * holds a tab, every line is "size<TAB>path" (as `find -printf '%s\t%p\n'` and `du` print); otherwise a
 * whole line is one path. Origins are line numbers.
 */
export function loadPaths(text: string, options: LoadOptions): LinkedNodes {
  const sink = new NodeSink(options.maxNodes, false);
  const index = new PathIndex(sink);
  const n = text.length;
  let sized: boolean | undefined;
  let firstLine = 0;
  let line = 0;
  for (let start = 0; start < n; ) {
    let end = text.indexOf("\n", start);
    if (end === -1) end = n;
    const next = end + 1;
    line++;
    if (end > start && text.charCodeAt(end - 1) === 13) end--;
    if (isBlank(text, start, end)) {
      start = next;
      continue;
    }
    let pathStart = start;
    let size = 0;
    if (sized === undefined) {
      sized = text.slice(start, end).includes("\t");
      firstLine = line;
    }
    if (sized) {
      const tab = text.indexOf("\t", start);
      if (tab === -1 || tab >= end) {
        throw new EspalierError(
          "PARSE_PATHS",
          `line ${line} has no size column before a tab, unlike line ${firstLine}`,
          {
            line,
          },
        );
      }
      size = parseSize(text.slice(start, tab));
      if (!(size >= 0)) {
        throw new EspalierError(
          "BAD_SIZE",
          `the size on line ${line} must be a number >= 0, got ${JSON.stringify(text.slice(start, tab))}`,
          { line, column: 1 },
        );
      }
      pathStart = tab + 1;
    }
    const i = index.place(text, pathStart, end, line);
    if (i === -1) {
      throw new EspalierError("PARSE_PATHS", `line ${line} has a size but no path`, {
        line,
        column: pathStart - start + 1,
      });
    }
    sink.ownSize[i] = size;
    start = next;
  }
  if (sink.length === 0) throw new EspalierError("INPUT_EMPTY", "the path list names no paths");
  sink.hasSizes = sized === true;
  return sink.finish(options.rootName, new Map());
}

function isBlank(text: string, start: number, end: number): boolean {
  for (let k = start; k < end; k++) {
    const c = text.charCodeAt(k);
    if (c !== 32 && c !== 9) return false;
  }
  return true;
}
