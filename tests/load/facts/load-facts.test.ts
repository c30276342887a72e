import { readFileSync, writeFileSync } from "node:fs";
import { join, resolve } from "node:path";
import { parse } from "csv-parse/sync";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { EspalierError } from "../../../src/errors.js";
import { openEngine } from "../../../src/load/facts/engine.js";
import { openFactTable } from "../../../src/load/facts/load-facts.js";
import { rollupSql } from "../../../src/load/facts/rollup-sql.js";
import { sourceViewSql } from "../../../src/load/facts/source-sql.js";
import { measure } from "../../../src/model/measure.js";
import { keyOptions, levelsOptions, lit, loadFacts, nodeTable, scratchDir, withEngine } from "./helpers.js";

const fixture = resolve(import.meta.dirname, "../../../fixtures/quillfeather-cost-export.csv");
const LEVELS = ["account", "service", "region", "usage"];
const dir = scratchDir();

/** An independent pass: every prefix of the level values with its row count and cost sum, in plain JS. */
function prefixTotals(records: Record<string, string>[], levels: string[], size: string) {
  const out = new Map<string, [number, number]>();
  for (const record of records) {
    let path = "";
    const add = (p: string) => {
      const had = out.get(p) ?? [0, 0];
      out.set(p, [had[0] + 1, had[1] + Number(record[size] || 0)]);
    };
    add(path);
    for (const level of levels) {
      path += `/${record[level]}`;
      add(path);
    }
  }
  return out;
}

describe("loadFactTable(CSV, --levels)", () => {
  // RFC 4180 parse by the reference library csv-parse, then grouping in the test: an independent pass.
  const records: Record<string, string>[] = parse(readFileSync(fixture), { columns: true });

  it("gives every distinct prefix of the level values as a node, with its rows and summed cost", async () => {
    const tree = await loadFacts(fixture, "csv", levelsOptions(LEVELS, "cost"));
    const expected = prefixTotals(records, LEVELS, "cost");
    // Source: the independent pass above over the csv-parse records (RFC 4180).
    expect(nodeTable(tree)).toEqual(expected);
    expect(tree.syntheticRoot).toBe(true);
    expect(measure(tree).count[0]).toBe(expected.size);
  });

  it("totals equal the engine's own count(*) and sum(cost) over the file", async () => {
    const tree = await loadFacts(fixture, "csv", levelsOptions(LEVELS, "cost"));
    const [count, sum] = await withEngine(async (engine) => {
      const r = await engine.run(`SELECT count(*), sum(cost) FROM read_csv(${lit(fixture)})`);
      return [Number(r.values[0][0]), Number(r.values[1][0])];
    });
    // Source: the engine's own aggregates over the file (its CSV reader, its types), not espalier's query.
    expect(Number(tree.fields.get("rows")![0])).toBe(count);
    expect(measure(tree).size[0]).toBe(sum);
    expect(count).toBe(records.length);
  });

  it("reads Parquet and JSON lines written by the engine back as the same tree as the CSV", async () => {
    const parquet = join(dir, "export.parquet");
    const jsonl = join(dir, "export.jsonl");
    await withEngine(async (engine) => {
      await engine.run(`COPY (SELECT * FROM read_csv(${lit(fixture)})) TO ${lit(parquet)} (FORMAT parquet)`);
      await engine.run(`COPY (SELECT * FROM read_csv(${lit(fixture)})) TO ${lit(jsonl)} (FORMAT json)`);
    });
    const fromCsv = await loadFacts(fixture, "csv", levelsOptions(LEVELS, "cost"));
    // Source: the engine's own Parquet and JSON writers; the same table must give the same tree.
    expect(await loadFacts(parquet, "parquet", levelsOptions(LEVELS, "cost"))).toEqual(fromCsv);
    expect(await loadFacts(jsonl, "jsonl", levelsOptions(LEVELS, "cost"))).toEqual(fromCsv);
  });

  it("reads the same table as TSV (tab-separated, no quoting) to the same tree as the CSV", async () => {
    const tsv = join(dir, "export.tsv");
    const header = Object.keys(records[0]);
    // Source: the csv-parse records above (RFC 4180), written with tabs per the IANA registration of
    // text/tab-separated-values (fields separated by tabs, no quoting); none of the cells holds a tab.
    expect(records.every((r) => header.every((c) => !/[\t\r\n]/.test(r[c])))).toBe(true);
    const lines = [header.join("\t"), ...records.map((r) => header.map((c) => r[c]).join("\t"))];
    writeFileSync(tsv, `${lines.join("\n")}\n`);
    const fromCsv = await loadFacts(fixture, "csv", levelsOptions(LEVELS, "cost"));
    expect(await loadFacts(tsv, "tsv", levelsOptions(LEVELS, "cost"))).toEqual(fromCsv);
  });

  it('makes a missing level value a node named "", so no row is dropped', async () => {
    const file = join(dir, "gaps.csv");
    writeFileSync(file, "a,b,c,size\nx,,z,1\nx,y,,2\n,,,4\n");
    const table = nodeTable(await loadFacts(file, "csv", levelsOptions(["a", "b", "c"], "size")));
    expect(table.get("")).toEqual([3, 7]);
    expect(table.get("/x//z")).toEqual([1, 1]);
    expect(table.get("/x/y/")).toEqual([1, 2]);
    expect(table.get("///")).toEqual([1, 4]);
  });

  it("keeps a level value's zeros and quoted commas (cells are text, RFC 4180 quoting)", async () => {
    const file = join(dir, "quoted.csv");
    writeFileSync(file, 'team,item,size\n007,"a,b",1\n007,"say ""hi""",2\n');
    const table = nodeTable(await loadFacts(file, "csv", levelsOptions(["team", "item"], "size")));
    // Source: RFC 4180 section 2 rules 6 and 7 (fields with commas are quoted; quotes doubled).
    expect([...table.keys()]).toEqual(["", "/007", "/007/a,b", '/007/say "hi"']);
  });

  it("has no sizes when the table has no size column", async () => {
    const file = join(dir, "nosize.csv");
    writeFileSync(file, "a,b\nx,y\nx,z\n");
    const tree = await loadFacts(file, "csv", levelsOptions(["a", "b"], "size"));
    expect(tree.hasSizes).toBe(false);
    expect(nodeTable(tree).get("/x")).toEqual([2, 0]);
  });
});

