import { Buffer } from "node:buffer";
import { execFileSync } from "node:child_process";
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";
import { isGnuTool } from "../helpers/file-tree.js";

// Field tests: names in Latin-1 bytes (ISO/IEC 8859-1: 0xE9 e-acute, 0xEF i-diaeresis), as a folder
// named on another system or a spreadsheet's old export holds them. In UTF-8 (RFC 3629) such a byte
// leads a sequence the next byte does not continue, so each reads as U+FFFD (WHATWG Encoding Standard,
// UTF-8 decoder): the tree printed "caf\uFFFD-menu.txt" with no word about it, exit 0.
// The count is checked against GNU grep in a UTF-8 locale, whose "." matches no byte that is not UTF-8
// (grep -c -a -v -x '.*' counts the lines holding one), and the conversion against iconv (glibc).
const gnu = isGnuTool("find") && isGnuTool("grep");
const latin1 = (text: string) => Buffer.from(text, "latin1");

let base = "";
beforeAll(() => {
  if (!gnu) return;
  base = mkdtempSync(join(tmpdir(), "espalier-not-utf8-"));
  // An invented bakery's shared folder, three names written by an old system in Latin-1.
  const root = join(base, "bakery");
  mkdirSync(join(root, "menus"), { recursive: true });
  for (const [name, bytes] of [
    ["menus/caf\xe9-menu.txt", 120],
    ["menus/na\xefve-plan.txt", 340],
    ["menus/pr\xe9-order.csv", 56],
    ["menus/weekly.txt", 900],
    ["recipes.txt", 2048],
  ] as const)
    writeFileSync(Buffer.concat([latin1(`${root}/`), latin1(name)]), Buffer.alloc(bytes, 0x61));
});
afterAll(() => {
  if (base) rmSync(base, { recursive: true, force: true });
});

function sh(script: string): Buffer {
  return execFileSync("sh", ["-c", script], { cwd: base, env: { ...process.env, LC_ALL: "C.UTF-8" } });
}

describe("names whose bytes are not UTF-8", () => {
  it.skipIf(!gnu)(
    "a find listing of Latin-1 names is read with a UNDECODABLE_BYTES note counting its lines",
    async () => {
      const listing = sh("find bakery -printf '%s\\t%p\\n' | sort -k2");
      const count = Number(
        sh("find bakery -printf '%s\\t%p\\n' | sort -k2 | grep -c -a -v -x '.*'").toString(),
      );
      expect(count).toBe(3);
      const r = await cli(["-", "--format", "json"], { stdin: listing });
      expect(r.code).toBe(0);
      const notes = JSON.parse(r.stdout).input.notes;
      expect(notes).toHaveLength(1);
      expect(notes[0].code).toBe("UNDECODABLE_BYTES");
      expect(notes[0].message).toMatch(new RegExp(`^${count} lines hold bytes that are not UTF-8`));
      // The first such line, as the listing numbers its lines.
      const first =
        listing
          .toString("latin1")
          .split("\n")
          .findIndex((line) => /[\x80-\xff]/.test(line)) + 1;
      expect(notes[0].line).toBe(first);
      expect(r.stderr).toMatch(/iconv -f latin1 -t utf-8.*\[UNDECODABLE_BYTES\]\n$/);
      // The text header says it, so standard output alone does.
      const text = await cli(["-"], { stdin: listing });
      expect(text.stdout.split("\n")[0]).toContain("3 entries not UTF-8, read with U+FFFD");
    },
  );

  it.skipIf(!gnu)(
    "converted with iconv -f latin1 -t utf-8 it has no note and its names read right",
    async () => {
      const converted = sh("find bakery -printf '%s\\t%p\\n' | iconv -f latin1 -t utf-8");
      const r = await cli(["-", "--format", "json"], { stdin: converted });
      expect(r.code).toBe(0);
      const read = JSON.parse(r.stdout);
      expect(read.input.notes).toBeUndefined();
      expect(r.stdout).toContain("caf\u00e9-menu.txt");
    },
  );

  it("a name that writes U+FFFD itself in UTF-8 is no UNDECODABLE_BYTES", async () => {
    const r = await cli(["-", "--format", "json", "--units", "bytes"], {
      stdin: "10\tbakery/\uFFFD-stamp.txt\n20\tbakery/b.txt\n",
    });
    expect(r.code).toBe(0);
    expect(JSON.parse(r.stdout).input.notes).toBeUndefined();
  });

  it("a CSV table whose name cells are Latin-1 is read with a UNDECODABLE_BYTES note counting its rows", async () => {
    // An invented bakery's regions, exported by an old spreadsheet; rows 2 and 4 hold 0xE9 and 0xE8.
    const table = latin1(
      "id,parent,name,size\n1,,Bakery,0\n2,1,R\xe9gion Nord,10\n3,1,Sud,20\n4,2,Caf\xe8,5\n",
    );
    const r = await cli(["-", "--format", "json"], { stdin: table });
    expect(r.code).toBe(0);
    const read = JSON.parse(r.stdout);
    expect(read.input.notes).toEqual([expect.objectContaining({ code: "UNDECODABLE_BYTES", line: 3 })]);
    expect(read.input.notes[0].message).toMatch(/^2 rows hold/);
    // The two names stay apart and keep their sizes (10 + 5 under R\uFFFDgion Nord).
    expect(read.totals.size).toBe(35);
    const converted = await cli(["-", "--format", "json"], { stdin: table.toString("latin1") });
    expect(JSON.parse(converted.stdout).input.notes).toBeUndefined();
  });

  it("a CSV table whose ids are Latin-1 is read with a UNDECODABLE_BYTES note at the first such row", async () => {
    // An id in Latin-1 (0xE9, 0xF4) and the parent cell that names it: linked by their bytes, three rows.
    const table = latin1("id,parent,size\nd\xe9p\xf4t,,1\nstall,d\xe9p\xf4t,2\nkiosk,stall,3\n");
    const r = await cli(["-", "--format", "json"], { stdin: table });
    expect(r.code).toBe(0);
    const read = JSON.parse(r.stdout);
    expect(read.input.notes).toEqual([expect.objectContaining({ code: "UNDECODABLE_BYTES", line: 2 })]);
    expect(read.input.notes[0].message).toMatch(/^2 rows hold/);
    expect(read.totals.nodes).toBe(3);
  });
});
