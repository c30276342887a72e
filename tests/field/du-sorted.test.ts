import { execFileSync } from "node:child_process";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";
import { isGnuTool, writeFiles } from "../helpers/file-tree.js";

// Field tests: `du -ab DIR | sort -rn` (GNU coreutils du and sort, run here), the biggest first, puts
// every folder before its contents, so the listing was taken for own sizes (as find lists a folder
// before its contents) and each folder's total was added to its contents': /usr/share/doc/git read
// as 8.7 MiB where du -sb says 3.0 MiB, exit 0, nothing said. The checks are du's own numbers.
const gnuTools = isGnuTool("du") && isGnuTool("sort") && isGnuTool("find");

const files: Record<string, number> = {
  "ledger/a.csv": 1200,
  "ledger/b.csv": 40,
  "ledger/old/2019.csv": 9000,
  "sails/plan.md": 4097,
  "sails/deep/er/x.bin": 70000,
  "notes.txt": 12,
};
let base = "";
const run = (cmd: string, args: string[], input?: string) =>
  execFileSync(cmd, args, { cwd: base, encoding: "utf8", ...(input === undefined ? {} : { input }) });

beforeAll(() => {
  if (!gnuTools) return;
  base = mkdtempSync(join(tmpdir(), "espalier-du-sorted-"));
  writeFiles(join(base, "harbor"), files);
});

afterAll(() => {
  if (base) rmSync(base, { recursive: true, force: true });
});

const jsonOf = async (listing: string) => {
  const result = await cli(["-", "--format", "json"], { stdin: listing });
  expect(result.code).toBe(0);
  return JSON.parse(result.stdout);
};

describe.skipIf(!gnuTools)("a du -ab listing sorted biggest first (sort -rn)", () => {
  it("is read as folder totals: the root's size is du -sb's, each folder's as du gives it", async () => {
    const listing = run("sort", ["-rn"], run("du", ["-ab", "harbor"]));
    const doc = await jsonOf(listing);
    expect(doc.input.folderTotals).toBe(true);
    expect(doc.totals.size).toBe(Number(run("du", ["-sb", "harbor"]).split("\t")[0]));
    const ledger = doc.root.children.find((c: { name: string }) => c.name === "ledger");
    expect(ledger.size).toBe(Number(run("du", ["-sb", "harbor/ledger"]).split("\t")[0]));
    const text = await cli(["-", "--budget", "8"], { stdin: listing });
    expect(text.stdout.split("\n")[0]).toContain("; folder sizes read as totals with contents;");
  });

  it("reads as the unsorted listing does: the same nodes and sizes", async () => {
    const listing = run("du", ["-ab", "harbor"]);
    const sorted = await jsonOf(run("sort", ["-rn"], listing));
    const plain = await jsonOf(listing);
    expect(sorted.totals).toEqual(plain.totals);
  });

  it("cut to its 8 biggest lines (head -8) still gives the top folder du's total", async () => {
    const listing = run("head", ["-8"], run("sort", ["-rn"], run("du", ["-ab", "harbor"])));
    const doc = await jsonOf(listing);
    expect(doc.totals.size).toBe(Number(run("du", ["-sb", "harbor"]).split("\t")[0]));
  });

  it("a find listing sorted so stays own sizes: its folders hold more than their entries", async () => {
    const listing = run("find", ["harbor", "-printf", "%s\\t%p\\n"]);
    const sorted = await jsonOf(run("sort", ["-rn"], listing));
    expect(sorted.input.folderTotals).toBeUndefined();
    expect(sorted.totals).toEqual((await jsonOf(listing)).totals);
  });
});

// Field tests: `du -ab DIR | sort -k2` (sorted by path) puts each folder before its contents, as find
// lists, so it was read as own sizes: /usr/share/doc read as 366.6 MiB where du -sb says 107.2 MiB
// (112,402,968 B), exit 0, nothing said. The checks are du's own numbers.
describe.skipIf(!gnuTools)("a du -ab listing sorted by path (sort -k2) or as text (sort)", () => {
  const duSb = (dir: string) => Number(run("du", ["-sb", dir]).split("\t")[0]);

  it.each([
    { by: "path", keys: ["-k2"] },
    { by: "text", keys: [] },
  ])(
    "sorted by $by: read as folder totals, the root's size du -sb's, each folder's as du gives it",
    async ({ keys }) => {
      const listing = run("sort", keys, run("du", ["-ab", "harbor"]));
      const doc = await jsonOf(listing);
      expect(doc.input.folderTotals).toBe(true);
      expect(doc.totals.size).toBe(duSb("harbor"));
      const ledger = doc.root.children.find((c: { name: string }) => c.name === "ledger");
      expect(ledger.size).toBe(duSb("harbor/ledger"));
      expect(doc.input.notes).toBeUndefined();
    },
  );

  it("a find listing sorted by path stays own sizes, its root's size du -sb's too", async () => {
    const listing = run("sort", ["-k2"], run("find", ["harbor", "-printf", "%s\\t%p\\n"]));
    const doc = await jsonOf(listing);
    expect(doc.input.folderTotals).toBeUndefined();
    expect(doc.input.notes).toBeUndefined();
    expect(doc.totals.size).toBe(duSb("harbor"));
  });
});
