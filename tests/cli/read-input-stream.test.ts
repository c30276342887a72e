import { mkdir, mkdtemp, readFile, rm, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
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

  it("run(-) of a pipe that wrote nothing is INPUT_EMPTY saying so; one that wrote blanks is INPUT_EMPTY too", async () => {
    const none = await cli(["-"], { stdin: "" });
    expect(none.code).toBe(2);
    expect(none.stdout).toBe("");
    expect(none.stderr).toMatch(/^espalier: <stdin>: nothing came on standard input: .* \[INPUT_EMPTY\]\n$/);
    // A diff's NEW on standard input likewise.
    const diff = await cli(["diff", "fixtures/tidewater-deps.json", "-"], { stdin: "" });
    expect(diff.stderr).toMatch(/^espalier: <stdin>: nothing came on standard input: .* \[INPUT_EMPTY\]\n$/);
    const blank = await cli(["-"], { stdin: "\n\n" });
    expect(blank.stderr).toMatch(/\[INPUT_EMPTY\]\n$/);
    expect(blank.stderr).not.toMatch(/nothing came/);
  });

  it("run(args) reports a read that fails midway as IO, with nothing on standard output", async () => {
    const failing = chunkedIO(4096, 3);
    expect(await run(ARGS, failing.io)).toBe(2);
    expect(failing.out()).toBe("");
    expect(failing.err()).toContain("[IO]");
    expect(failing.err()).toContain("EIO");
  });
});

/** `text` in UTF-8, UTF-16LE and UTF-16BE, each UTF-16 one led by its byte-order mark. */
function encodings(text: string): Record<"utf8" | "le" | "be", Buffer> {
  const le = Buffer.from(`\ufeff${text}`, "utf16le");
  return { utf8: Buffer.from(text, "utf8"), le, be: Buffer.from(le).swap16() };
}

describe("readInputStream (UTF-16 and the diff)", () => {
  let dir: string;
  beforeAll(async () => {
    dir = await mkdtemp(join(tmpdir(), "espalier-utf16-"));
  });
  afterAll(async () => {
    await rm(dir, { recursive: true, force: true });
  });

  /** Writes each encoding of `text` to DIR/<encoding>/<name>; the same base name keeps the root name. */
  async function files(name: string, text: string): Promise<Record<"utf8" | "le" | "be", string>> {
    const out = { utf8: "", le: "", be: "" };
    for (const [key, bytes] of Object.entries(encodings(text)) as ["utf8" | "le" | "be", Buffer][]) {
      await mkdir(join(dir, key), { recursive: true });
      out[key] = join(dir, key, name);
      await writeFile(out[key], bytes);
    }
    return out;
  }

  it("run(file) reads UTF-16LE and UTF-16BE with a byte-order mark as the same tree as UTF-8, whole and in 3-byte chunks", async () => {
    // Names beyond the Basic Multilingual Plane are surrogate pairs in UTF-16, cut apart by 3-byte chunks.
    const list = "10\tquill/\u{1FAB6} feather\n20\tquill/caf\u00e9\n5\tquill/\u00fcn\u00efcode/\u00df\n";
    const deps = await readFile("fixtures/tidewater-deps.json", "utf8");
    for (const [name, text] of [
      ["feathers.paths", list],
      ["deps.json", deps],
    ]) {
      const paths = await files(name, text);
      const expected = await cli([paths.utf8, "--format", "json", "--budget", "30"]);
      expect(expected.code, expected.stderr).toBe(0);
      for (const path of [paths.le, paths.be]) {
        const whole = await cli([path, "--format", "json", "--budget", "30"]);
        expect(whole.stdout, whole.stderr).toBe(expected.stdout);
        const chunked = chunkedIO(3);
        expect(await run([path, "--format", "json", "--budget", "30"], chunked.io), chunked.err()).toBe(0);
        expect(chunked.out()).toBe(expected.stdout);
      }
    }
    expect(
      JSON.parse((await cli([join(dir, "be", "feathers.paths"), "--format", "json"])).stdout).root.children[0]
        .name,
    ).toBe("\u{1FAB6} feather");
  });

  it("run(file) reports a fault in UTF-16 input with the code and position it has in UTF-8", async () => {
    const paths = await files("broken.json", '{\n  "name": "quill",\n  "children": [\n    {"name": "a"');
    const expected = await cli([paths.utf8]);
    expect(expected.stderr).toMatch(/:4:\d+: .*\[PARSE_JSON\]\n$/);
    for (const path of [paths.le, paths.be]) {
      for (const io of [undefined, chunkedIO(3)]) {
        const r = io ? { code: await run([path], io.io), stderr: io.err() } : await cli([path]);
        expect(r.code).toBe(2);
        expect(r.stderr.replace(path, paths.utf8)).toBe(expected.stderr);
      }
    }
  });

  it("run(file) of a UTF-16 byte-order mark and nothing else is INPUT_EMPTY", async () => {
    const paths = await files("empty.paths", "");
    for (const path of [paths.le, paths.be]) {
      const r = await cli([path]);
      expect(r.code).toBe(2);
      expect(r.stderr).toMatch(/\[INPUT_EMPTY\]\n$/);
    }
  });

  it("run(diff OLD NEW) reads both versions in chunks, UTF-16 included, as it reads them whole", async () => {
    const before = await files("org.paths", "10\tquill/a\n20\tquill/b\n");
    const after = await files("org-next.paths", "10\tquill/a\n25\tquill/b\n7\tquill/c\n");
    const args = ["diff", before.utf8, after.utf8, "--budget", "9"];
    const whole = await cli(args);
    expect(whole.code, whole.stderr).toBe(0);
    expect(whole.stdout).toContain("quill");
    // Streamed only: reading a version whole would fail.
    const streamedOnly = () => {
      const chunked = chunkedIO(3);
      chunked.io.readFile = async (p: string) => {
        if (p.startsWith(dir)) throw Object.assign(new Error("read whole"), { code: "EPERM" });
        return readFile(p);
      };
      return chunked;
    };
    const chunked = streamedOnly();
    expect(await run(args, chunked.io), chunked.err()).toBe(0);
    expect(chunked.out()).toBe(whole.stdout);
    const mixed = streamedOnly();
    expect(await run(["diff", before.le, after.be, "--budget", "9"], mixed.io), mixed.err()).toBe(0);
    expect(mixed.out()).toBe(whole.stdout);
    // The same content in another encoding is no change.
    const same = await cli(["diff", before.utf8, before.be, "--fail-on-change"]);
    expect(same.code, same.stdout).toBe(0);
  });

  it("run(diff OLD NEW) reports a fault in a version read in chunks at its line, naming that version", async () => {
    const good = await files("ok.paths", "10\tquill/a\n");
    const bad = await files("bad.paths", "10\tquill/a\nten\tquill/b\n");
    const whole = await cli(["diff", good.utf8, bad.utf8]);
    expect(whole.code).toBe(2);
    expect(whole.stderr).toContain(`${bad.utf8}:2`);
    const chunked = chunkedIO(3);
    expect(await run(["diff", good.utf8, bad.utf8], chunked.io)).toBe(2);
    expect(chunked.err()).toBe(whole.stderr);
    expect(chunked.out()).toBe("");
  });
});