describe("loadFactTable(CSV, --key-field)", () => {
  /** Independent pass: the trie of the keys split on "/", with rows and sizes, and own sizes. */
  function trie(rows: [string, number][]) {
    const out = new Map<string, [number, number]>();
    for (const [key, size] of rows) {
      const segments = key.split("/");
      let path = "";
      const add = (p: string) => {
        const had = out.get(p) ?? [0, 0];
        out.set(p, [had[0] + 1, had[1] + size]);
      };
      add(path);
      for (const s of segments) {
        path += `/${s}`;
        add(path);
      }
    }
    return out;
  }

  // Astral and combining characters too: the engine cuts prefixes by character counts.
  const segment = fc.constantFrom("a", "b", "c", "", "d e", "ä", "x,y", 'q"', "🌊", "e\u0301");
  const key = fc.array(segment, { minLength: 1, maxLength: 6 }).map((s) => s.join("/"));
  const table = fc.array(fc.tuple(key, fc.nat(1000)), { minLength: 1, maxLength: 40 });

  it("gives the trie of the keys, rows and sizes summed over each subtree (property)", async () => {
    let run = 0;
    await fc.assert(
      fc.asyncProperty(table, async (rows) => {
        const file = join(dir, `keys-${run++}.csv`);
        const quote = (s: string) => `"${s.replaceAll('"', '""')}"`;
        writeFileSync(file, `key,size\n${rows.map(([k, s]) => `${quote(k)},${s}`).join("\n")}\n`);
        const tree = await loadFacts(file, "csv", keyOptions("key", "size"));
        // Source: the independent trie above (String.prototype.split semantics for the separator).
        expect(nodeTable(tree)).toEqual(trie(rows));
        // Children in code-point order of their names (common practice, no source: a documented choice).
        for (let i = 1; i < tree.length; i++) {
          const prev = i - 1;
          if (tree.parent[prev] === tree.parent[i]) {
            expect(Buffer.compare(Buffer.from(tree.name.get(prev)), Buffer.from(tree.name.get(i)))).toBe(-1);
          }
        }
      }),
      { numRuns: 25 },
    );
  });

  it("gives the tree of the standard ROLLUP query, NULL keys and keys cut at --key-depth included", async () => {
    const file = join(dir, "nulls.csv");
    // An unquoted empty field is NULL to the engine's CSV reader (allow_quoted_nulls = false); "" is empty.
    writeFileSync(
      file,
      'key,size\na/b/c/d,1\na/b,2\n,4\na/b/c,8\n"",16\n🌊/x/y/z/w,32\na/b/c/e/f,64\n,128\na/b/c/d,256\n',
    );
    for (const keyDepth of [undefined, 1, 2, 3, 5]) {
      const facts = { ...keyOptions("key", "size"), keyDepth };
      const depth = keyDepth ?? 5;
      const out = join(dir, `nulls-${keyDepth ?? "all"}.parquet`);
      await withEngine(async (engine) => {
        await engine.run(sourceViewSql("facts", file, "csv", ["key", "size"]));
        await engine.run(`COPY (${rollupSql(facts, depth, true)}) TO ${lit(out)} (FORMAT parquet)`);
      });
      const levelled = await loadFacts(file, "csv", facts);
      const rolled = await loadFacts(out, "parquet", keyOptions("key", "size"), { rolledUp: true });
      // Source: SQL:1999 GROUP BY ROLLUP semantics (ISO/IEC 9075-2, 7.9), as the engine runs the printed query.
      expect(nodeTable(levelled)).toEqual(nodeTable(rolled));
      expect(Array.from(levelled.ownSize)).toEqual(Array.from(rolled.ownSize));
      expect(levelled.fields.get("rows")).toEqual(rolled.fields.get("rows"));
    }
  });

  it("gives the same tree and node counts when the engine groups in parts", async () => {
    // 600 keys 1 to 6 levels deep, some ending at a node (a key that is also a directory), grouped
    // whole and then at most 40 groups a statement (keys in 15 or more parts, each level in several).
    const file = join(dir, "parts.csv");
    const lines = ["key,size"];
    for (let i = 0; i < 600; i++) {
      const parts = [`b${i % 4}`];
      for (let d = 1; d < 1 + (i % 6); d++) parts.push(`n${(i * (d + 3)) % (d + 4)}`);
      lines.push(`${parts.join("/")}${i % 5 === 0 ? "" : `/o${i}`},${i % 17}`);
    }
    writeFileSync(file, `${lines.join("\n")}\n`);
    const fetch = async (partRows: number | undefined, statements: string[]) => {
      const session = await openFactTable({
        file,
        format: "csv",
        facts: keyOptions("key", "size"),
        rolledUp: false,
        rootName: "facts",
        keepFields: ["rows"],
        maxNodes: Number.POSITIVE_INFINITY,
        partRows,
        engine: { onQuery: (sql) => statements.push(sql) },
      });
      try {
        // Reach 9 from the root: every node, with its subtree node count (elided: none).
        return { size: session.size, near: await session.near([], 9), whole: await session.whole() };
      } finally {
        session.close();
      }
    };
    const wholeRun: string[] = [];
    const partRun: string[] = [];
    const whole = await fetch(undefined, wholeRun);
    const parted = await fetch(40, partRun);
    expect(wholeRun.some((sql) => sql.startsWith("INSERT"))).toBe(false);
    expect(
      partRun.filter((sql) => sql.startsWith("INSERT INTO espalier_keys")).length,
    ).toBeGreaterThanOrEqual(14);
    expect(partRun.some((sql) => sql.startsWith("INSERT INTO espalier_level_"))).toBe(true);
    expect(parted.size).toBe(whole.size);
    for (const key of ["near", "whole"] as const) {
      expect(nodeTable(parted[key])).toEqual(nodeTable(whole[key]));
      expect(measure(parted[key]).count).toEqual(measure(whole[key]).count);
      expect(Array.from(parted[key].ownSize)).toEqual(Array.from(whole[key].ownSize));
    }
  });

  it("splits on a separator of several characters", async () => {
    const file = join(dir, "sep.csv");
    writeFileSync(file, "key,size\na::b::c,1\na::d,2\n");
    const table = nodeTable(await loadFacts(file, "csv", keyOptions("key", "size", "::")));
    expect([...table.keys()]).toEqual(["", "/a", "/a/b", "/a/b/c", "/a/d"]);
  });
});

