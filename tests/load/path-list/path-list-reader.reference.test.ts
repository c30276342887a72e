import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { opts } from "../helpers.js";
import {
  awkwardAt,
  cutsFor,
  everyByte,
  expectSameTree,
  expectSameTreeAndSummaries,
  loadByReference,
  loadStreamed,
  outcomeOf,
  outcomeOfAsync,
  type Rng,
  rng,
  utf8,
} from "../stream/helpers.js";

const SEGMENTS = [
  "tidewater",
  "services",
  "ledger",
  "é",
  "日本",
  "😀.png",
  "a b",
  ".",
  "..",
  "x".repeat(20),
  "~1",
];

/**
 * A path list: sized or not (the size before a tab or spaces), LF or CRLF, blank lines, absolute or
 * relative, directories after contents.
 */
function pathList(r: Rng, lines: number): string {
  const sized = r.chance(0.5);
  // find -printf '%s %p\n' separates the size by a space (read so when the paths start with / or ./).
  const gap = r.pick(["\t", " ", "  "]);
  const eol = r.chance(0.5) ? "\n" : "\r\n";
  const seen = new Set<string>();
  const out: string[] = [];
  const lead = r.pick(["", "/", "./", "C:\\"]);
  for (let k = 0; k < lines; k++) {
    const depth = r.int(1, 4);
    const parts = Array.from({ length: depth }, () => r.pick(SEGMENTS));
    // A Windows listing (dir /s /b) separates by "\\".
    let path = lead + parts.join(lead === "C:\\" ? "\\" : "/");
    if (r.chance(0.1)) path += "/";
    if (seen.has(path.replace(/\/+$/, ""))) continue;
    seen.add(path.replace(/\/+$/, ""));
    if (r.chance(0.1)) out.push(r.pick(["", "  ", "\t"]));
    out.push(sized ? `${r.pick(["0", "12", "4096", "1.5", "1e3"])}${gap}${path}` : path);
  }
  const text = out.join(eol);
  return r.chance(0.5) ? text + eol : text;
}

const awkward = (bytes: Uint8Array) => awkwardAt(bytes, [0x0d, 0x0a, 0x09]);

