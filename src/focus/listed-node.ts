import type { PathIndex } from "../model/path-index.js";

/**
 * The node a `--focus-from` line names as a literal path, as `find`, `git diff --name-only` or a lock
 * file print paths, or -1. Segments are split on `/` and taken as they are: no glob, no `~` escapes
 * (`jsr305-0.1~+svn49.jar` is a name), no `~~N` ranks (the first sibling of a name). Empty segments
 * (a leading `/`, a trailing `/`, `a//b`) are dropped. The path may start below the root, or with the
 * root's own name, as a listing whose entries share one top folder prints it (`tidewater/a/x` or
 * `./a/x` names `a/x` of a tree rooted at `tidewater` or `.`); a leading `.` is the current folder.
 */
export function listedNode(index: PathIndex, line: string): number {
  const segments = line.split("/").filter((s) => s !== "");
  const below = walk(index, segments);
  if (below >= 0 || segments.length === 0) return below;
  const { tree } = index;
  if (!tree.syntheticRoot && segments[0] === tree.name.get(0)) {
    const fromRoot = walk(index, segments.slice(1));
    if (fromRoot >= 0) return fromRoot;
  }
  return segments[0] === "." ? walk(index, segments.slice(1)) : -1;
}

function walk(index: PathIndex, segments: readonly string[]): number {
  let node = 0;
  for (const name of segments) {
    node = index.child(node, { name, rank: 1 });
    if (node < 0) return -1;
  }
  return node;
}
