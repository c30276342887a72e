import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

// Field tests: file listings as find and stat print them with a space (not a tab) between the size
// and the path (`find DIR -printf '%s %p\n'`, `stat -c '%s %n'`), reduced to the invented tidewater
// monorepo. Read as plain paths, the size would become part of the first name and the summary would
// show no sizes at all, with exit 0.

async function run(stdin: string, args: string[] = []) {
  return cli(["-", "--input-format", "paths", "--format", "json", "--budget", "100", ...args], { stdin });
}

function paths(node: { path: string; children: unknown[] }): string[] {
  return [node.path, ...(node.children as (typeof node)[]).flatMap(paths)];
}

describe("a listing of sizes and absolute paths separated by a space", () => {
  const listing = [
    "4096 /srv/tidewater",
    "4096 /srv/tidewater/ledger",
    "1200 /srv/tidewater/ledger/main.c",
    "300 /srv/tidewater/ledger/read me.txt",
    "57 /srv/tidewater/VERSION",
    "",
  ].join("\n");

  it("reads the number before the first space as the size, the rest of the line as the path", async () => {
    const result = await run(listing);
    expect(result.stderr).toBe("");
    const json = JSON.parse(result.stdout);
    // 4096 + 4096 + 1200 + 300 + 57 (awk '{s+=$1} END {print s}' on the listing).
    expect(json.totals).toEqual({ nodes: 7, size: 9749 });
    expect(json.input.sizeUnit).toBe("bytes");
    expect(paths(json.root)).toEqual([
      "",
      "srv",
      "srv/tidewater",
      "srv/tidewater/ledger",
      "srv/tidewater/ledger/main.c",
      "srv/tidewater/ledger/read me.txt",
      "srv/tidewater/VERSION",
    ]);
  });

  it("reads `find .` paths the same way, and a path that holds spaces keeps them", async () => {
    const result = await run("4096 .\n12 ./a b/c d\n7 ./e\n");
    const json = JSON.parse(result.stdout);
    expect(json.totals).toEqual({ nodes: 4, size: 4115 });
    expect(paths(json.root)).toEqual(["", "a b", "a b/c d", "e"]);
  });

  it("says which line lacks the size when a later line has none", async () => {
    const result = await run("4096 /srv\n/srv/ledger\n");
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(/^espalier: <stdin>:2:1: .*line 1.*\[PARSE_PATHS\]\n$/);
  });

  it("leaves a plain path list whose names start with digits as names (no slash or ./ after the space)", async () => {
    const json = JSON.parse(
      (await run("2019 harbor survey/photo.jpg\n2020 harbor survey/photo.jpg\n")).stdout,
    );
    expect(json.totals.nodes).toBe(5);
    expect(paths(json.root)).toContain("2019 harbor survey/photo.jpg");
  });
});

describe("a Windows listing (dir /s /b, or sizes and full names from PowerShell)", () => {
  it("splits the paths on backslashes, the drive the root, so folders count and fold", async () => {
    const listing = [
      "C:\\tidewater\\ledger\\main.c",
      "C:\\tidewater\\ledger\\book.c",
      "C:\\tidewater\\VERSION",
      "",
    ].join("\r\n");
    const json = JSON.parse((await run(listing)).stdout);
    // C:, tidewater, ledger and its 2 files, VERSION: 6 nodes (was 3 top-level names, no folders).
    expect(json.totals.nodes).toBe(6);
    expect(json.root.name).toBe("C:");
    expect(paths(json.root)).toEqual([
      "",
      "tidewater",
      "tidewater/ledger",
      "tidewater/ledger/main.c",
      "tidewater/ledger/book.c",
      "tidewater/VERSION",
    ]);
  });

  it("reads a size before a tab too, and a network share under a root named /", async () => {
    const sized = JSON.parse((await run("40\tD:\\quay\\a.txt\n2\tD:\\quay\\b.txt\n")).stdout);
    expect(sized.totals).toEqual({ nodes: 4, size: 42 });
    const share = JSON.parse((await run("\\\\harbor\\docs\\a.txt\n")).stdout);
    expect(share.root.name).toBe("/");
    expect(paths(share.root)).toEqual(["", "harbor", "harbor/docs", "harbor/docs/a.txt"]);
  });
});

