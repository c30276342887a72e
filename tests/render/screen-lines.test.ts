import { mkdtemp, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { keyFacts, keyLines, keyRows } from "../../src/render/key-line.js";
import { lineGroups } from "../../src/render/line-groups.js";
import { lineParts } from "../../src/render/line-parts.js";
import { MARK } from "../../src/render/marks.js";
import { screenLines } from "../../src/render/screen-lines.js";
import { prepare, summarize } from "../../src/summarize.js";
import { cli } from "../helpers/cli.js";
import { makeTree } from "../helpers/make-tree.js";

describe("screenLines(groups, parts, options)", () => {
  const tree = makeTree("R{ledger-core:40000{a:1,b:2},riptide-rpc{kelp-log:5{q:123456,r}}}");
  const result = summarize(prepare(tree), { foci: [], budget: 3, importance: "depth", chains: true });
  const groups = lineGroups(result.view, true);
  const at = (width: number) => screenLines(groups, lineParts, { units: "plain", sizes: true, width });

  it("keeps every size while every line holds its own", () => {
    const wide = at(80);
    expect(wide.sizesLeftOut).toBe(false);
    expect(wide.lines).toEqual([
      ". R  8 nodes, 163,464",
      "  . ledger-core  3 nodes, 40,003  (hidden: 2 children, 2 nodes, 3)",
      "  . riptide-rpc / kelp-log  4 nodes, 123,461  (hidden: 2 nodes, 123,456)",
    ]);
  });

  it("keeps a line's sizes with its fold's count alone when none of its lines is below it", () => {
    // At 46 columns "  . riptide-rpc / kelp-log  4 nodes, 123k  (2 hidden, 123k)" does not fit with
    // its names at 4 columns each: its fold, all below the line, says its count alone (4 = 2 names +
    // 2 hidden); the fold's size is the line's, 123k, less the line's own.
    const mid = at(46);
    expect(mid.sizesLeftOut).toBe(false);
    expect(mid.sizesCut).toBe(false);
    // ledger-core's line, all below it folded too, keeps its name whole the same way rather than cut
    // it to keep the fold's size (3 = 40,003 less the line's own 40,000).
    expect(mid.lines).toEqual([
      ". R  8 nodes, 163,464",
      "  . ledger-core  3 nodes, 40,003  (2 hidden)",
      "  . ripti… / kelp-…  4 nodes, 123k  (2 hidden)",
    ]);
  });

  it("cuts one line's sizes, saying so, when only that line cannot hold them; the others keep theirs", () => {
    // In bytes, which have no shorter form, at 46 columns "  . rip… / kel…  4 nodes, 120.6 KiB
    // (2 hidden)" is 47: the line says `size cut` where its sizes were and keeps its count (4 = 2
    // names + 2 hidden); the other lines keep their sizes, ledger-core's its name whole with its
    // fold's count alone (all below it is folded: the fold's size is the line's less its own).
    const mid = screenLines(groups, lineParts, { units: "bytes", sizes: true, width: 46 });
    expect(mid.sizesLeftOut).toBe(false);
    expect(mid.sizesCut).toBe(true);
    expect(mid.lines).toEqual([
      ". R  8 nodes, 159.6 KiB",
      "  . ledger-core  3 nodes, 39.1 KiB  (2 hidden)",
      "  . rip… / kel…  4 nodes, size cut  (2 hidden)",
    ]);
    // The key says what `size cut` means for the line above it (R: 40,008 is not 40,003 + a size shown).
    const key = keyLines("summary", keyFacts(mid.parts, {}, mid), 46).join("\n");
    expect(key).toContain("'size cut'");
  });

  it("leaves sizes out of every line when a line cannot even say that its sizes were cut", () => {
    // At 40 columns "  . riptide-rpc / kelp-log  4 nodes, 123k  (2 hidden, 123k)" needs its fold's
    // size gone (or the line's), and `4 nodes, size cut` does not fit either: the whole screen prints counts
    // instead, and every count adds up from the lines (8 = 1 + 3 + 4; 3 = 1 + 2 hidden; 4 = 2 names +
    // 2 hidden), the chain's " / " kept.
    const narrow = at(40);
    expect(narrow.sizesLeftOut).toBe(true);
    expect(narrow.lines).toEqual([
      ". R  8 nodes",
      "  . ledger-core  3 nodes  (2 hidden)",
      "  . ripti… / kelp-…  4 nodes  (2 hidden)",
    ]);
    expect(narrow.namesCut).toBe(true);
  });
});

describe("keyLines(kind, facts, width)", () => {
  const facts = { marks: new Set([MARK.path, MARK.other]), chains: true };

  it("is one line from KEY_ONE_ROW columns, two below it", () => {
    expect(keyRows(undefined)).toBe(1);
    expect(keyRows(60)).toBe(1);
    expect(keyRows(59)).toBe(2);
    expect(keyLines("diff", facts, 80)).toHaveLength(1);
    expect(keyLines("diff", facts, 59)).toHaveLength(2);
  });

  it("says on its second line what the width took from the lines, most needed first", () => {
    const cut = { ...facts, sizesLeftOut: true, countsCut: true, namesCut: true };
    // Where the first line has room beside the marks, parts go there too, so more is said.
    expect(keyLines("summary", cut, 59)).toEqual([
      "key: ':' on the way to a focus, '.' other; '?' count cut",
      "  counts: all below; sizes cut; a / b: only child; '…' cut",
    ]);
    // Where a part does not fit, a later one that does is said (the cut name here, not the '?' or
    // the chain): on 4376903 the key said the marks and the numbers only.
    expect(keyLines("summary", cut, 40)).toEqual([
      "key: ':' on path, '.' other; '…' cut",
      "  counts: all below; sizes cut",
    ]);
    expect(keyLines("diff", { ...facts, changesCut: true, namesCut: true }, 50)).toEqual([
      "key: ':' changed/above, '.' unchanged; changes cut",
      "  totals: all below; a / b: only child; '…' cut",
    ]);
    // From 60 columns the same facts share the one line, every part said in fewer words before one goes.
    expect(keyLines("summary", cut, 100)).toEqual([
      "key: ':' on path, '.' other; counts: all below; sizes cut; '?' count cut; '…' cut; a / b: only child",
    ]);
  });
});

describe("a diff at 40, 80 and 200 columns (field test: '?' where a bare count fit)", () => {
  const args = [
    "diff",
    "fixtures/examples/packages-main.paths",
    "fixtures/examples/packages-branch.paths",
    "--budget",
    "14",
  ];

  it("keeps every count at 40 columns: names are cut, sizes leave every line, the key says so", async () => {
    const r = await cli([...args, "--width", "40"]);
    expect(r.code).toBe(0);
    const lines = r.stdout.trimEnd().split("\n");
    const key = lines.findIndex((l) => l.startsWith("key: "));
    // 11 = 1 (tidewater) + 4 + 5 + 1 hidden; 4 = 1 + 1 + 1 + 1 hidden; 5 = 1 + 4 hidden.
    expect(lines.slice(key)).toEqual([
      "key: ':' a change or on the way to one",
      "  counts: all below; sizes cut; '…' cut",
      // The header's kinds grouped (one line fewer) leave a line that the fit gave the key first: a
      // screen with one more tree line needed a third key row, and the key keeps the rows counted;
      // it says the line without a count there (5 = 1 + 4 hidden).
      "  no count: 1+hidden",
      ": tide…  11 nodes  (1 hidden, 0 changed)",
      "  : led…  4 nodes  (1 hidden, 0 changed)",
      "    : [resized] estuary-path",
      "    : [removed] shoal-codec",
      "  : riptide-rpc  (4 hidden, 1 changed)",
    ]);
    expect(r.stdout).not.toMatch(/ {2}\? {2}|\(hidden\)/);
  });

  it("keeps sizes at 80 and 200 columns, where every line holds its own", async () => {
    for (const width of ["80", "200"]) {
      const r = await cli([...args, "--width", width]);
      expect(r.stdout).toContain(": tidewater  11 nodes, 114.9 KiB, net +1.3 KiB\n");
      expect(r.stdout).toContain("    . spar  4.0 KiB\n");
    }
  });
});

describe("a diff whose lines fold all below them (field defect: 'sizes cut' at 60 to 100 columns)", () => {
  // Field defect: a diff of two listings of a system folder printed counts only below about 100
  // columns, each line needing `N nodes, S, net D  (k hidden, T; c changed, net E)`. An invented
  // print shop's archive: 14 folders of 40 files; NEW drops one file a folder and grows another.
  const oldLines: string[] = [];
  const newLines: string[] = [];
  for (let d = 0; d < 14; d++)
    for (let f = 0; f < 40; f++) {
      const path = `proofs-${d}/plate-${f}.tif`;
      const size = 20_000 + 1_000 * d + 37 * f;
      oldLines.push(`${size}\t${path}`);
      if (f !== d) newLines.push(`${f === 39 ? size + 4_096 : size}\t${path}`);
    }
  const stdin = `${oldLines.join("\n")}\n`;

  it("keeps every line's sizes from 70 columns, the fold saying its count alone", async () => {
    const dir = await mkdtemp(join(tmpdir(), "espalier-fold-"));
    const newFile = join(dir, "new.paths");
    await writeFile(newFile, `${newLines.join("\n")}\n`);
    for (const width of [70, 80]) {
      const r = await cli(["diff", "-", newFile, "--budget", "22", "--width", String(width)], { stdin });
      expect(r.code, r.stderr).toBe(0);
      const lines = r.stdout.trimEnd().split("\n");
      const tree = lines.filter((l) => /^ *[:.] /.test(l));
      // Each folder's line whose 40 files are all folded: its count, NEW's size, its net change.
      const folders = tree.filter((l) => / {2}\(40 hidden/.test(l));
      expect(folders.length, r.stdout).toBeGreaterThan(10);
      for (const line of folders) {
        expect(line, `${width}:\n${r.stdout}`).toMatch(
          / {2}41 nodes, [0-9.]+ (KiB|MiB), net [+-][0-9.]+ (KiB|B) {2}\(40 hidden(, 2 changed)?\)$/,
        );
        expect(line.length).toBeLessThanOrEqual(width);
      }
      expect(r.stdout).not.toContain("sizes cut");
    }
  });
});
