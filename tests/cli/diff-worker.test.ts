import { execFile } from "node:child_process";
import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { promisify } from "node:util";
import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

// The launcher loads a diff's OLD version on a worker thread (dist/cli/load-in-worker.js) while NEW
// loads on the main one (forced here: by default only when a second processor is idle); the in-process
// runs here load both on one thread. Same bytes in, same text out.
const run = promisify(execFile);
const BIN = new URL("../../bin/espalier.js", import.meta.url).pathname;

async function launcher(args: string[]): Promise<{ code: number; stdout: string; stderr: string }> {
  try {
    // Run from a fresh folder, so no .espalier.yaml of the working directory is read.
    // Two threads whatever the machine's load (unset, a busy machine loads both on one: load-threads.ts).
    // Nothing else of the test's environment: the in-process run sees none (COLUMNS, NO_COLOR and the
    // pseudonym key would change one output and not the other).
    const env = { PATH: process.env.PATH ?? "", ESPALIER_LOAD_THREADS: "2" };
    const { stdout, stderr } = await run(process.execPath, [BIN, ...args], {
      encoding: "utf8",
      cwd: dir,
      env,
    });
    return { code: 0, stdout, stderr };
  } catch (error) {
    const e = error as { code: number; stdout: string; stderr: string };
    return { code: e.code, stdout: e.stdout, stderr: e.stderr };
  }
}

const dir = mkdtempSync(join(tmpdir(), "espalier-diff-worker-"));
const file = (name: string, text: string) => {
  const path = join(dir, name);
  writeFileSync(path, text);
  return path;
};

const oldJson = file(
  "old.json",
  JSON.stringify({
    name: "tidewater",
    children: [
      {
        name: "harbor-api",
        size: 1200,
        children: [
          { name: "Ærø.ts", size: 40 },
          { name: "dock\ud800", size: 2 },
        ],
      },
      { name: "surge-alerts", size: 300 },
    ],
  }),
);
const newJson = file(
  "new.json",
  JSON.stringify({
    name: "tidewater",
    children: [
      { name: "harbor-api", size: 1250, children: [{ name: "Ærø.ts", size: 41 }] },
      { name: "mooring-auth", size: 90 },
    ],
  }),
);
const oldCsv = file(
  "old.csv",
  "id,parent,name,size\nQ1,,Quillfeather,0\nQ2,Q1,Optics,10\nQ3,Q2,Lens lab,5\n",
);
const newCsv = file(
  "new.csv",
  "id,parent,name,size\nQ1,,Quillfeather,0\nQ3,Q1,Lens lab,7\nQ2,Q1,Optics,10\n",
);

describe("diff with OLD loaded on a worker thread", () => {
  it("prints what the one-thread run prints, JSON by path and CSV by id, every format", async () => {
    for (const [a, b] of [
      [oldJson, newJson],
      [oldCsv, newCsv],
    ]) {
      for (const format of ["text", "json", "markdown"]) {
        const args = ["diff", a, b, "--budget", "12", "--format", format];
        const here = await cli(args);
        const there = await launcher(args);
        expect(there.stderr).toBe(here.stderr);
        expect(there.code).toBe(here.code);
        expect(there.stdout).toBe(here.stdout);
      }
    }
  });

  it("reports a broken OLD with its file and position, before a broken NEW", async () => {
    const bad = file("bad.json", '{"name": "x", "children": [\n  {"name": 12,\n');
    const args = ["diff", bad, file("also-bad.csv", "id,parent\n1,\n1,\n")];
    const here = await cli(args);
    const there = await launcher(args);
    expect(there.code).toBe(2);
    expect(there.stderr).toBe(here.stderr);
    expect(there.stderr).toContain("bad.json:");
  });
});
