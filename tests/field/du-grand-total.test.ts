import { execFileSync } from "node:child_process";
import { existsSync, mkdtempSync, readdirSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { summarySchema } from "../../src/render/summary-schema.js";
import { cli } from "../helpers/cli.js";
import { isGnuTool, writeFiles } from "../helpers/file-tree.js";

// Field tests: `du -abc DIR` and `du -sbc *` (GNU coreutils, run here) end with a grand total,
// `SIZE<TAB>total`. espalier read that line as a top-level file named total: the listing's size
// doubled (du -abc: 2 nodes more, one a root espalier added; du -sbc *: a "total" entry as big as all
// the rest), exit 0. The sizes checked are du's own numbers: the total line, and du -sb for the folder.
const isGnuDu = isGnuTool("du");

const files: Record<string, number> = {
  "ledger/a.csv": 1200,
  "ledger/b.csv": 40,
  "sails/plan.md": 4097,
  "sails/deep/er/x.bin": 70000,
  "notes.txt": 12,
};
let base = "";
const du = (args: string[], cwd = base) => execFileSync("du", args, { cwd, encoding: "utf8" });
const lastSize = (listing: string) => Number(listing.trimEnd().split("\n").pop()!.split("\t")[0]);

beforeAll(() => {
  if (!isGnuDu) return;
  base = mkdtempSync(join(tmpdir(), "espalier-du-total-"));
  writeFiles(join(base, "harbor"), files);
});

afterAll(() => {
  if (base) rmSync(base, { recursive: true, force: true });
});

describe.skipIf(!isGnuDu)("a du -c listing's grand total line", () => {
  it("du -abc DIR: is left out, the root is DIR with du -sb's size, and a note says so", async () => {
    const listing = du(["-abc", "harbor"]);
    expect(listing.trimEnd().split("\n").pop()).toMatch(/^\d+\ttotal$/);
    const result = await cli(["-", "--format", "json"], { stdin: listing });
    expect(result.code).toBe(0);
    const doc = summarySchema.parse(JSON.parse(result.stdout));
    const folder = Number(du(["-sb", "harbor"]).split("\t")[0]);
    expect(doc.totals.size).toBe(folder);
    expect(doc.totals.size).toBe(lastSize(listing));
    expect(doc.root.name).toBe("harbor");
    // Every line but the total is a node: the folders and files du listed.
    expect(doc.totals.nodes).toBe(listing.trimEnd().split("\n").length - 1);
    const lines = listing.trimEnd().split("\n").length;
    expect(doc.input?.notes).toEqual([expect.objectContaining({ code: "TOTAL_LINE_LEFT_OUT", line: lines })]);
    expect(result.stderr).toMatch(
      new RegExp(`^espalier: note: <stdin>:${lines}: .*\\[TOTAL_LINE_LEFT_OUT\\]\\n$`),
    );
    const text = await cli(["-", "--budget", "10"], { stdin: listing });
    expect(text.stdout.split("\n")[0]).toContain(`; line ${lines} read as a grand total, left out; `);
  });

  it("du -sbc *: is left out, and the entries add up to du's total", async () => {
    const listing = du(["-sbc", "ledger", "sails", "notes.txt"], join(base, "harbor"));
    const result = await cli(["-", "--format", "json"], { stdin: listing });
    const doc = summarySchema.parse(JSON.parse(result.stdout));
    expect(doc.totals.size).toBe(lastSize(listing));
    expect(doc.root.children.map((c) => c.name).sort()).toEqual(["ledger", "notes.txt", "sails"]);
  });

  it("a diff of two du -abc listings shows no total added, removed or resized", async () => {
    const before = du(["-abc", "harbor"]);
    writeFileSync(join(base, "harbor", "ledger", "c.csv"), Buffer.alloc(333, 0x61));
    const after = du(["-abc", "harbor"]);
    const result = await cli(["diff", "old.du", "-", "--format", "json"], {
      stdin: after,
      files: { "old.du": before },
    });
    expect(result.code).toBe(0);
    const doc = JSON.parse(result.stdout);
    expect(doc.changes).toMatchObject({ added: 1, removed: 0 });
    expect(doc.totals.delta).toBe(lastSize(after) - lastSize(before));
    expect(doc.notes.map((n: { version: string }) => n.version)).toEqual(["OLD", "NEW"]);
  });
});

describe("a last line named total that is no grand total", () => {
  it("is read as a file: its size is not what the other lines add up to", async () => {
    const listing = "10\tharbor/a\n20\tharbor\n7\ttotal\n";
    // A folder's own size of 10 shows no unit (UNIT_NOT_SAID): --units bytes says it.
    const result = await cli(["-", "--format", "json", "--units", "bytes"], { stdin: listing });
    const doc = JSON.parse(result.stdout);
    expect(doc.root.children.map((c: { name: string }) => c.name)).toEqual(["harbor", "total"]);
    expect(doc.input.notes).toBeUndefined();
  });

  it("is read as a file when it is not the last line listed", async () => {
    const listing = "10\ttotal\n10\tharbor/a\n";
    const result = await cli(["-", "--format", "json"], { stdin: listing });
    expect(JSON.parse(result.stdout).totals.size).toBe(20);
  });
});

// Field tests: du under another language (GNU gettext reads LANGUAGE when the locale is C.UTF-8; du
// printed "insgesamt" under LANGUAGE=de here) names the grand total line in that language, and
// espalier read it as a file: /usr/share/doc/git read as 6.1 MiB where du -sb says 3.0 MiB, exit 0.
// Each language is one whose coreutils message catalog is on this machine; the check is du's total.
const catalogs = "/usr/share/locale";
const languages = existsSync(catalogs)
  ? readdirSync(catalogs).filter((l) => existsSync(join(catalogs, l, "LC_MESSAGES", "coreutils.mo")))
  : [];
const inLanguage = (language: string, args: string[]) =>
  execFileSync("du", args, {
    cwd: base,
    encoding: "utf8",
    env: { ...process.env, LC_ALL: "C.UTF-8", LANGUAGE: language },
  });

describe.skipIf(!isGnuDu || languages.length === 0)(
  "a du -c listing's grand total line in another language",
  () => {
    it("is left out in every language whose coreutils catalog is here: the size is du's total", async () => {
      for (const language of languages) {
        const listing = inLanguage(language, ["-abc", "harbor"]);
        const result = await cli(["-", "--format", "json"], { stdin: listing });
        expect(result.code).toBe(0);
        const doc = JSON.parse(result.stdout);
        expect({ language, size: doc.totals.size }).toEqual({ language, size: lastSize(listing) });
        expect(doc.input.notes).toEqual([expect.objectContaining({ code: "TOTAL_LINE_LEFT_OUT" })]);
      }
    });
  },
);

describe("a last line in a word no catalog gives, whose size is the others' sum", () => {
  it("is read as an entry, and a LAST_LINE_LIKE_TOTAL note says it may be a total", async () => {
    // Byte sizes of some tens or more: a quarter of them 1 to 4 would read as du -s --apparent-size's KiB.
    const sizes = [1200, 305, 77, 15, 22, 31, 48, 59];
    const files = sizes.map((size, k) => `${size}\tledger/${k}.csv\n`).join("");
    const listing = `${files}${sizes.reduce((a, b) => a + b)}\tsumma\n`;
    const result = await cli(["-", "--format", "json"], { stdin: listing });
    const doc = JSON.parse(result.stdout);
    expect(doc.totals.size).toBe(2 * 1757);
    expect(doc.input.notes).toEqual([expect.objectContaining({ code: "LAST_LINE_LIKE_TOTAL", line: 9 })]);
    const text = await cli(["-", "--budget", "6"], { stdin: listing });
    expect(text.stdout.split("\n")[0]).toContain("; line 9 may be a grand total, counted; ");
  });

  it("says nothing of a few lines that add up, or of a last name with a dot (a file joined from the others)", async () => {
    const parts = "1200\tp1\n305\tp2\n15\tp3\n22\tp4\n17\tp5\n31\tp6\n26\tp7\n48\tp8\n";
    for (const listing of ["5\ta\n5\tb\n", "1\ta/x\n2\ta/y\n3\tb\n", `${parts}1664\twhole.bin\n`]) {
      // Byte sizes, said so (--units bytes): nine entries side by side would otherwise note UNIT_NOT_SAID.
      const doc = JSON.parse(
        (await cli(["-", "--format", "json", "--units", "bytes"], { stdin: listing })).stdout,
      );
      expect(doc.input.notes).toBeUndefined();
    }
  });
});
