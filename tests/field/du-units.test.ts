import { execFileSync } from "node:child_process";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";
import { isGnuTool, writeFiles } from "../helpers/file-tree.js";

const gnu = isGnuTool("du") && isGnuTool("find");

// Field tests: du in units bigger than a byte. `du -m`, `du -am` and `du -a --apparent-size` round
// each entry up to a whole MiB or KiB (GNU coreutils du; seen here), so a folder can be less than its
// rounded contents add up to: not read as totals, each line was read as an own size in bytes (every
// folder of /usr/share: 5.0 KiB where du -sb says 544 MiB), exit 0. `du -s DIR/*` lists each entry's
// disk usage in 1 KiB blocks once, none inside another: read as bytes, 1,024 times too small.
// An invented harbour's files, 12 of 300 to 9,000 bytes in eight folders (du -m lists folders alone:
// 8 lines at least, as for any reading of totals).
const files: Record<string, number> = {};
for (let k = 0; k < 4; k++) {
  files[`berths/pier-${k}/north.csv`] = 300 + 700 * k;
  files[`ledger/q${k + 1}.json`] = 9000 - 1000 * k;
  files[`ledger/archive/${2020 + k}.txt`] = 1500 + 10 * k;
}

let base = "";
beforeAll(() => {
  if (!gnu) return;
  base = mkdtempSync(join(tmpdir(), "espalier-du-units-"));
  writeFiles(join(base, "harbour"), files);
});
afterAll(() => {
  if (base) rmSync(base, { recursive: true, force: true });
});

function run(cmd: string, args: string[]): string {
  return execFileSync(cmd, args, { cwd: base, encoding: "utf8" });
}

