import { readFile } from "node:fs/promises";
import { describe, expect, it } from "vitest";
import type { CliIO } from "../../src/cli/io.js";
import { run } from "../../src/cli/main.js";
import { cli } from "../helpers/cli.js";

/** An IO whose inputs arrive in chunks of `size` bytes, optionally failing after `failAfter` chunks. */
function chunkedIO(size: number, failAfter = Number.POSITIVE_INFINITY) {
  let stdout = "";
  let stderr = "";
  const io: CliIO = {
    stdout: { write: (s: string) => (stdout += s) },
    stderr: { write: (s: string) => (stderr += s) },
    readStdin: async () => Buffer.alloc(0),
    readFile: (p: string) => readFile(p),
    async openInput(name: string) {
      const bytes = await readFile(name);
      async function* chunks() {
        for (let at = 0, k = 0; at < bytes.length; at += size, k++) {
          if (k === failAfter) throw Object.assign(new Error("device gone"), { code: "EIO" });
          yield bytes.subarray(at, at + size);
        }
      }
      return { size: bytes.length, chunks: chunks() };
    },
    env: {},
  };
  return { io, out: () => stdout, err: () => stderr };
}

const ARGS = [
  "fixtures/quillfeather-org.csv",
  "--parent-field",
  "manager",
  "--focus",
  "Q2417",
  "--budget",
  "25",
];

describe("readInputStream", () => {
  it("run(args) prints the same summary whether the input comes whole or in 7-byte chunks", async () => {
    const whole = await cli(ARGS);
    const chunked = chunkedIO(7);
    expect(await run(ARGS, chunked.io)).toBe(0);
    expect(chunked.out()).toBe(whole.stdout);
    expect(whole.code).toBe(0);
  });

  it("run(file) prints the same summary from 5-byte chunks for every demo fixture", async () => {
    for (const file of [
      "fixtures/tidewater-deps.json",
      "fixtures/tidewater-files.paths",
      "fixtures/quillfeather-costs.yaml",
    ]) {
      const args = [file, "--budget", "30"];
      const whole = await cli(args);
      const chunked = chunkedIO(5);
      expect(await run(args, chunked.io), chunked.err()).toBe(whole.code);
      expect(chunked.out()).toBe(whole.stdout);
    }
  });

  it("run(args) reports a read that fails midway as IO, with nothing on standard output", async () => {
    const failing = chunkedIO(4096, 3);
    expect(await run(ARGS, failing.io)).toBe(2);
    expect(failing.out()).toBe("");
    expect(failing.err()).toContain("[IO]");
    expect(failing.err()).toContain("EIO");
  });
});
