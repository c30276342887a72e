import { execFileSync } from "node:child_process";
import { mkdtempSync, readdirSync, rmSync, statSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { summarySchema } from "../../src/render/summary-schema.js";
import { cli } from "../helpers/cli.js";
import { isGnuTool, writeFiles } from "../helpers/file-tree.js";

// Field tests: `lsblk -J -b` gives each block device's size in bytes, a disk's with its partitions
// inside it. The fields are those lsblk (util-linux) printed on this machine; the `children` array of
// partitions is as util-linux nests them (from memory: this machine's disk has none). Read with
// --start-at /blockdevices, the disk's 256 GiB and its partitions' were added up: a 512 GiB disk,
// exit 0, nothing said.
const GIB = 1024 ** 3; // IEC 80000-13: 1 GiB = 2^30 bytes.
const disk = (parts: number[]) => ({
  blockdevices: [
    {
      name: "vda",
      "maj:min": "254:0",
      rm: false,
      size: 256 * GIB,
      ro: false,
      type: "disk",
      mountpoints: [null],
      children: parts.map((size, k) => ({
        name: `vda${k + 1}`,
        "maj:min": `254:${k + 1}`,
        rm: false,
        size,
        ro: false,
        type: "part",
        mountpoints: [k === 0 ? "/" : null],
      })),
    },
  ],
});
// A boot partition of 1 GiB and the rest less 1 MiB (a partition table's room), as a disk is laid out.
const lsblk = JSON.stringify(disk([255 * GIB - 1024 ** 2, GIB]), null, 3);
const args = ["lsblk.json", "--start-at", "/blockdevices", "--format", "json"];

describe("sizes of nodes that hold their children's (lsblk -J -b)", () => {
  it("are read as own sizes with a SIZES_LIKE_TOTALS note, on standard error, in JSON and on the header", async () => {
    const result = await cli(args, { files: { "lsblk.json": lsblk } });
    expect(result.code).toBe(0);
    const doc = summarySchema.parse(JSON.parse(result.stdout));
    // Read as own sizes: the disk plus its partitions, as before, but said.
    expect(doc.totals.size).toBe(256 * GIB + 256 * GIB - 1024 ** 2);
    expect(doc.input?.notes).toEqual([expect.objectContaining({ code: "SIZES_LIKE_TOTALS" })]);
    expect(result.stderr).toMatch(
      /^espalier: note: lsblk\.json: every node with children .*\[SIZES_LIKE_TOTALS\]\n$/,
    );
    const text = await cli(["lsblk.json", "--start-at", "/blockdevices"], { files: { "lsblk.json": lsblk } });
    expect(text.stdout.split("\n")[0]).toMatch(
      /^summary: 3 nodes, size [0-9,]+; sizes may count children twice; /,
    );
  });

  it("with --folder-sizes total, give the disk's size as lsblk does, each partition's as its own", async () => {
    const result = await cli([...args, "--folder-sizes", "total"], { files: { "lsblk.json": lsblk } });
    expect(result.code).toBe(0);
    expect(result.stderr).toBe("");
    const doc = summarySchema.parse(JSON.parse(result.stdout));
    const given = JSON.parse(lsblk).blockdevices[0];
    expect(doc.totals.size).toBe(given.size);
    expect(doc.root.size).toBe(given.size);
    expect(doc.root.children.map((c) => c.size)).toEqual(given.children.map((c: { size: number }) => c.size));
    expect(doc.input?.folderTotals).toBe(true);
  });

  it("with --folder-sizes own, are read as own sizes without the note", async () => {
    const result = await cli([...args, "--folder-sizes", "own"], { files: { "lsblk.json": lsblk } });
    expect(result.stderr).toBe("");
    expect(JSON.parse(result.stdout).totals.size).toBe(512 * GIB - 1024 ** 2);
  });

  it("with --folder-sizes total, is BAD_SIZE where a node is smaller than its children", async () => {
    const over = JSON.stringify(disk([200 * GIB, 100 * GIB]), null, 3);
    const result = await cli([...args, "--folder-sizes", "total"], { files: { "lsblk.json": over } });
    expect(result.code).toBe(2);
    expect(result.stdout).toBe("");
    expect(result.stderr).toMatch(
      /node "vda" has the size 274877906944, less than the 322122547200 .*\[BAD_SIZE\]/,
    );
  });

  it("compare in a diff by the disk's size with --folder-sizes total: a partition grown into free room", async () => {
    const grown = JSON.stringify(disk([255 * GIB, GIB]), null, 3);
    const files = { "old.json": lsblk, "new.json": grown };
    const result = await cli(
      [
        "diff",
        "old.json",
        "new.json",
        "--start-at",
        "/blockdevices",
        "--folder-sizes",
        "total",
        "--format",
        "json",
      ],
      { files },
    );
    expect(result.code).toBe(0);
    const doc = JSON.parse(result.stdout);
    // The disk is as big as it was; vda1 grew by the 1 MiB the disk had free, which was the disk's own
    // part (its size less its partitions'): both resized.
    expect(doc.totals.old.size).toBe(256 * GIB);
    expect(doc.totals.new.size).toBe(256 * GIB);
    expect(doc.changes.resized).toBe(2);
    expect(doc.notes).toBeUndefined();
  });

  it("are said of a table whose rows hold their children's (a cost roll-up), and read with --folder-sizes total", async () => {
    const table = "id,parent,cost\nfleet,,900\nhulls,fleet,500\nsails,fleet,300\nrigging,sails,120\n";
    const result = await cli(["-", "--size-field", "cost", "--format", "json"], { stdin: table });
    expect(JSON.parse(result.stdout).input.notes).toEqual([
      expect.objectContaining({
        code: "SIZES_LIKE_TOTALS",
        message: expect.stringMatching(/node "fleet", row 1: 900, its children 800 and 1 more/),
      }),
    ]);
    const totals = await cli(["-", "--size-field", "cost", "--folder-sizes", "total", "--format", "json"], {
      stdin: table,
    });
    expect(JSON.parse(totals.stdout).totals.size).toBe(900);
  });

  it("are not said where a parent is smaller than its children (an org chart's costs)", async () => {
    const result = await cli([
      "fixtures/quillfeather-org.csv",
      "--parent-field",
      "manager",
      "--size-field",
      "cost",
    ]);
    expect(result.code).toBe(0);
    expect(result.stderr).toBe("");
  });

  it("--folder-sizes on a document read as values is USAGE (a value's size is its own bytes)", async () => {
    const result = await cli(["lsblk.json", "--folder-sizes", "total"], { files: { "lsblk.json": lsblk } });
    expect(result.code).toBe(2);
    expect(result.stdout).toBe("");
    expect(result.stderr).toMatch(
      /--folder-sizes reads path lists, node objects and tables only; this input is read as every value a node.*\[USAGE\]/,
    );
  });
});

// Field test: a folder and its files as node objects of their own sizes (fs.statSync of a folder
// written here: a directory's entry is 4,096 bytes on ext4, 40 and up on tmpfs), as a script that
// walks a disk writes them. Every folder is bigger than the few bytes below it, so the sizes passed
// the test of totals and the note said they might count children twice: 988 of 4,179 folders below
// /usr/share, /etc and two node_modules here, so listed, got it. Now a node's children must fill
// three quarters of its size first (a folder holding only a few small files here).
describe.skipIf(!isGnuTool("du"))("own sizes of a folder of a few small files", () => {
  it("are read as own, and no note says they may be totals", async () => {
    const base = mkdtempSync(join(tmpdir(), "espalier-own-"));
    try {
      writeFiles(join(base, "harbor"), { "tide.log": 120, "reef.svg": 300, "notes.txt": 12 });
      const node = (path: string, name: string): object => {
        const stat = statSync(path);
        return stat.isDirectory()
          ? {
              name,
              size: stat.size,
              children: readdirSync(path)
                .sort()
                .map((c) => node(join(path, c), c)),
            }
          : { name, size: stat.size };
      };
      const result = await cli(["-", "--format", "json"], {
        stdin: JSON.stringify(node(join(base, "harbor"), "harbor")),
      });
      expect(result.code).toBe(0);
      expect(result.stderr).toBe("");
      const doc = JSON.parse(result.stdout);
      expect(doc.input.notes).toBeUndefined();
      const du = execFileSync("du", ["-sb", "--apparent-size", join(base, "harbor")], { encoding: "utf8" });
      // GNU du -b: the folder with everything below it, each entry once: what own sizes add up to.
      expect(doc.totals.size).toBe(Number(du.split("\t")[0]));
    } finally {
      rmSync(base, { recursive: true, force: true });
    }
  });
});
