import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { loadTree } from "../../../src/load/index.js";
import { csvTableFromStream } from "../../../src/load/table/csv-table.js";
import { opts } from "../helpers.js";
import {
  awkwardAt,
  cutsFor,
  everyByte,
  expectSameTree,
  expectSameTreeAndSummaries,
  loadByReference,
  loadStreamed,
  type Outcome,
  outcomeOf,
  outcomeOfAsync,
  type Rng,
  rng,
  utf8,
} from "../stream/helpers.js";

const NAMES = ["Optics", "Mira Quell", "é", "日本", "😀", "a, b", 'say "hi"', "two\nlines", "", " padded "];

/** A CSV cell: quoted when it must be (RFC 4180), and sometimes when it need not be. */
function cell(r: Rng, value: string, delimiter: string): string {
  if (delimiter === "\t") return value.replace(/[\t\n\r"]/g, " ");
  const must = /[",\r\n]/.test(value);
  return must || r.chance(0.2) ? `"${value.replace(/"/g, '""')}"` : value;
}

/**
 * A table linked by id and parent (or by path), with a name, size and team column, in random order.
 * With `faults` (linked by id), now and then an id repeated or empty, and parents written as the null-parent values
 * `nullParents` names ("0", "NULL"; and an id "0" that is one of them).
 */
function table(r: Rng, rows: number, delimiter: string, faults = false): string {
  const byPath = !faults && r.chance(0.3);
  const columns = byPath ? ["path", "name", "size", "team"] : ["id", "parent", "name", "size", "team"];
  for (let k = columns.length - 1; k > 0; k--) {
    const j = r.int(0, k);
    [columns[k], columns[j]] = [columns[j], columns[k]];
  }
  const eol = r.chance(0.5) ? "\n" : "\r\n";
  const lines = [columns.map((c) => cell(r, c, delimiter)).join(delimiter)];
  const paths: string[] = [];
  // Ids as text (some beyond ASCII), as plain whole numbers (kept as numbers while streaming), with a
  // leading zero (another id than the number), past the rows' count, past 2^31, or long.
  const ids: string[] = [];
  const numeric = r.chance(0.5);
  for (let k = 1; k <= rows; k++) {
    const forms = [`${k}`, `${k}`, `0${k}`, `${k * 100_000}`, `${k + 3_000_000_000}`, `${k}000000000000`];
    let id = !numeric ? r.pick([`q${k}`, `q${k}`, `日${k}`]) : k === 1 && r.chance(0.3) ? "0" : r.pick(forms);
    if (faults && k > 1 && r.chance(0.03)) id = r.pick(ids);
    if (faults && r.chance(0.01)) id = "";
    ids.push(id);
  }
  for (let k = 1; k <= rows; k++) {
    const parent = k === 1 || r.chance(0.1) ? 0 : r.int(1, k - 1);
    const segment = `n${k}${r.pick(["", "é", "日"])}`;
    paths.push(parent === 0 ? segment : `${paths[parent - 1]}/${segment}`);
    const values: Record<string, string> = {
      id: ids[k - 1],
      // Now and then a parent no row has (MISSING_PARENT), by number or text.
      parent:
        parent === 0
          ? faults && r.chance(0.5)
            ? r.pick(["0", "NULL"])
            : ""
          : r.chance(0.02)
            ? r.pick(["99999", "q0", "7", "日0"])
            : ids[parent - 1],
      path: paths[k - 1],
      name: r.pick(NAMES),
      size: r.pick(["", "0", "12", "3.5", "1e3"]),
      team: r.pick(NAMES),
    };
    if (r.chance(0.1)) lines.push("");
    lines.push(columns.map((c) => cell(r, values[c], delimiter)).join(delimiter));
  }
  const text = lines.join(eol);
  return r.chance(0.5) ? text + eol : text;
}

/**
 * What the reference and espalier both say of an error: its code and file, and the row of a row's
 * error. Lines and columns are espalier's own (the reference counts a record's first line; espalier
 * the fault's): checked against hand-counted positions in csv-table.test.ts.
 */
function comparable(outcome: Outcome): unknown {
  if ("tree" in outcome) return outcome;
  const pos = (outcome.pos ?? {}) as { file?: string; row?: number };
  // A syntax fault has no data row yet.
  return { code: outcome.code, file: pos.file, row: outcome.code === "PARSE_CSV" ? undefined : pos.row };
}

function lineOf(outcome: Outcome): number | undefined {
  return "tree" in outcome ? undefined : (outcome.pos as { line?: number } | undefined)?.line;
}

const awkward = (bytes: Uint8Array) => awkwardAt(bytes, [0x0d, 0x0a, 0x22, 0x2c]);

describe("loadTreeFromStream(csv)", () => {
  it("loadTreeFromStream(csv, tsv) builds the tree the reference builds and the same summaries, however the bytes are cut", async () => {
    await fc.assert(
      fc.asyncProperty(fc.integer(), fc.integer({ min: 1, max: 30 }), async (seed, rows) => {
        const r = rng(seed);
        const tsv = r.chance(0.3);
        const faults = r.chance(0.3);
        const bytes = utf8(table(r, rows, tsv ? "\t" : ",", faults));
        const options = opts({
          format: r.chance(0.5) ? (tsv ? "tsv" : "csv") : undefined,
          file: tsv ? "org.tsv" : "org.csv",
          keepFields: r.chance(0.5) ? r.pick([["team"], ["team", "parent"], ["id"]]) : [],
          ...(faults ? { nullParents: ["0", "NULL"] } : {}),
        });
        // The input's length sizes the columns once the first chunk is read; a wrong one is only a
        // wrong guess (it changes nothing read).
        const inputBytes = r.pick([undefined, bytes.length, 1, 10 * bytes.length]);
        const streamOptions = inputBytes === undefined ? options : { ...options, inputBytes };
        const cuts = cutsFor(r, bytes.length, r.int(0, 16), awkward(bytes));
        const expected = outcomeOf(() => loadByReference(bytes, options));
        const actual = await outcomeOfAsync(() => loadStreamed(bytes, streamOptions, cuts));
        if (!("tree" in expected) || !("tree" in actual)) {
          expect(comparable(actual)).toEqual(comparable(expected));
          return;
        }
        expectSameTreeAndSummaries(r, actual.tree, expected.tree);
      }),
      { numRuns: 200 },
    );
  });

  it("loadTreeFromStream(csv) reads single-byte chunks: a quoted line break, a CRLF, a cut character", async () => {
    const bytes = utf8('\ufeffid,parent,name\r\n1,,"Quill\r\nfeather, ""é"""\r\n2,1,日本\r\n');
    const tree = await loadStreamed(bytes, opts({ format: "csv" }), everyByte(bytes.length));
    expectSameTree(tree, loadByReference(bytes, opts({ format: "csv" })));
    expect(tree.name).toEqual(['Quill\r\nfeather, "é"', "日本"]);
  });

  it("loadTreeFromStream(csv) reports errors at the lines and rows the reference reports", async () => {
    const cases: [string, string][] = [
      ['id,parent\n1,\n2,"1\n3,1\n', "csv"],
      ['id,parent\n1,\n\n2,1"x"\n', "csv"],
      ['id,parent,name\n1,,"a\nb"\n2,1\n', "csv"],
      ["id,parent,id\n1,,1\n", "csv"],
      ["id,parent\n", "csv"],
      ["id,parent\n1,\n1,\n", "csv"],
      ["id,parent\n1,2\n", "csv"],
      ["id,parent,size\n1,,12 KB\n", "csv"],
      ["name,size\nx,1\n", "csv"],
      ["id\tparent\n1\t\n2\n", "tsv"],
      ["id,parent\n1,\n\n\n2\n", "csv"],
    ];
    for (const [text, format] of cases) {
      const bytes = utf8(text);
      const options = opts({ format: format as "csv" | "tsv", file: "org.csv" });
      const expected = outcomeOf(() => loadByReference(bytes, options));
      expect(expected, text).toHaveProperty("code");
      // Held whole, the table's bytes place a row's error at its cell; streamed (not read again), at
      // the row's line: the same line either way, however the bytes are cut.
      const whole = outcomeOf(() => loadTree(text, options));
      expect(comparable(whole), text).toEqual(comparable(expected));
      for (const cuts of [[], everyByte(bytes.length)]) {
        const streamed = await outcomeOfAsync(() => loadStreamed(bytes, options, cuts));
        expect(comparable(streamed), text).toEqual(comparable(expected));
        expect(lineOf(streamed), text).toBe(lineOf(whole));
      }
    }
  });

  it("loadTreeFromStream(csv) refuses ids and parents written in other bytes that are no valid UTF-8 but read alike", async () => {
    // The WHATWG Encoding Standard's UTF-8 decoder turns each bad byte here into one U+FFFD, so 0xFF and
    // 0xFE read as the same text. The reference decodes first and so links row 2 to row 1 (or finds the
    // id repeated); reading the bytes, the two are two ids written differently, which would be read as
    // one: DUPLICATE_ID at row 2, however the bytes are cut. The same bytes twice still read as one id.
    const text = (...lines: number[][]) => new Uint8Array(lines.flat());
    const ascii = (line: string) => [...line].map((c) => c.charCodeAt(0));
    const linked = text(ascii("id,parent,name\n"), [0xff], ascii(",,top\n1,"), [0xfe], ascii(",child\n"));
    const repeated = text(ascii("id,parent\n"), [0xff], ascii(",\n"), [0xfe], ascii(",\n"));
    const same = text(ascii("id,parent,name\n"), [0xff], ascii(",,top\n1,"), [0xff], ascii(",child\n"));
    expect(outcomeOf(() => loadByReference(linked, opts({ format: "csv" })))).toHaveProperty("tree");
    expect(outcomeOf(() => loadByReference(repeated, opts({ format: "csv" })))).toHaveProperty(
      "code",
      "DUPLICATE_ID",
    );
    for (const bytes of [linked, repeated]) {
      const options = opts({ format: "csv", file: "org.csv" });
      for (const cuts of [[], everyByte(bytes.length)]) {
        const actual = await outcomeOfAsync(() => loadStreamed(bytes, options, cuts));
        expect(comparable(actual)).toEqual({ code: "DUPLICATE_ID", file: "org.csv", row: 2 });
      }
    }
    const options = opts({ format: "csv", file: "org.csv" });
    const expected = outcomeOf(() => loadByReference(same, options));
    for (const cuts of [[], everyByte(same.length)]) {
      const actual = await outcomeOfAsync(() => loadStreamed(same, options, cuts));
      if ("tree" in expected && "tree" in actual) expectSameTree(actual.tree, expected.tree);
      else expect.unreachable("the same bytes twice are one id");
    }
  });

  it("loadTreeFromStream(csv) stops with LIMIT_EXCEEDED at the first row over maxNodes", async () => {
    const options = opts({ format: "csv", maxNodes: 2 });
    const outcome = await outcomeOfAsync(() =>
      loadStreamed(utf8("id,parent\n1,\n2,1\n3,1\n4,1\n"), options, [12]),
    );
    // Row 3 starts on line 4 (the header is line 1); the row as a whole is placed at its first field,
    // column 1.
    expect(outcome).toEqual({ code: "LIMIT_EXCEEDED", pos: { row: 3, line: 4, column: 1 } });
  });

  it("lets go of its cells once linked; columns read before stay whole", async () => {
    async function* chunks() {
      yield utf8("id,parent,name\n1,,Quillfeather\n2,1,Optics\n");
    }
    const table = await csvTableFromStream(chunks(), ",", opts({}));
    const names = table.column("name");
    table.release?.();
    expect(names).toEqual(["Quillfeather", "Optics"]);
    expect(table.column("name")).toBeUndefined();
  });
});
