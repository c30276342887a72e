import { say } from "../../errors.js";
import type { ReadingNote } from "../../model/reading-note.js";
import type { NodeSink } from "../node-sink.js";

/**
 * ABSOLUTE_AND_RELATIVE when a path list names paths from "/" (`/srv/a`, a top node "/") and paths that
 * start elsewhere (`srv/b`) beside them: two trees side by side, as nothing in a listing says where a
 * relative path starts (find run twice, once from /srv and once from ., into one file). `top` is the
 * node the top-level nodes hang from (-1, or the root an empty path named); `isListed` tells the lines'
 * nodes from ancestors. One pass over the parents; the lines are counted only when both kinds are there.
 */
export function mixedStartsNote(
  sink: NodeSink,
  top: number,
  isListed: (node: number) => boolean,
): ReadingNote | undefined {
  const { parentOf, origin } = sink;
  let slash = -1;
  let other = -1;
  for (let i = 0; i < sink.length; i++) {
    if (parentOf[i] !== top || i === top) continue;
    if (sink.name.get(i) === "/") slash = i;
    else if (other === -1 || origin[i] < origin[other]) other = i;
  }
  if (slash === -1 || other === -1) return undefined;
  // Each node's top-level node: parents come before their children (a root an empty path named is `top`).
  const under = new Int32Array(sink.length);
  let absolute = 0;
  let relative = 0;
  for (let i = 0; i < sink.length; i++) {
    const p = parentOf[i];
    under[i] = p === top || p === -1 ? i : under[p];
    if (i === top || !isListed(i)) continue;
    if (under[i] === slash) absolute++;
    else relative++;
  }
  const line = Math.min(origin[slash], origin[other]);
  const lines = (n: number) => (n === 1 ? "1 line" : `${n} lines`);
  const give = absolute === 1 ? "gives" : "give";
  return {
    code: "ABSOLUTE_AND_RELATIVE",
    line,
    parts: say`${lines(absolute)} ${give} an absolute path (the first: line ${origin[slash]}) and ${lines(relative)} a relative one (the first: line ${origin[other]}): they were read as two trees side by side, "/" beside the relative paths' folders, as a listing does not say where a relative path starts. List every path from one start (find /DIR, or cd DIR and find .), or make the relative ones absolute with the folder they were listed from (awk -F'\\t' -v OFS='\\t' '$NF !~ /^\\// {$NF = "/DIR/" $NF} 1' LIST)`,
  };
}