describe("a du -a listing (1 KiB blocks, not bytes)", () => {
  // GNU du without -b prints disk usage in 1 KiB blocks (its --block-size defaults to 1024, from
  // memory): on a file system of 4 KiB blocks every size is a multiple of 4, each folder after its
  // contents with their total. Read as bytes, every size would be 1,024 times too small, with exit 0.
  const files = Array.from({ length: 18 }, (_, k) => `${4 * (k + 1)}\t/srv/tidewater/ledger/part-${k}.bin`);
  const ledger = 4 + files.reduce((s, line) => s + Number(line.split("\t")[0]), 0);
  const blocks = [...files, `${ledger}\t/srv/tidewater/ledger`, `${ledger + 4}\t/srv/tidewater`, ""].join(
    "\n",
  );

  it("is PARSE_PATHS saying so, not a summary in bytes", async () => {
    const result = await cli(["-", "--budget", "5"], { stdin: blocks });
    expect(result.code).toBe(2);
    expect(result.stdout).toBe("");
    expect(result.stderr).toMatch(
      /^espalier: <stdin>:1:1: every size is a multiple of 4 .*du without -b .*du -ab.*\[PARSE_PATHS\]\n$/,
    );
  });

  it("is PARSE_PATHS for du without -a too (folders only, each a total in blocks)", async () => {
    const folders = Array.from({ length: 16 }, (_, k) => `8\t/srv/tidewater/ledger/shelf-${k}`);
    const listing = [...folders, "132\t/srv/tidewater/ledger", "136\t/srv/tidewater", ""].join("\n");
    const result = await cli(["-"], { stdin: listing });
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(/du without -b .*\[PARSE_PATHS\]/);
  });

  it("is PARSE_PATHS for a small folder too: 8 sizes above 0 are enough", async () => {
    // Field test: du -a of a docs folder of 14 files (15 lines) printed "size 372 B" with exit 0.
    const few = Array.from({ length: 7 }, (_, k) => `${4 * (k + 1)}\tdocs/page-${k}.md`);
    const total = 4 + few.reduce((s, line) => s + Number(line.split("\t")[0]), 0);
    const result = await cli(["-"], { stdin: [...few, `${total}\tdocs`, ""].join("\n") });
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(/du without -b .*\[PARSE_PATHS\]/);
    // Fewer than 8 is read as bytes still: 4^-7 is no longer small evidence against chance.
    const six = [...few.slice(0, 6), `${4 + 4 * 21}\tdocs`, ""].join("\n");
    const bytes = await cli(["-", "--bare"], { stdin: six });
    expect(bytes.code).toBe(0);
  });

  it("reads the numbers as they are with --folder-sizes total --units plain", async () => {
    const result = await run(blocks, ["--folder-sizes", "total", "--units", "plain"]);
    expect(result.stderr).toBe("");
    // The top folder's line is the total: 4 * (1 + 2 + ... + 18) + 4 + 4 = 692 blocks.
    // Nodes: /, srv, tidewater, ledger and the 18 files.
    expect(JSON.parse(result.stdout).totals).toEqual({ nodes: 22, size: 692 });
  });

  it("reads a du -ab listing whose sizes are all multiples of 4 as bytes when every folder's own part is 1 KiB or more", async () => {
    // The shape GNU du -ab printed on ext4 here for 10 files of 12 to 120 bytes and 10 of 4 to 40 KiB:
    // each folder's line is its contents plus its directory's 4096 bytes. It was refused as blocks.
    // In 1 KiB blocks a folder's own part is its directory's blocks, 4 for a small one (du -a here).
    const pages = Array.from({ length: 10 }, (_, k) => `${12 * (k + 1)}\ttide/ledger/page-${k + 1}.bin`);
    const tiles = Array.from({ length: 10 }, (_, k) => `${4096 * (k + 1)}\ttide/charts/tile-${k + 1}.raw`);
    const listing = [...pages, "4756\ttide/ledger", ...tiles, "229376\ttide/charts", "238228\ttide", ""];
    const result = await cli(["-", "--format", "json"], { stdin: listing.join("\n") });
    expect(result.stderr).toBe("");
    const json = JSON.parse(result.stdout);
    // The top folder's line, as du printed it; 20 files, 3 folders.
    expect(json.totals).toEqual({ nodes: 23, size: 238228 });
    expect(json.input).toMatchObject({ sizeUnit: "bytes", folderTotals: true });
    // The same folders in blocks, as du -a printed them: each folder's own part is 4.
    const blocks = [
      ...pages.map((line) => line.replace(/^\d+/, "4")),
      "44\ttide/ledger",
      ...tiles.map((line, k) => line.replace(/^\d+/, String(4 * (k + 1)))),
      "224\ttide/charts",
      "272\ttide",
      "",
    ];
    const refused = await cli(["-"], { stdin: blocks.join("\n") });
    expect(refused.code).toBe(2);
    expect(refused.stderr).toMatch(/du without -b .*\[PARSE_PATHS\]/);
  });

  it("reads a du -ab listing (bytes) whose sizes are not all multiples of 4 as before", async () => {
    // The same files with one a byte longer, and each folder's own part its directory's 4,096 bytes, as
    // du -ab gives it on ext4 (seen here): 8,877 bytes, read as totals. (Own parts of 4, as the blocks
    // above have, are units of 1 KiB or more: refused below.)
    const bytes = [
      ...files.map((line, k) => (k === 0 ? line.replace(/^4\t/, "5\t") : line)),
      `${ledger - 4 + 1 + 4096}\t/srv/tidewater/ledger`,
      `${ledger - 4 + 1 + 4096 * 2}\t/srv/tidewater`,
      "",
    ].join("\n");
    const result = await cli(["-", "--format", "json"], { stdin: bytes });
    expect(result.stderr).toBe("");
    expect(JSON.parse(result.stdout).totals).toEqual({ nodes: 22, size: 684 + 1 + 4096 * 2 });
    expect(JSON.parse(result.stdout).input.folderTotals).toBe(true);
  });
});
