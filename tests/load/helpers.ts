import { EspalierError } from "../../src/errors.js";
import { defaultLoadOptions, type LoadOptions } from "../../src/load/load-options.js";
import type { Tree } from "../../src/model/tree.js";

/** Default load options with some replaced. */
export function opts(overrides: Partial<LoadOptions> = {}): LoadOptions {
  return { ...defaultLoadOptions, ...overrides };
}

/** The tree as indented lines: two spaces per depth, the name, and the own size when the input has sizes. */
export function outline(tree: Tree): string[] {
  const lines: string[] = [];
  for (let i = 0; i < tree.length; i++) {
    const size = tree.hasSizes ? ` ${tree.ownSize[i]}` : "";
    lines.push(`${"  ".repeat(tree.depth[i])}${tree.name.get(i)}${size}`);
  }
  return lines;
}

/** The EspalierError that `run` throws (fails the test when it throws nothing or something else). */
export function caught(run: () => unknown): EspalierError {
  try {
    run();
  } catch (error) {
    if (error instanceof EspalierError) return error;
    throw error;
  }
  throw new Error("expected an EspalierError, nothing was thrown");
}
