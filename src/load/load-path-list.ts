import type { LinkedNodes } from "../model/linked-nodes.js";
import type { LoadOptions } from "./load-options.js";
import { PathListReader } from "./path-list-reader.js";

/** Loads a path list held in one string (see {@link PathListReader} for the format). */
export function loadPathList(text: string, options: LoadOptions): LinkedNodes {
  const reader = new PathListReader(options);
  reader.lines(text, 0, text.length);
  return reader.finish(options.rootName);
}