describe("du listings in units bigger than a byte", () => {
  it.skipIf(!gnu).each([["-am"], ["-m"], ["-a", "--apparent-size"]])(
    "du %s DIR (each entry rounded up to whole units) is PARSE_PATHS naming du -ab",
    async (...flags) => {
      const listing = run("du", [...flags, "harbour"]);
      const r = await cli(["-"], { stdin: listing });
      expect(r.code, listing).toBe(2);
      expect(r.stdout).toBe("");
      expect(r.stderr).toMatch(/^espalier: <stdin>:1:1: .*du -ab.*\[PARSE_PATHS\]\n$/);
    },
  );

  it.skipIf(!gnu)("du -ab and du -sb DIR/* are read as bytes, the root at du -sb's size", async () => {
    // Source: GNU du -sb (apparent size in bytes of the folder with everything in it).
    const total = Number(run("du", ["-sb", "harbour"]).split("\t")[0]);
    const all = JSON.parse(
      (await cli(["-", "--format", "json"], { stdin: run("du", ["-ab", "harbour"]) })).stdout,
    );
    expect(all.totals.size).toBe(total);
    const tops = run("sh", ["-c", "du -sb harbour/*"]);
    const flat = JSON.parse((await cli(["-", "--format", "json"], { stdin: tops })).stdout);
    // The three folders' totals; the root (harbour, no line of its own) adds its directory entry in du -sb.
    expect(flat.totals.size).toBe(
      tops.split("\n").reduce((s, line) => s + (Number(line.split("\t")[0]) || 0), 0),
    );
  });

  it("a listing shaped as du -s DIR/* prints on 4 KiB blocks is PARSE_PATHS naming du -sb", async () => {
    // 1 KiB blocks of a file system of 4 KiB blocks: every size a multiple of 4 (common practice, no source).
    const tops = ["28", "24", "6072", "412", "16", "8", "1288", "40", "4"].map(
      (kib, k) => `${kib}\t/srv/harbour/pier-${k}`,
    );
    const r = await cli(["-"], { stdin: `${tops.join("\n")}\n` });
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/^espalier: <stdin>:1:1: .*du -s DIR\/\*.*du -sb DIR\/\*.*\[PARSE_PATHS\]\n$/);
    // Directories' own sizes, all whole 4,096-byte blocks (find -maxdepth 1 -type d), are read as bytes.
    const dirs = tops.map((line, k) => line.replace(/^\d+/, String(4096 * (1 + (k % 2)))));
    expect((await cli(["-", "--bare"], { stdin: `${dirs.join("\n")}\n` })).code).toBe(0);
    // --folder-sizes own reads the numbers as bytes.
    expect(
      (await cli(["-", "--bare", "--folder-sizes", "own"], { stdin: `${tops.join("\n")}\n` })).code,
    ).toBe(0);
  });

  it("a listing shaped as du -am prints (MiB, rounded up) is PARSE_PATHS; as find -depth prints, read", async () => {
    // Each file 1 MiB rounded up, each folder after its files: 1 + 1 + 1 + 1 + 1 > 3 (common practice, no source).
    const mib = [
      ...["a", "b", "c", "d"].map((f) => `1\tharbour/berths/${f}.csv`),
      "1\tharbour/berths",
      ...["q1", "q2", "q3"].map((f) => `2\tharbour/ledger/${f}.json`),
      "5\tharbour/ledger",
      "6\tharbour",
    ];
    const r = await cli(["-"], { stdin: `${mib.join("\n")}\n` });
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/rounded up to whole blocks.*\[PARSE_PATHS\]\n$/);
    // find -depth on ext4: each folder a whole 4,096-byte block after files smaller than it, which add
    // up to more: own sizes (it was read as totals when they added up to less).
    const own = mib.map((line) => line.replace(/^\d+/, line.includes(".") ? "1500" : "4096"));
    const read = JSON.parse((await cli(["-", "--format", "json"], { stdin: `${own.join("\n")}\n` })).stdout);
    expect(read.totals.size).toBe(7 * 1500 + 4096 * 3);
  });
  it.skipIf(!gnu).each([["-sm"], ["-s", "--block-size=1M"]])(
    "du %s DIR/* (whole MiB, rounded up) is PARSE_PATHS naming du -sb; du -sb DIR/* is read",
    async (...flags) => {
      // Source: GNU du -sb (each entry's apparent bytes) and GNU du -sm (its disk usage in MiB, rounded up).
      // A quay of nine small folders and files: each 1 MiB in du -sm, where read as bytes it was 1 B, exit 0.
      const quay = mkdtempSync(join(tmpdir(), "espalier-du-sm-"));
      try {
        const entries: Record<string, number> = {};
        for (let k = 0; k < 9; k++)
          entries[k % 3 === 0 ? `crane-${k}.log` : `bay-${k}/manifest.csv`] = 200 + 90 * k;
        writeFiles(quay, entries);
        const du = (args: string[]) =>
          execFileSync("sh", ["-c", `du ${args.join(" ")} *`], { cwd: quay, encoding: "utf8" });
        const r = await cli(["-"], { stdin: du(flags) });
        expect(r.code).toBe(2);
        expect(r.stdout).toBe("");
        expect(r.stderr).toMatch(
          /^espalier: <stdin>:1:1: .*du -sm DIR\/\*.*du -sb DIR\/\*.*\[PARSE_PATHS\]\n$/,
        );
        const bytes = du(["-sb"]);
        const read = JSON.parse((await cli(["-", "--format", "json"], { stdin: bytes })).stdout);
        expect(read.totals.size).toBe(
          bytes.split("\n").reduce((s, l) => s + (Number(l.split("\t")[0]) || 0), 0),
        );
      } finally {
        rmSync(quay, { recursive: true, force: true });
      }
    },
  );

  it.skipIf(!gnu)(
    "du -s --apparent-size DIR/* (whole KiB, rounded up) is PARSE_PATHS naming du -sb; du -sb DIR/* is read",
    async () => {
      // Source: GNU du -sb (each entry's apparent bytes) and GNU du -s --apparent-size (the same, rounded
      // up to whole KiB: checked below). A slipway's logs and two bays: 1, 3, 4, 7, 15, 30 KiB and the
      // bays' directory entries with their manifests; read as bytes they were 1 B to 30 B, exit 0.
      const slipway = mkdtempSync(join(tmpdir(), "espalier-du-apparent-"));
      try {
        writeFiles(slipway, {
          "winch-0.log": 901,
          "winch-1.log": 2603,
          "winch-2.log": 3901,
          "winch-3.log": 7001,
          "tally.csv": 15005,
          "hull-survey.txt": 30001,
          "bay-a/manifest.csv": 1501,
          "bay-b/manifest.csv": 9001,
        });
        const du = (args: string) =>
          execFileSync("sh", ["-c", `du ${args} *`], { cwd: slipway, encoding: "utf8" });
        const kib = du("-s --apparent-size");
        const bytes = du("-sb");
        const sizes = (listing: string) =>
          listing
            .trim()
            .split("\n")
            .map((l) => Number(l.split("\t")[0]));
        expect(sizes(kib)).toEqual(sizes(bytes).map((b) => Math.ceil(b / 1024)));
        const r = await cli(["-"], { stdin: kib });
        expect(r.code).toBe(2);
        expect(r.stdout).toBe("");
        expect(r.stderr).toMatch(
          /^espalier: <stdin>:1:1: .*du -s --apparent-size DIR\/\*.*du -sb DIR\/\*.*\[PARSE_PATHS\]\n$/,
        );
        const read = JSON.parse((await cli(["-", "--format", "json"], { stdin: bytes })).stdout);
        expect(read.totals.size).toBe(sizes(bytes).reduce((s, b) => s + b, 0));
        // --folder-sizes own reads the numbers as bytes, as the message says.
        expect((await cli(["-", "--bare", "--folder-sizes", "own"], { stdin: kib })).code).toBe(0);
      } finally {
        rmSync(slipway, { recursive: true, force: true });
      }
    },
  );

  it("a listing whose small sizes are all one length above 1 is read as bytes", async () => {
    // Links to one short name, as /usr/lib/git-core holds 169 links of 3 bytes to "git" (seen here with
    // du -sb): a quarter or more of the sizes are 3, where KiB rounded up would give 1 to 4 mixed.
    const lines = ["3", "3", "3", "3", "88112", "5120", "613", "2048", "977"].map(
      (b, k) => `${b}\tcore/c${k}`,
    );
    const read = JSON.parse(
      (await cli(["-", "--format", "json"], { stdin: `${lines.join("\n")}\n` })).stdout,
    );
    expect(read.totals.size).toBe(4 * 3 + 88112 + 5120 + 613 + 2048 + 977);
    const mixed = lines.map((l, k) => (k === 0 ? l.replace(/^\d+/, "2") : l));
    expect((await cli(["-"], { stdin: `${mixed.join("\n")}\n` })).code).toBe(2);
  });

  it.skipIf(!gnu)(
    "du -sb DIR/* of files whose bytes are all multiples of 4 is read; du -s DIR/* still refused",
    async () => {
      // Shared objects, fonts and LLVM bitcode are whole words: /usr/lib/python3.11/lib-dynload and 58
      // more of the 3,012 folders measured here listed all multiples of 4 in du -sb and were refused as
      // du -s DIR/*'s 1 KiB blocks. Source: GNU du -sb (bytes) and du -s (disk usage, 1 KiB blocks).
      const loaders = mkdtempSync(join(tmpdir(), "espalier-du-words-"));
      try {
        const entries: Record<string, number> = {};
        for (let k = 0; k < 9; k++) entries[`plugin-${k}.so`] = 14_392 + 4_104 * k;
        writeFiles(loaders, entries);
        const du = (args: string) =>
          execFileSync("sh", ["-c", `du ${args} *`], { cwd: loaders, encoding: "utf8" });
        const bytes = du("-sb");
        const r = await cli(["-", "--format", "json"], { stdin: bytes });
        expect(r.code, r.stderr).toBe(0);
        expect(JSON.parse(r.stdout).totals.size).toBe(
          bytes.split("\n").reduce((s, l) => s + (Number(l.split("\t")[0]) || 0), 0),
        );
        const blocks = await cli(["-"], { stdin: du("-s") });
        expect(blocks.code).toBe(2);
        expect(blocks.stderr).toMatch(/du -s DIR\/\*.*\[PARSE_PATHS\]\n$/);
      } finally {
        rmSync(loaders, { recursive: true, force: true });
      }
    },
  );

  it("a listing with a few one-byte entries among others is read as bytes", async () => {
    // Flag files of one byte ("1" without a newline) beside bigger ones: 2 of 9 is under a quarter.
    const lines = ["1", "1", "5120", "88", "4096", "613", "2048", "31", "977"].map(
      (b, k) => `${b}\tflags/f${k}`,
    );
    const read = JSON.parse(
      (await cli(["-", "--format", "json"], { stdin: `${lines.join("\n")}\n` })).stdout,
    );
    expect(read.totals.size).toBe(1 + 1 + 5120 + 88 + 4096 + 613 + 2048 + 31 + 977);
    const more = lines.map((l, k) => (k === 2 ? l.replace(/^\d+/, "1") : l));
    expect((await cli(["-"], { stdin: `${more.join("\n")}\n` })).code).toBe(2);
  });
});
