import { execFileSync } from "node:child_process";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";
import { isGnuTool, writeFiles } from "../helpers/file-tree.js";

const gnu = isGnuTool("find") && isGnuTool("du");

// Field test: find -printf '%k\t%p\n' and '%b\t%p\n' print each entry's disk usage in 1 KiB and
// 512-byte blocks (findutils manual, "-printf"), each folder before its contents: read as own sizes
// in bytes, /usr/share/doc here was 116.7 KiB where du -s says 119,456 KiB, exit 0. An invented ferry
// operator's folder: ten files of 300 to 9,300 bytes in three folders.
const files: Record<string, number> = {};
for (let k = 0; k < 10; k++)
  files[`${["timetables", "fares", "crew"][k % 3]}/sheet-${k}.csv`] = 300 + 1000 * k;

let base = "";
beforeAll(() => {
  if (!gnu) return;
  base = mkdtempSync(join(tmpdir(), "espalier-find-blocks-"));
  writeFiles(join(base, "ferry"), files);
});
afterAll(() => {
  if (base) rmSync(base, { recursive: true, force: true });
});

const find = (format: string) =>
  execFileSync("find", ["ferry", "-printf", format], { cwd: base, encoding: "utf8" });

describe("find -printf listings of disk blocks", () => {
  it.skipIf(!gnu).each([["%k\t%p\n"], ["%b\t%p\n"]])(
    "find -printf '%s' is PARSE_PATHS naming %%s",
    async (format) => {
      const r = await cli(["-"], { stdin: find(format) });
      expect(r.code).toBe(2);
      expect(r.stdout).toBe("");
      expect(r.stderr).toMatch(
        /^espalier: <stdin>:1:1: .*find -printf '%k'.*find DIR -printf '%s\\t%p\\n'.*\[PARSE_PATHS\]\n$/,
      );
      // --folder-sizes own reads the numbers as they are.
      expect((await cli(["-", "--bare", "--folder-sizes", "own"], { stdin: find(format) })).code).toBe(0);
    },
  );

  it.skipIf(!gnu)("find -printf '%s\\t%p\\n' is read, at du -sb's size", async () => {
    // Source: GNU du -sb (apparent bytes of the folder with everything in it).
    const total = Number(
      execFileSync("du", ["-sb", "ferry"], { cwd: base, encoding: "utf8" }).split("\t")[0],
    );
    const read = JSON.parse((await cli(["-", "--format", "json"], { stdin: find("%s\t%p\n") })).stdout);
    expect(read.totals.size).toBe(total);
  });

  it("a listing of executables' bytes, all multiples of 4, in folders of 4,096 bytes, is read", async () => {
    // ELF files and fonts are often whole multiples of 4 bytes (seen in /usr/lib and /usr/share/fonts
    // here); their folders are 4,096 bytes on ext4 (seen with stat here).
    const lines = [
      "4096\tbin",
      ...[1032, 20480, 77824, 5120, 148, 4424, 98312, 2048].map((b, k) => `${b}\tbin/tool-${k}`),
    ];
    const read = JSON.parse(
      (await cli(["-", "--format", "json"], { stdin: `${lines.join("\n")}\n` })).stdout,
    );
    expect(read.totals.size).toBe(4096 + 1032 + 20480 + 77824 + 5120 + 148 + 4424 + 98312 + 2048);
  });
});
