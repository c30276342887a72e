import { EspalierError } from "../../../src/errors.js";
import type { NodeSink } from "../../../src/load/node-sink.js";

/**
 * The reference rule for path lists whose folder lines are totals (as GNU du -ab prints them), written
 * from its statement rather than from src/load/path-list/folder-totals.ts: with children lists and
 * recursion, on the nodes a reference reader placed.
 *
 * Without a mode, the listing is read as totals when (1) no listed folder's size is less than
 * what its contents add up to (a listed node counts its size, an unlisted one its contents), (2)
 * some listed folder has contents of some size, and (3) one of: every listed folder comes after all of
 * its contents (no node below it was first seen after its line); every listed folder comes before all
 * of its contents and no listed line's size is bigger than the listed line before it (`du -ab | sort
 * -rn`, at least 8 lines); the listed folders with contents of some size all have an own part (size
 * less contents) that is a whole, non-zero number of 512-byte blocks, and not all a size that is; or,
 * neither those sizes nor those own parts being all whole blocks, at least 8 lines. Read as totals, a
 * listed folder's own size is its size minus its contents'; unless the sizes look like du -a's 1 KiB
 * blocks, or every listed folder's own part is 4 or less over at least 8 listed lines (units of 1 KiB
 * or more: PARSE_PATHS). Not read as totals, the listing is PARSE_PATHS when at least 8 listed sizes are
 * above 0, all multiples of 4, no listed node holds another and some size is no whole block (du -s
 * DIR/*), or when every listed folder comes after its contents, at least 8 lines are listed, no listed
 * node is bigger than the nearest listed folder above it, and some listed folder with contents of some
 * size is no whole block (du -m). Returns whether it read totals.
 */
export function folderTotalsByReference(
  sink: NodeSink,
  listedAt: ReadonlyMap<number, number>,
  firstSeen: readonly number[],
  mode: "own" | "total" | undefined,
): boolean {
  if (mode === "own") return false;
  const n = sink.length;
  const children: number[][] = Array.from({ length: n }, () => []);
  for (let i = 0; i < n; i++) if (sink.parentOf[i] !== -1) children[sink.parentOf[i]].push(i);
  const listed = (i: number) => listedAt.has(i);
  const contentsOf = (i: number): number => children[i].reduce((sum, c) => sum + standsFor(c), 0);
  const standsFor = (i: number): number => (listed(i) ? sink.ownSize[i] : contentsOf(i));
  const below = (i: number): number[] => children[i].flatMap((c) => [c, ...below(c)]);
  const folders = [...listedAt.keys()].filter((i) => children[i].length > 0);
  if (mode === undefined) {
    const afterContents = folders.every((f) => below(f).every((d) => firstSeen[d] < (listedAt.get(f) ?? 0)));
    const beforeContents = folders.every((f) => below(f).every((d) => firstSeen[d] > (listedAt.get(f) ?? 0)));
    const byLine = [...listedAt.entries()].sort((a, b) => a[1] - b[1]).map(([i]) => sink.ownSize[i]);
    const biggestFirst = byLine.length >= 8 && byLine.every((size, k) => k === 0 || size <= byLine[k - 1]);
    const covers = folders.every((f) => sink.ownSize[f] >= contentsOf(f));
    const sized = folders.some((f) => contentsOf(f) > 0);
    const sizes = [...listedAt.keys()].map((i) => sink.ownSize[i]).filter((size) => size !== 0);
    const fours = sizes.length >= 8 && sizes.every((size) => size % 4 === 0);
    const whole = (size: number) => size > 0 && size % 512 === 0;
    // find -printf '%k' or '%b' (disk blocks) read as own sizes: at least 8 listed sizes above 0, every
    // one a multiple of 4, not every listed size a whole 512, and every listed folder with contents under 1,024.
    const ownUnlessBlocks = (): false => {
      const allWhole = [...listedAt.keys()].every((i) => sink.ownSize[i] % 512 === 0);
      if (fours && !allWhole && folders.length > 0 && folders.every((f) => sink.ownSize[f] < 1024))
        throw new EspalierError("PARSE_PATHS", "own sizes read as disk blocks", { line: 1, column: 1 });
      return false;
    };
    if (!(covers && sized)) {
      const allWhole = [...listedAt.keys()].every((i) => sink.ownSize[i] % 512 === 0);
      // du -s DIR/* (1 KiB blocks): besides, a quarter or more of the sizes above 0 at most 256.
      const smallBlocks = sizes.filter((size) => size <= 256).length * 4 >= sizes.length;
      if (fours && folders.length === 0 && !allWhole && smallBlocks)
        throw new EspalierError("PARSE_PATHS", "flat sizes read as 1 KiB blocks", { line: 1, column: 1 });
      // du -s --apparent-size DIR/* (whole KiB, rounded up), du -sm DIR/*: at least 8 sizes above 0, a
      // quarter or more of them 1 to 4, and those 1 or not all one number.
      const upToFour = sizes.filter((size) => size <= 4);
      const mixed = upToFour.includes(1) || new Set(upToFour).size > 1;
      if (folders.length === 0 && sizes.length >= 8 && upToFour.length * 4 >= sizes.length && mixed)
        throw new EspalierError("PARSE_PATHS", "flat sizes read as whole MiB", { line: 1, column: 1 });
      const nearestListedAbove = (i: number): number => {
        let p = sink.parentOf[i];
        while (p !== -1 && !listed(p)) p = sink.parentOf[p];
        return p;
      };
      const underTotals = [...listedAt.keys()].every((i) => {
        const p = nearestListedAbove(i);
        return p === -1 || sink.ownSize[p] >= sink.ownSize[i];
      });
      const someNotWhole = folders.some((f) => contentsOf(f) > 0 && sink.ownSize[f] % 512 !== 0);
      if (afterContents && folders.length > 0 && listedAt.size >= 8 && underTotals && someNotWhole)
        throw new EspalierError("PARSE_PATHS", "totals rounded up to blocks", { line: 1, column: 1 });
      return ownUnlessBlocks();
    }
    const sizedFolders = folders.filter((f) => contentsOf(f) > 0);
    const linesWhole = sizedFolders.every((f) => whole(sink.ownSize[f]));
    const ownWhole = sizedFolders.every((f) => whole(sink.ownSize[f] - contentsOf(f)));
    if (!(afterContents || (beforeContents && biggestFirst))) {
      if (linesWhole && !ownWhole) return ownUnlessBlocks();
      if (!(ownWhole && !linesWhole) && listedAt.size < 8) return false;
    }
    // du -a without -b (1 KiB blocks): at least 8 listed sizes above 0, every one a multiple of 4, and
    // some listed folder whose own part (its size less its contents) is under 1,024.
    const small = folders.some((f) => sink.ownSize[f] - contentsOf(f) < 1024);
    if (fours && small)
      throw new EspalierError("PARSE_PATHS", "sizes read as 1 KiB blocks", { line: 1, column: 1 });
    if (listedAt.size >= 8 && folders.every((f) => sink.ownSize[f] - contentsOf(f) <= 4))
      throw new EspalierError("PARSE_PATHS", "totals in units of 1 KiB or more", { line: 1, column: 1 });
  }
  const contents = new Map(folders.map((f) => [f, contentsOf(f)]));
  for (const [f, c] of contents) {
    if (sink.ownSize[f] < c) {
      const line = listedAt.get(f) ?? 0;
      throw new EspalierError("BAD_SIZE", `line ${line}: folder smaller than its contents`, {
        line,
        column: 1,
      });
    }
  }
  for (const [f, c] of contents) sink.ownSize[f] -= c;
  return true;
}
