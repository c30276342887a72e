import type { LinkedNodes } from "../model/build.js";
import { PathListReader } from "./pathListReader.js";
import type { LoadOptions } from "./types.js";

/** Loads a path list held in one string (see {@link PathListReader} for the format). */
export function loadPaths(text: string, options: LoadOptions): LinkedNodes {
  const reader = new PathListReader(options);
  reader.lines(text, 0, text.length);
  return reader.finish(options.rootName);
}
