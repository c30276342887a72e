import { execFileSync } from "node:child_process";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";
import { isGnuTool, writeFiles } from "../helpers/file-tree.js";

// Field tests: lists of one folder's entries (or an inventory's), none inside another, whose sizes show
// no unit. `du -s --apparent-size DIR/*` of a folder of folders gives whole KiB (each entry's du -sb
// rounded up; GNU coreutils, seen here) with no size of 1 to 4 for folder-totals.ts to tell, and
// `dpkg-query -W -f='${Installed-Size}\t${Package}\n'` gives KiB (deb-control(5), seen here: "The approximate
// total size of the package's installed files, in KiB units"): both were read as bytes, 1,024 times too small, with no word, exit 0.
const gnu = isGnuTool("du");
const dpkg = (() => {
  try {
    return /dpkg-query/.test(execFileSync("dpkg-query", ["--version"], { encoding: "utf8" }));
  } catch {
    return false;
  }
})();

let base = "";
beforeAll(() => {
  if (!gnu) return;
  base = mkdtempSync(join(tmpdir(), "espalier-one-folder-"));
  // An invented print shop's job folders, each of a proof and a few kilobytes of plates.
  const files: Record<string, number> = {};
  for (let k = 0; k < 9; k++) {
    files[`jobs/job-${k}/proof.pdf`] = 20_000 + 7_001 * k;
    files[`jobs/job-${k}/plates/cyan.tif`] = 9_000 + 300 * k;
  }
  writeFiles(base, files);
});
afterAll(() => {
  if (base) rmSync(base, { recursive: true, force: true });
});

function sh(script: string): string {
  return execFileSync("sh", ["-c", script], { cwd: base, encoding: "utf8" });
}

const sum = (listing: string) => listing.split("\n").reduce((s, l) => s + (Number(l.split("\t")[0]) || 0), 0);

