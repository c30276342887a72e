import { say } from "../../errors.js";
import type { ReadingNote } from "../../model/reading-note.js";
import type { NodeSink } from "../node-sink.js";

/**
 * ABSOLUTE_AND_RELATIVE when paths from "/" (`/srv/a`, a top node "/") and paths that start elsewhere
 * (`srv/b`) stand side by side: two trees, as nothing in a listing says where a relative path starts
 * (find run twice, once from /srv and once from ., into one file). `top` is the node the top-level
 * nodes hang from (-1, or the root an empty path named); `isListed` tells the paths' nodes from their
 * ancestors. `unit`: the paths are a path list's lines or a table's rows, whose input line `lineOf`
 * gives. One pass over the parents; the paths are counted only when both kinds are there.
 */
export function mixedStartsNote(
  sink: NodeSink,
  top: number,
  isListed: (node: number) => boolean,
  unit: "line" | "row" = "line",
  lineOf: (origin: number) => number = (origin) => origin,
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
  const count = (n: number) => (n === 1 ? `1 ${unit}` : `${n} ${unit}s`);
  const give = absolute === 1 ? "gives" : "give";
  const fix =
    unit === "line"
      ? `List every path from one start (find /DIR, or cd DIR and find .), or make the relative ones absolute with the folder they were listed from (awk -F'\\t' -v OFS='\\t' '$NF !~ /^\\// {$NF = "/DIR/" $NF} 1' LIST)`
      : "Write every path from one start: make the relative ones absolute with the folder they stand in, or the absolute ones relative to it";
  return {
    code: "ABSOLUTE_AND_RELATIVE",
    line: lineOf(Math.min(origin[slash], origin[other])),
    parts: say`${count(absolute)} ${give} an absolute path (the first: ${unit} ${origin[slash]}) and ${count(relative)} a relative one (the first: ${unit} ${origin[other]}): they were read as two trees side by side, "/" beside the relative paths' folders, as nothing says where a relative path starts. ${fix}`,
  };
}
