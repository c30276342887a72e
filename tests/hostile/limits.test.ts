import { execFileSync } from "node:child_process";
import { mkdtemp, symlink, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { readBounded, readStreamBounded } from "../../src/cli/read-bounded.js";
import { EspalierError } from "../../src/errors.js";
import { loadTree } from "../../src/load/index.js";
import { defaultLoadOptions, type InputFormat, type LoadOptions } from "../../src/load/load-options.js";
import { readLimits } from "../../src/load/read-limits.js";
import { loadTreeFromStream } from "../../src/load/stream/index.js";
import { runBin } from "../helpers/bin.js";
import { cli } from "../helpers/cli.js";
import { oneErrorLine } from "./error-line.js";

async function caught(work: () => Promise<unknown>): Promise<EspalierError> {
  try {
    await work();
  } catch (e) {
    if (e instanceof EspalierError) return e;
    throw e;
  }
  throw new Error("expected an EspalierError");
}

/** `text` in chunks of `size` bytes. */
async function* inChunks(text: string | Uint8Array, size: number): AsyncGenerator<Uint8Array> {
  const bytes = typeof text === "string" ? Buffer.from(text) : text;
  for (let at = 0; at < bytes.length; at += size) yield bytes.subarray(at, at + size);
}

/** An input that never ends: `head` once, then `fill` (1 MiB at a time) for ever. Counts what was read. */
function endless(head: string, fill: number, read: { bytes: number }): AsyncIterable<Uint8Array> {
  const block = Buffer.alloc(1 << 20, fill);
  return {
    async *[Symbol.asyncIterator]() {
      yield Buffer.from(head);
      for (;;) {
        read.bytes += block.length;
        yield block;
      }
    },
  };
}

const load = (format: InputFormat, chunks: AsyncIterable<Uint8Array>, options: Partial<LoadOptions> = {}) =>
  loadTreeFromStream(chunks, { ...defaultLoadOptions, format, ...options });

describe("every reader has a stated limit (src/load/read-limits.ts), LIMIT_EXCEEDED at its place", () => {
  const tiny = { maxLineBytes: 32, maxTokenBytes: 16, maxYamlBytes: 64 };

  it("a path-list line past maxLineBytes, whole in a chunk or cut across many", async () => {
    const text = `quill/a\nquill/${"b".repeat(40)}\nquill/c\n`;
    for (const size of [1, 7, 1000]) {
      const err = await caught(() => load("paths", inChunks(text, size), { limits: tiny }));
      expect(err.code).toBe("LIMIT_EXCEEDED");
      expect(err.pos?.line).toBe(2);
    }
    // The same line under the limit loads.
    const fits = await load("paths", inChunks(`quill/${"b".repeat(20)}\n`, 3), { limits: tiny });
    expect(fits.length).toBe(2);
  });

  it("a CSV or TSV record past maxLineBytes", async () => {
    for (const [format, sep] of [
      ["csv", ","],
      ["tsv", "\t"],
    ] as const) {
      const text = `id${sep}parent\nQ1${sep}\nQ2${sep}${"Q".repeat(40)}\n`;
      for (const size of [5, 1000]) {
        const err = await caught(() => load(format, inChunks(text, size), { limits: tiny }));
        expect(err.code, format).toBe("LIMIT_EXCEEDED");
        expect(err.pos?.line, format).toBe(3);
      }
    }
  });

  it("a JSON string or number past maxTokenBytes, at the token's line and column", async () => {
    const cases = [
      `{"name": "quill",\n "children": [{"name": "${"x".repeat(40)}"}]}`,
      `{"name": "quill",\n "children": [{"name": "a", "size": 1${"0".repeat(40)}}]}`,
    ];
    for (const text of cases) {
      const err = await caught(() => load("json", inChunks(text, 4), { limits: tiny }));
      expect(err.code).toBe("LIMIT_EXCEEDED");
      expect(err.pos?.line).toBe(2);
      expect(err.pos?.column).toBeGreaterThan(1);
    }
  });

  it("a row or a kept field (values held whole) past maxTokenBytes", async () => {
    const rows = `[{"id": "Q1", "parent": null, "title": "${"t".repeat(10)}", "team": "${"m".repeat(10)}"}]`;
    const err = await caught(() => load("rows", inChunks(rows, 3), { limits: tiny }));
    expect(err.code).toBe("LIMIT_EXCEEDED");
    const kept = `{"name": "quill", "meta": {"a": [${"1,".repeat(20)}1]}}`;
    const err2 = await caught(() => load("json", inChunks(kept, 3), { limits: tiny, keepFields: ["meta"] }));
    expect(err2.code).toBe("LIMIT_EXCEEDED");
  });

  it("JSON nested past maxJsonDepth, at the bracket's place", async () => {
    const text = `{"name": "quill", "x": ${"[".repeat(40)}`;
    // Read as node objects: "x" is a field of the root node, not a child.
    const nodes = { readAs: "nodes" as const, limits: { maxJsonDepth: 20 } };
    const err = await caught(() => load("json", inChunks(text, 5), nodes));
    expect(err.code).toBe("LIMIT_EXCEEDED");
    expect(err.pos?.line).toBe(1);
    const fits = await load(
      "json",
      inChunks(`{"name": "quill", "children": [{"name": "a"}], "x": ${"[".repeat(10)}${"]".repeat(10)}}`, 5),
      nodes,
    );
    expect(fits.length).toBe(2);
  });

  it("every reading of a JSON document keeps the limits: values, a map keyed by path, rows", async () => {
    // A string past maxTokenBytes, cut across chunks, in each reading choose-reading can pick.
    const long = "x".repeat(40);
    const cases: [string, Partial<LoadOptions>][] = [
      [`{"quill": {"desk": "${long}"}}`, { readAs: "values" }],
      [`{"packages": {"": {}, "desks/a": {"v": "${long}"}}}`, {}],
      [`{"packages": {"": {}, "desks/${long}": {}}}`, {}],
    ];
    for (const [text, options] of cases) {
      const err = await caught(() => load("json", inChunks(text, 4), { limits: tiny, ...options }));
      expect(err.code, text).toBe("LIMIT_EXCEEDED");
      expect(err.pos?.line, text).toBe(1);
      // Under the limits, the same shape loads.
      const fits = await load("json", inChunks(text.replace(long, "x"), 4), { limits: tiny, ...options });
      expect(fits.length, text).toBeGreaterThan(1);
    }
    // Nesting past maxJsonDepth in a document read as values, and in a map keyed by path.
    for (const [text, options] of [
      [`{"quill": ${"[".repeat(40)}`, { readAs: "values" }],
      [`{"packages": {"": {}, "desks/a": {"v": ${"[".repeat(40)}`, {}],
    ] as [string, Partial<LoadOptions>][]) {
      const err = await caught(() =>
        load("json", inChunks(text, 5), { limits: { maxJsonDepth: 20 }, ...options }),
      );
      expect(err.code, text).toBe("LIMIT_EXCEEDED");
    }
  });

  it("a JSON graph (adjacency map, rows with repeated ids) past maxJsonGraphBytes, streamed or held whole", async () => {
    const map = `{"quill": ["desk", "lab"], "desk": ${JSON.stringify(["a", "b", "c", "d", "e", "f"])}}`;
    const rows = '[{"id": "q", "parent": ""}, {"id": "d", "parent": "q"}, {"id": "d", "parent": "q2"}]';
    for (const [format, text] of [
      ["json", map],
      ["rows", rows],
    ] as const) {
      const limits = { maxJsonGraphBytes: text.length - 1 };
      const options = { graph: true, limits, file: "graph.json" };
      const err = await caught(() => load(format, inChunks(text, 7), options));
      expect(err.code, text).toBe("LIMIT_EXCEEDED");
      // The whole file is at fault: named, no line.
      expect(err.pos, text).toEqual({ file: "graph.json" });
      const whole = await caught(async () => loadTree(text, { ...defaultLoadOptions, format, ...options }));
      expect(whole.code, text).toBe("LIMIT_EXCEEDED");
      // One byte more of limit: the graph is read (or, for rows naming a missing parent, refused for that).
      const fits = { ...options, limits: { maxJsonGraphBytes: text.length } };
      const outcome = await load(format, inChunks(text, 7), fits).then(
        () => "tree",
        (e: EspalierError) => e.code,
      );
      expect(outcome, text).not.toBe("LIMIT_EXCEEDED");
    }
  });

  it("an endless JSON graph stops at maxJsonGraphBytes (lowered to 4 MiB here), never holding more", async () => {
    const read = { bytes: 0 };
    const limit = 4 << 20;
    const err = await caught(() =>
      load("json", endless('{"quill": ["', 0x61, read), {
        graph: true,
        limits: { maxJsonGraphBytes: limit },
      }),
    );
    expect(err.code).toBe("LIMIT_EXCEEDED");
    // Counted, not timed: at most one 1 MiB block past the limit was read.
    expect(read.bytes).toBeLessThanOrEqual(limit + (1 << 20));
  });

  it("a YAML input past maxYamlBytes", async () => {
    const yaml = `name: quill\nchildren:\n${"  - name: a\n".repeat(10)}`;
    const err = await caught(() => load("yaml", inChunks(yaml, 16), { limits: tiny }));
    expect(err.code).toBe("LIMIT_EXCEEDED");
  });

  // An input that never ends is read only as far as the default limit (counted, not timed).
  for (const [format, head, fill] of [
    ["paths", "", 0],
    ["paths", "quill/", 0x61],
    ["tsv", "id\tparent\n", 0x61],
    ["csv", "id,parent\n", 0],
    ["json", '{"name": "', 0x61],
    ["json", '{"name": "a", "size": 1', 0x30],
    // A map keyed by path (a lock file's packages) whose last key never ends.
    ["json", '{"packages": {"": {}, "desks/a": {}, "desks/', 0x61],
    ["yaml", "name: ", 0x61],
  ] as const) {
    it(`an endless ${format} input (${JSON.stringify(head)} then byte ${fill} for ever) stops at its limit`, async () => {
      const read = { bytes: 0 };
      const err = await caught(() => load(format, endless(head, fill, read)));
      expect(err.code).toBe("LIMIT_EXCEEDED");
      const limit =
        format === "yaml"
          ? readLimits.maxYamlBytes
          : Math.max(readLimits.maxLineBytes, readLimits.maxTokenBytes);
      expect(read.bytes).toBeLessThanOrEqual(limit + 2 * (1 << 20));
    });
  }

  it("an endless run of [ in a JSON field stops at maxJsonDepth (lowered here to keep the test short)", async () => {
    const read = { bytes: 0 };
    const err = await caught(() =>
      load("json", endless('{"name": "a", "x": ', 0x5b, read), { limits: { maxJsonDepth: 100_000 } }),
    );
    expect(err.code).toBe("LIMIT_EXCEEDED");
    expect(read.bytes).toBeLessThanOrEqual(1 << 20);
  });

  it("--max-nodes holds with an endless well-formed input (a path list)", async () => {
    const read = { bytes: 0 };
    const source = {
      async *[Symbol.asyncIterator]() {
        for (let k = 0; ; k++) {
          const chunk = Buffer.from(Array.from({ length: 10_000 }, (_, i) => `quill/d${k}/f${i}\n`).join(""));
          read.bytes += chunk.length;
          yield chunk;
        }
      },
    };
    const err = await caught(() => load("paths", source, { maxNodes: 1000 }));
    expect(err.code).toBe("LIMIT_EXCEEDED");
    expect(read.bytes).toBeLessThanOrEqual(200_000);
  });
});

describe("readBounded(path, bound) and readStreamBounded(chunks, name, bound)", () => {
  it("refuses a device or a named pipe where only a regular file will do, before opening it", async () => {
    const dir = await mkdtemp(join(tmpdir(), "espalier-limits-"));
    const fifo = join(dir, "pipe");
    execFileSync("mkfifo", [fifo]);
    const bound = { maxBytes: 100, what: "the config", pipes: false };
    for (const path of ["/dev/zero", fifo]) {
      const err = await caught(() => readBounded(path, bound));
      expect(err.code).toBe("IO");
      expect(err.pos?.file).toBe(path);
    }
  });

  it("is LIMIT_EXCEEDED one byte past maxBytes, naming the file", async () => {
    const dir = await mkdtemp(join(tmpdir(), "espalier-limits-"));
    const file = join(dir, "foci.txt");
    await writeFile(file, "x".repeat(101));
    const bound = { maxBytes: 100, what: "the foci file", pipes: true };
    const err = await caught(() => readBounded(file, bound));
    expect(err.code).toBe("LIMIT_EXCEEDED");
    expect(err.pos?.file).toBe(file);
    await writeFile(file, "x".repeat(100));
    expect((await readBounded(file, bound)).length).toBe(100);
    const fromStdin = await caught(() => readStreamBounded(inChunks("y".repeat(101), 7), "-", bound));
    expect(fromStdin.code).toBe("LIMIT_EXCEEDED");
  });
});

describe("espalier with devices and endless inputs, through bin/espalier.js", () => {
  it("/dev/zero as the input, every line format, with and without --max-nodes: LIMIT_EXCEEDED naming it", async () => {
    for (const args of [[], ["--input-format", "tsv", "--max-nodes", "5"], ["--input-format", "yaml"]]) {
      const r = await runBin(["/dev/zero", "--without-config", ...args]);
      const line = oneErrorLine({ code: r.code ?? -1, stdout: r.stdout, stderr: r.stderr });
      expect(line.code, args.join(" ")).toBe("LIMIT_EXCEEDED");
      expect(line.file).toBe("/dev/zero");
    }
  }, 180_000);

  it("a committed .espalier.yaml that links to a device or a named pipe: IO at once, no hang", async () => {
    const dir = await mkdtemp(join(tmpdir(), "espalier-limits-"));
    await writeFile(join(dir, "t.paths"), "quill/a\n");
    execFileSync("mkfifo", [join(dir, "pipe")]);
    for (const target of ["/dev/zero", "/dev/tty", join(dir, "pipe")]) {
      await symlink(target, join(dir, ".espalier.yaml"));
      const r = await runBin(["t.paths"], { cwd: dir });
      const line = oneErrorLine({ code: r.code ?? -1, stdout: r.stdout, stderr: r.stderr });
      expect(line.code, target).toBe("IO");
      expect(line.file).toBe(".espalier.yaml");
      execFileSync("rm", [join(dir, ".espalier.yaml")]);
    }
  });

  it("--focus-from a device: IO; a config past its limit: LIMIT_EXCEEDED", async () => {
    const dir = await mkdtemp(join(tmpdir(), "espalier-limits-"));
    await writeFile(join(dir, "t.paths"), "quill/a\n");
    const r = await runBin(["t.paths", "--without-config", "--focus-from", "/dev/zero"], { cwd: dir });
    expect(oneErrorLine({ code: r.code ?? -1, stdout: r.stdout, stderr: r.stderr }).code).toBe("IO");
    await writeFile(join(dir, "big.yaml"), `# ${"x".repeat(readLimits.maxConfigBytes)}\nbudget: 5\n`);
    const c = await cli([join(dir, "t.paths"), "--config", join(dir, "big.yaml")]);
    expect(oneErrorLine(c).code).toBe("LIMIT_EXCEEDED");
  });
});
