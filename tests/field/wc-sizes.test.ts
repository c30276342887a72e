import { execFileSync } from "node:child_process";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";
import { isGnuTool, writeFiles } from "../helpers/file-tree.js";

// Field tests: `wc -c ./a ./b` (GNU coreutils, run here) pads each size with spaces in front to one
// width, so its first line did not read as a size and a path, and the listing was refused with a
// message naming wc -c as a shape it reads. The check is wc's own total line and each file's bytes.
const gnuWc = isGnuTool("wc");

// The smallest first: wc pads it to the total's width.
const files: Record<string, number> = {
  "notes.txt": 12,
  "ledger/a.csv": 1200,
  "ledger/b.csv": 40,
  "sails/plan.md": 4097,
};
let base = "";
const wc = (env: Record<string, string> = {}) =>
  execFileSync("wc", ["-c", ...Object.keys(files).map((f) => `./${f}`)], {
    cwd: base,
    encoding: "utf8",
    env: { ...process.env, ...env },
  });

beforeAll(() => {
  if (!gnuWc) return;
  base = mkdtempSync(join(tmpdir(), "espalier-wc-"));
  writeFiles(base, files);
});

afterAll(() => {
  if (base) rmSync(base, { recursive: true, force: true });
});

describe.skipIf(!gnuWc)("wc -c of files named from ./", () => {
  it("reads each padded size and path, and leaves out the total line: the size is wc's total", async () => {
    const listing = wc();
    expect(listing.split("\n")[0]).toMatch(/^ +\d+ \.\//);
    const result = await cli(["-", "--format", "json"], { stdin: listing });
    expect(result.code).toBe(0);
    const doc = JSON.parse(result.stdout);
    const total = Number(listing.trimEnd().split("\n").pop()!.trim().split(" ")[0]);
    expect(doc.totals.size).toBe(total);
    expect(doc.totals.size).toBe(Object.values(files).reduce((a, b) => a + b, 0));
    expect(doc.input.notes).toEqual([expect.objectContaining({ code: "TOTAL_LINE_LEFT_OUT" })]);
    const ledger = doc.root.children.find((c: { name: string }) => c.name === "ledger");
    expect(ledger.size).toBe(1240);
  });

  it("leaves out the total line in another language too (LANGUAGE=de: insgesamt)", async () => {
    const listing = wc({ LC_ALL: "C.UTF-8", LANGUAGE: "de" });
    const doc = JSON.parse((await cli(["-", "--format", "json"], { stdin: listing })).stdout);
    expect(doc.totals.size).toBe(Object.values(files).reduce((a, b) => a + b, 0));
  });
});