describe("a list of one folder's entries whose sizes show no unit", () => {
  it.skipIf(!gnu)("du -s --apparent-size DIR/* of folders is read with a UNIT_NOT_SAID note", async () => {
    const kib = sh("du -s --apparent-size jobs/*");
    const bytes = sh("du -sb jobs/*");
    // Source: GNU du -sb; the KiB listing is it rounded up to whole KiB, none of its sizes 1 to 4.
    expect(
      kib
        .trim()
        .split("\n")
        .map((l) => Number(l.split("\t")[0])),
    ).toEqual(
      bytes
        .trim()
        .split("\n")
        .map((l) => Math.ceil(Number(l.split("\t")[0]) / 1024)),
    );
    const r = await cli(["-", "--format", "json"], { stdin: kib });
    expect(r.code).toBe(0);
    expect(JSON.parse(r.stdout).input.notes).toEqual([expect.objectContaining({ code: "UNIT_NOT_SAID" })]);
    expect(r.stderr).toMatch(/the list is 9 entries side by side .*du -sb DIR\/\*.*\[UNIT_NOT_SAID\]\n$/);
    const text = await cli(["-"], { stdin: kib });
    expect(text.stdout.split("\n")[0]).toContain("sizes read as bytes (no unit said)");
    // Said to be bytes (du -sb DIR/*, --units bytes): no note, and du -sb's sum.
    const said = await cli(["-", "--format", "json", "--units", "bytes"], { stdin: bytes });
    expect(said.stderr).toBe("");
    expect(JSON.parse(said.stdout).totals.size).toBe(sum(bytes));
  });

  it.skipIf(!gnu)("a listing with folders and their contents, in bytes, has no note", async () => {
    for (const listing of [sh("du -ab jobs"), sh("find jobs -printf '%s\\t%p\\n'")]) {
      const r = await cli(["-", "--format", "json"], { stdin: listing });
      expect(r.code).toBe(0);
      expect(JSON.parse(r.stdout).input.notes).toBeUndefined();
    }
  });

  it.skipIf(!gnu)(
    "du -sb DIR/* with two empty folders (ext4's 4,096 each) has no note; du -s --apparent-size DIR/* of it has",
    async () => {
      sh("mkdir -p jobs/job-empty-1 jobs/job-empty-2");
      try {
        const bytes = sh("du -sb jobs/*");
        // An empty folder's size as du -sb gives it on this file system (4,096 on ext4, seen here).
        const empty = Number(sh("du -sb jobs/job-empty-1").split("\t")[0]);
        const r = await cli(["-", "--format", "json"], { stdin: bytes });
        expect(r.code).toBe(0);
        expect(JSON.parse(r.stdout).totals.size).toBe(sum(bytes));
        if (empty === 4096) expect(JSON.parse(r.stdout).input.notes).toBeUndefined();
        else
          expect(JSON.parse(r.stdout).input.notes).toEqual([
            expect.objectContaining({ code: "UNIT_NOT_SAID" }),
          ]);
        const kib = await cli(["-", "--format", "json"], { stdin: sh("du -s --apparent-size jobs/*") });
        expect(JSON.parse(kib.stdout).input.notes).toEqual([
          expect.objectContaining({ code: "UNIT_NOT_SAID", count: 11 }),
        ]);
      } finally {
        sh("rmdir jobs/job-empty-1 jobs/job-empty-2");
      }
    },
  );

  it.skipIf(!gnu)(
    "a list too short to tell KiB or blocks from bytes has a note, unless a folder's own size shows bytes",
    async () => {
      // Before: each read as bytes with no word, exit 0, 1,024 times too small where it was KiB.
      for (const [listing, count] of [
        [sh("du -s --apparent-size jobs/job-[0-2]"), 3],
        [sh("du -s jobs/job-[0-2]"), 3],
        [sh("du -sb jobs/job-[0-6]"), 7],
        [sh("du -a --apparent-size jobs/job-0"), 4],
        [sh("du -a jobs/job-0"), 4],
        [sh("find jobs/job-0 -printf '%k\\t%p\\n'"), 4],
        [sh("du -s --apparent-size jobs"), 1],
      ] as const) {
        const r = await cli(["-", "--format", "json"], { stdin: listing });
        expect(r.code).toBe(0);
        // Lines of the listing, by wc -l's count (a line a size above 0 here).
        expect(listing.trim().split("\n")).toHaveLength(count);
        expect(JSON.parse(r.stdout).input.notes, listing).toEqual([
          expect.objectContaining({ code: "UNIT_NOT_SAID", count }),
        ]);
      }
      // In bytes, a folder's own part is its directory's size (4,096 and up on ext4): bytes shown.
      for (const listing of [sh("du -ab jobs/job-0"), sh("find jobs/job-0 -printf '%s\\t%p\\n'")]) {
        const r = await cli(["-", "--format", "json"], { stdin: listing });
        expect(r.code).toBe(0);
        expect(JSON.parse(r.stdout).input.notes, listing).toBeUndefined();
        expect(JSON.parse(r.stdout).totals.size).toBe(Number(sh("du -sb jobs/job-0").split("\t")[0]));
      }
    },
  );

  it.skipIf(!dpkg)(
    "dpkg-query's Installed-Size (KiB) is said; made bytes as the note says, the sum times 1,024",
    async () => {
      // biome-ignore lint/suspicious/noTemplateCurlyInString: dpkg-query's own format string, not a template
      const inventory = execFileSync("dpkg-query", ["-W", "-f=${Installed-Size}\\t${Package}\\n"], {
        encoding: "utf8",
      });
      const r = await cli(["-", "--format", "json"], { stdin: inventory });
      expect(r.code).toBe(0);
      expect(JSON.parse(r.stdout).input.notes).toEqual([expect.objectContaining({ code: "UNIT_NOT_SAID" })]);
      // --units plain prints the KiB as given: dpkg's own sizes add up (awk over the same listing).
      const plain = JSON.parse(
        (await cli(["-", "--format", "json", "--units", "plain"], { stdin: inventory })).stdout,
      );
      expect(plain.totals.size).toBe(sum(inventory));
      expect(plain.input.notes).toBeUndefined();
      const inBytes = execFileSync("awk", ["-F\t", "-v", "OFS=\t", "{$1 = $1 * 1024} 1"], {
        input: inventory,
        encoding: "utf8",
      });
      const read = JSON.parse(
        (await cli(["-", "--format", "json", "--units", "bytes"], { stdin: inBytes })).stdout,
      );
      expect(read.totals.size).toBe(1024 * sum(inventory));
    },
  );
});