describe("loadTreeFromStream(paths)", () => {
  it("loadTreeFromStream(paths) builds the tree the reference builds and the same summaries, however the bytes are cut", async () => {
    await fc.assert(
      fc.asyncProperty(fc.integer(), fc.integer({ min: 1, max: 40 }), async (seed, lines) => {
        const r = rng(seed);
        const bytes = utf8(pathList(r, lines));
        const options = opts({ format: r.chance(0.5) ? "paths" : undefined, file: "tidewater.paths" });
        const cuts = cutsFor(r, bytes.length, r.int(0, 16), awkward(bytes));
        const expected = outcomeOf(() => loadByReference(bytes, options));
        const actual = await outcomeOfAsync(() => loadStreamed(bytes, options, cuts));
        if (!("tree" in expected) || !("tree" in actual)) {
          expect(actual).toEqual(expected);
          return;
        }
        expectSameTreeAndSummaries(r, actual.tree, expected.tree);
      }),
      { numRuns: 300 },
    );
  });

  it("loadTreeFromStream(paths) reads single-byte chunks: a CRLF and a multi-byte character cut in two", async () => {
    const bytes = utf8("4096\t./services\r\n12\t./services/ledger é.ts\r\n\r\n7\t./日本/😀.png");
    const tree = await loadStreamed(bytes, opts({ format: "paths" }), everyByte(bytes.length));
    expectSameTree(tree, loadByReference(bytes, opts({ format: "paths" })));
    expect(tree.name).toEqual([".", "services", "ledger é.ts", "日本", "😀.png"]);
    expect([...tree.origin]).toEqual([1, 1, 2, 4, 4]);
  });

  it("loadTreeFromStream(paths) agrees with the reference on invalid UTF-8, stray bytes and odd sizes, however cut", async () => {
    // Invalid sequences (a lone 0xff, a cut 3-byte lead) become U+FFFD on both sides; the reader keys
    // names on bytes, so two spellings of one name must not make two nodes. The reference decodes
    // first, so where two lines write one folder in different bad bytes (0xff, 0xfe) it makes one node
    // of two; the reader refuses that (DUPLICATE_PATH), and only that: read one character a byte
    // (Latin-1, which tells every byte apart), the reference then finds more nodes, or, for an error
    // the reference meets further on, already in the lines before the reader's.
    const pieces = [
      [0x61],
      [0x62],
      [0x2f],
      [0x0a],
      [0x09],
      [0x31],
      [0x2e],
      [0x20],
      [0x0d],
      [0xff],
      [0xfe],
      [0xc3, 0xa9],
      [0xe2, 0x82],
      [0xef, 0xbf, 0xbd],
      [0xf0, 0x9f, 0x98, 0x80],
      [0xc2, 0xa0],
    ];
    const options = opts({ format: "paths", file: "t.paths" });
    // Whether the first `lines` lines of `bytes` hold two folders written in other bytes that read alike.
    const mergedIn = (bytes: Uint8Array, lines: number) => {
      let at = 0;
      for (let k = 0; k < lines && at < bytes.length; k++) {
        const end = bytes.indexOf(0x0a, at);
        at = end === -1 ? bytes.length : end + 1;
      }
      const part = bytes.subarray(0, at);
      const lossy = outcomeOf(() => loadByReference(part, options));
      const lossless = outcomeOf(() => loadByReference(utf8(Buffer.from(part).toString("latin1")), options));
      return "tree" in lossy && "tree" in lossless && lossless.tree.length > lossy.tree.length;
    };
    await fc.assert(
      fc.asyncProperty(
        fc.array(fc.integer({ min: 0, max: pieces.length - 1 }), { maxLength: 60 }),
        fc.integer(),
        async (picks, seed) => {
          const r = rng(seed);
          const bytes = Uint8Array.from(picks.flatMap((k) => pieces[k]));
          const expected = outcomeOf(() => loadByReference(bytes, options));
          for (const cuts of [[], cutsFor(r, bytes.length, r.int(0, 8)), everyByte(bytes.length)]) {
            const actual = await outcomeOfAsync(() => loadStreamed(bytes, options, cuts));
            if ("tree" in expected && "tree" in actual) expectSameTree(actual.tree, expected.tree);
            else if (
              "code" in actual &&
              actual.code === "DUPLICATE_PATH" &&
              JSON.stringify(actual) !== JSON.stringify(expected)
            ) {
              const line = (actual.pos as { line: number }).line;
              expect(mergedIn(bytes, line), "a refusal only where two folders would be one").toBe(true);
            } else expect(actual).toEqual(expected);
          }
          // And every merge the reference makes is refused.
          if ("tree" in expected && mergedIn(bytes, Number.POSITIVE_INFINITY)) {
            const actual = await outcomeOfAsync(() => loadStreamed(bytes, options, []));
            expect(actual).toMatchObject({ code: "DUPLICATE_PATH" });
          }
        },
      ),
      {
        numRuns: 500,
        examples: [
          // Seed 32342398: " 1 /", a size padded as wc -c pads it, which the reference did not skip.
          [[7, 5, 7, 2], 0],
          // Seed 1981617148 (ESPALIER_PROPERTY_RUNS=25), before 31f2f9b: 0xff, then the folder 0xe2 0x82.
          [[9, 3, 12, 2, 0], 0],
          // A folder named U+FFFD in UTF-8 (EF BF BD) and one named 0xff: read as one, exit 0, before.
          [[13, 2, 0, 3, 9, 2, 1], 0],
          [[9, 2, 0, 3, 13, 2, 1], 0],
        ],
      },
    );
  });

  it("loadTreeFromStream(paths) refuses a listing exactly when two folders written in other bad bytes would be one", async () => {
    // Names with bytes that are not UTF-8 (0xff, 0xfe; Latin-1 0xe9, 0xe8 before "t"), which the WHATWG
    // decoder reads as U+FFFD: "a\xff" and "a\xfe" read alike. Read one character a byte (Latin-1),
    // the reference tells them apart; read decoded, it makes one node of two. The reader must give the
    // reference's tree when no two names merged, and DUPLICATE_PATH when any did.
    const names = [[0x61], [0x61, 0xff], [0x61, 0xfe], [0xe9, 0x74], [0xe8, 0x74], [0x62]];
    // Sizes read as own: how the random sizes read (du's totals, refused as blocks) is no question here.
    const options = opts({ format: "paths", file: "t.paths", folderSizes: "own" });
    await fc.assert(
      fc.asyncProperty(
        fc.array(fc.array(fc.integer({ min: 0, max: names.length - 1 }), { minLength: 1, maxLength: 3 }), {
          minLength: 1,
          maxLength: 8,
        }),
        fc.boolean(),
        async (paths, sized) => {
          const lines = paths.map((path, k) => [
            ...(sized ? [...utf8(String(k + 1)), 0x09] : []),
            ...path.flatMap((n, d) => (d === 0 ? names[n] : [0x2f, ...names[n]])),
            0x0a,
          ]);
          const bytes = Uint8Array.from(lines.flat());
          const lossy = outcomeOf(() => loadByReference(bytes, options));
          const lossless = outcomeOf(() =>
            loadByReference(utf8(Buffer.from(bytes).toString("latin1")), options),
          );
          const actual = await outcomeOfAsync(() => loadStreamed(bytes, options, everyByte(bytes.length)));
          if ("tree" in lossy && "tree" in lossless && lossless.tree.length > lossy.tree.length)
            expect(actual).toMatchObject({ code: "DUPLICATE_PATH" });
          else if ("tree" in lossy && "tree" in actual) expectSameTree(actual.tree, lossy.tree);
          else if ("tree" in lossy) expect.unreachable("no two names merged, yet the reader refused");
          // A path named twice in the same bytes: DUPLICATE_PATH either way.
          else expect(actual).toMatchObject({ code: lossy.code });
        },
      ),
      { numRuns: 300 },
    );
  });

  it("loadTreeFromStream(paths) builds the tree the reference builds for a long listing that revisits directories", async () => {
    // More names than the reader decodes in one batch, long and short, some directories named again
    // after their contents (as du lists them) and revisited later.
    const r = rng(4242);
    const lines: string[] = [];
    for (let k = 0; k < 80_000; k++) {
      const dir = `tidewater/${r.pick(SEGMENTS)}-${r.int(0, 40)}/${r.pick(["gauge", "ledger", "x".repeat(16)])}`;
      lines.push(`${r.int(0, 9999)}\t${dir}/${r.pick(SEGMENTS)}-${k}`);
      if (r.chance(0.001)) lines.push(`4096\t${dir}`);
    }
    const seen = new Set<string>();
    const bytes = utf8(
      lines.filter((line) => !seen.has(line.split("\t")[1]) && seen.add(line.split("\t")[1])).join("\n"),
    );
    const options = opts({ format: "paths" });
    const expected = outcomeOf(() => loadByReference(bytes, options));
    const actual = await outcomeOfAsync(() => loadStreamed(bytes, options, cutsFor(r, bytes.length, 40)));
    expect("tree" in expected).toBe(true);
    if ("tree" in expected && "tree" in actual) expectSameTree(actual.tree, expected.tree);
    else expect(actual).toEqual(expected);
  });

  it("loadTreeFromStream(paths) builds the tree the reference builds for listings that keep folders together, but for a few lines", async () => {
    // The reader finds a name among its folder's children while the folder stays on the walk from when
    // it was made (src/load/open-folders.ts), and in the table of every node only below a folder the
    // walk came back to. Listings made as find, du -a and sorted keys make them (a random tree in
    // pre-order, folders named before or after their contents, or not at all), with wide folders (the
    // small tables grow, and are made small again) and deep ones; then a few lines moved further on (a
    // folder left and come back to, its table filled then) or repeated (DUPLICATE_PATH, where the
    // reference says it).
    await fc.assert(
      fc.asyncProperty(fc.integer(), async (seed) => {
        const r = rng(seed);
        const folders = r.pick(["before", "after", "none"] as const);
        const lines: string[] = [];
        let made = 0;
        const walk = (path: string, depth: number) => {
          const wide = r.chance(0.1) ? r.int(40, 300) : r.int(0, 6);
          const children = depth === 0 ? r.int(1, 5) : depth > 6 ? 0 : wide;
          if (depth > 0 && folders === "before") lines.push(path);
          for (let k = 0; k < children && made < 3000; k++, made++) {
            const name = r.chance(0.2) ? r.pick(SEGMENTS) : `${r.pick(["run", "part", "é"])}-${k}`;
            const child = path === "" ? name : `${path}/${name}`;
            if (r.chance(0.3)) walk(child, depth + 1);
            else lines.push(child);
          }
          if (depth > 0 && (folders === "after" || (folders === "none" && children === 0))) lines.push(path);
        };
        walk("", 0);
        for (let moves = r.int(0, 3); moves > 0 && lines.length > 1; moves--) {
          const from = r.int(0, lines.length - 1);
          const [line] = lines.splice(from, 1);
          if (r.chance(0.8)) lines.splice(r.int(from, lines.length), 0, line);
          if (r.chance(0.2)) lines.splice(r.int(0, lines.length), 0, r.pick(lines));
        }
        const bytes = utf8(lines.map((line, k) => `${k}\t${line}\n`).join(""));
        // The input's length, a hint the reader makes room by after its first chunk: right or wrong.
        const inputBytes = r.pick([undefined, bytes.length, 1, 10 * bytes.length]);
        const options = opts({ format: "paths", file: "tidewater.paths", inputBytes });
        const expected = outcomeOf(() => loadByReference(bytes, options));
        const actual = await outcomeOfAsync(() => loadStreamed(bytes, options, cutsFor(r, bytes.length, 4)));
        if ("tree" in expected && "tree" in actual) expectSameTreeAndSummaries(r, actual.tree, expected.tree);
        else expect(actual).toEqual(expected);
      }),
      { numRuns: 200 },
    );
  });

  it("loadTreeFromStream(paths) reports errors at the lines the reference reports", async () => {
    const cases = [
      "a\na/b\n\na/b\n",
      "1\ta\n4.0K\ta/b\n",
      "1\ta\na/b\n",
      // A size with an empty path is the root; a second one repeats it.
      "1\t\n2\ta\n3\t\n",
      " \n\t\n",
      "",
      // A size padded with a no-break space (trimmed, so valid).
      "1\ta\n\u00a02\t\n\u00a03\t\n",
      "1\ta\n1234567890123456\t\n9\t\n",
      "1\ta\nx\u00e9\tb\n",
    ];
    for (const text of cases) {
      const bytes = utf8(text);
      const options = opts({ format: "paths", file: "t.paths" });
      const expected = outcomeOf(() => loadByReference(bytes, options));
      expect(expected).toHaveProperty("code");
      for (const cuts of [[], everyByte(bytes.length)]) {
        expect(await outcomeOfAsync(() => loadStreamed(bytes, options, cuts))).toEqual(expected);
      }
    }
    const limit = opts({ format: "paths", maxNodes: 3 });
    expect(await outcomeOfAsync(() => loadStreamed(utf8("a\nb\nc/d/e\n"), limit, [3]))).toEqual({
      code: "LIMIT_EXCEEDED",
      pos: { line: 3 },
    });
  });
});