describe("loadFactTable errors", () => {
  const code = async (promise: Promise<unknown>): Promise<unknown[]> => {
    try {
      await promise;
    } catch (err) {
      return err instanceof EspalierError ? [err.code, err.pos] : [err];
    }
    return ["no error"];
  };

  it("is FIELD_MISSING for a level column the table lacks", async () => {
    const file = join(dir, "few.csv");
    writeFileSync(file, "a,size\nx,1\n");
    expect((await code(loadFacts(file, "csv", levelsOptions(["a", "b"], "size"))))[0]).toBe("FIELD_MISSING");
  });

  it("is PARSE_CSV at the line of a row with too many fields", async () => {
    const file = join(dir, "ragged.csv");
    writeFileSync(file, "a,size\nx,1\ny,2,3\n");
    expect(await code(loadFacts(file, "csv", levelsOptions(["a"], "size")))).toEqual([
      "PARSE_CSV",
      { line: 3 },
    ]);
  });

  it("is BAD_SIZE for a negative or non-numeric size", async () => {
    const negative = join(dir, "neg.csv");
    writeFileSync(negative, "a,size\nx,5\nx,-1\n");
    expect((await code(loadFacts(negative, "csv", levelsOptions(["a"], "size"))))[0]).toBe("BAD_SIZE");
    const text = join(dir, "text.csv");
    writeFileSync(text, "a,size\nx,many\n");
    expect((await code(loadFacts(text, "csv", levelsOptions(["a"], "size"))))[0]).toBe("BAD_SIZE");
  });

  it("places a size that is not a number at its row, line and column in a CSV file", async () => {
    // A quoted field spans lines 2-3 (RFC 4180 section 2.6), so row 2 starts on line 4; its size
    // field starts after "y," (column 3).
    const file = join(dir, "text-at.csv");
    writeFileSync(file, 'a,size\n"x\nx",5\ny,many\nz,7\n');
    const [errorCode, pos] = await code(loadFacts(file, "csv", keyOptions("a", "size")));
    expect(errorCode).toBe("BAD_SIZE");
    expect(pos).toEqual({ row: 2, line: 4, column: 3 });
  });

  it("places a negative size at its row in a table the engine reads in parallel, in the file's order", async () => {
    // 300,000 rows; as Parquet written by the engine they are three row groups of at most 122,880
    // (the engine's default), read by its threads side by side: the row it names must still be the
    // file's row 250,001 (line 250,002 of the CSV, after the header), the first negative one.
    const file = join(dir, "negative-far.csv");
    const lines = ["group,size"];
    for (let i = 0; i < 300_000; i++)
      lines.push(`b${i % 7},${i === 250_000 || i === 280_000 ? -3 : i % 100}`);
    writeFileSync(file, `${lines.join("\n")}\n`);
    const [errorCode, pos] = await code(loadFacts(file, "csv", levelsOptions(["group"], "size")));
    expect(errorCode).toBe("BAD_SIZE");
    expect(pos).toEqual({ row: 250_001, line: 250_002, column: 4 });
    const parquet = join(dir, "negative-far.parquet");
    await withEngine((engine) =>
      engine.run(
        `COPY (SELECT * FROM read_csv(${lit(file)}, columns = {'group': 'VARCHAR', 'size': 'BIGINT'})) TO ${lit(parquet)} (FORMAT parquet)`,
      ),
    );
    expect(await code(loadFacts(parquet, "parquet", levelsOptions(["group"], "size")))).toEqual([
      "BAD_SIZE",
      { row: 250_001 },
    ]);
  });

  it("places a bad size of a JSON lines record at its line, blank lines counted", async () => {
    const file = join(dir, "bad-size.jsonl");
    writeFileSync(file, '{"key":"a/b","size":1}\n\n{"key":"a/c","size":"lots"}\n');
    expect(await code(loadFacts(file, "jsonl", keyOptions("key", "size")))).toEqual([
      "BAD_SIZE",
      { row: 2, line: 3 },
    ]);
  });

  it("is PARSE_JSON at the line and column of a malformed JSON lines record", async () => {
    // RFC 8259 section 4: after a member, only "," or "}" may follow; the second member's opening
    // quote (column 14 of line 4, blank line 2 counted) is where the text stops being JSON.
    const file = join(dir, "malformed.jsonl");
    writeFileSync(file, '{"key":"a/b","size":1}\n\n{"key":"a/c","size":2}\n{"key":"a/e" "size":3}\n');
    expect(await code(loadFacts(file, "jsonl", keyOptions("key", "size")))).toEqual([
      "PARSE_JSON",
      { line: 4, column: 14 },
    ]);
  });

  it("is INPUT_EMPTY for a table without rows", async () => {
    const file = join(dir, "header-only.csv");
    writeFileSync(file, "a,size\n");
    expect((await code(loadFacts(file, "csv", levelsOptions(["a"], "size"))))[0]).toBe("INPUT_EMPTY");
  });

  it("is ENGINE_MISSING, with what to do, where the engine package does not load", async () => {
    const err = await openEngine({}, "@duckdb/no-such-engine-package").catch((e) => e);
    expect(err).toBeInstanceOf(EspalierError);
    expect(err.code).toBe("ENGINE_MISSING");
  });
});
