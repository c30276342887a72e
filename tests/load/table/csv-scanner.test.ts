import { readdirSync, readFileSync } from "node:fs";
import { createRequire } from "node:module";
import { dirname, join } from "node:path";
import { csvParseRows, tsvParseRows } from "d3-dsv";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { EspalierError } from "../../../src/errors.js";
import { CsvScanner } from "../../../src/load/table/csv-scanner.js";

/** Every record as decoded strings, the chunks cut at `cuts`. */
function scan(bytes: Uint8Array, delimiter = ",", cuts: readonly number[] = []): string[][] {
  const rows: string[][] = [];
  let row: string[] = [];
  const decoder = new TextDecoder();
  const scanner = new CsvScanner(delimiter.charCodeAt(0), {
    field: (column, b, s, e) => {
      row[column] = decoder.decode(b.subarray(s, e));
    },
    record: () => {
      rows.push(row);
      row = [];
      return false;
    },
  });
  let from = 0;
  for (const cut of [...cuts].sort((a, b) => a - b)) {
    if (cut <= from || cut >= bytes.length) continue;
    scanner.write(bytes.slice(from, cut));
    from = cut;
  }
  scanner.write(bytes.slice(from));
  scanner.end();
  return rows;
}

const utf8 = (text: string) => new TextEncoder().encode(text);

function failure(text: string, delimiter = ","): { code: string; pos: unknown } {
  try {
    scan(utf8(text), delimiter);
  } catch (error) {
    if (error instanceof EspalierError) return { code: error.code, pos: error.pos };
    throw error;
  }
  throw new Error(`no error for ${JSON.stringify(text)}`);
}

describe("CsvScanner(delimiter, sink)", () => {
  it("reads every csv-spectrum case as its expected JSON says", () => {
    // csv-spectrum 2.0.0 (npm): each csvs/NAME.csv with the records expected in json/NAME.json.
    const root = dirname(createRequire(import.meta.url).resolve("csv-spectrum/package.json"));
    // location_coordinates is left out: its JSON disagrees with its CSV (another phone number, an
    // object where every other case has a list), and its CSV has quotes inside unquoted fields, which
    // RFC 4180 §2.5 rules out and the scanner refuses (checked below).
    const names = readdirSync(join(root, "csvs")).filter(
      (f) => f.endsWith(".csv") && f !== "location_coordinates.csv",
    );
    expect(names.length).toBe(11);
    for (const file of names) {
      const bytes = readFileSync(join(root, "csvs", file));
      const expected = JSON.parse(readFileSync(join(root, "json", file.replace(/\.csv$/, ".json")), "utf8"));
      for (const cuts of [[], [...bytes.keys()]]) {
        const [header, ...rows] = scan(bytes, ",", cuts);
        const objects = rows.map((r) => Object.fromEntries(header.map((h, k) => [h, r[k]])));
        expect(objects, file).toEqual(expected);
      }
    }
  });

  it("follows RFC 4180 §2's rules", () => {
    // RFC 4180 §2.1: records separated by CRLF; §2.2: the last record may lack one.
    expect(scan(utf8("aaa,bbb,ccc\r\nzzz,yyy,xxx\r\n"))).toEqual([
      ["aaa", "bbb", "ccc"],
      ["zzz", "yyy", "xxx"],
    ]);
    expect(scan(utf8("aaa,bbb,ccc\r\nzzz,yyy,xxx"))).toEqual([
      ["aaa", "bbb", "ccc"],
      ["zzz", "yyy", "xxx"],
    ]);
    // §2.3: an optional header line of the same format (here: the first record like any other).
    expect(scan(utf8("field_name,field_name,field_name\r\naaa,bbb,ccc\r\n"))[0]).toEqual([
      "field_name",
      "field_name",
      "field_name",
    ]);
    // §2.4: each line should contain the same number of fields: a record that does not is an error, at
    // the line and column where it ends a field short; spaces are part of a field.
    expect(scan(utf8("aaa, bbb ,ccc\r\n"))).toEqual([["aaa", " bbb ", "ccc"]]);
    expect(failure("a,b\r\n1,2\r\n3\r\n")).toEqual({ code: "PARSE_CSV", pos: { line: 3, column: 2 } });
    // §2.5: fields may be enclosed in double quotes; a quote may not appear inside an unquoted field.
    expect(scan(utf8('"aaa","bbb","ccc"\r\nzzz,yyy,xxx'))).toEqual([
      ["aaa", "bbb", "ccc"],
      ["zzz", "yyy", "xxx"],
    ]);
    expect(failure('a,b\r\n1,2"x"\r\n')).toEqual({ code: "PARSE_CSV", pos: { line: 2, column: 4 } });
    // §2.6: line breaks, double quotes and commas inside a field need quotes.
    expect(scan(utf8('"aaa","b\r\nbb","ccc"\r\nzzz,yyy,xxx'))).toEqual([
      ["aaa", "b\r\nbb", "ccc"],
      ["zzz", "yyy", "xxx"],
    ]);
    // §2.7: a double quote inside a quoted field is written twice.
    expect(scan(utf8('"aaa","b""bb","ccc"'))).toEqual([["aaa", 'b"bb', "ccc"]]);
    // A quoted field must end with its closing quote followed by a delimiter or a line break (§2's
    // grammar: escaped = DQUOTE *(TEXTDATA / COMMA / CR / LF / 2DQUOTE) DQUOTE).
    expect(failure('a,b\r\n"1"x,2\r\n')).toEqual({ code: "PARSE_CSV", pos: { line: 2, column: 4 } });
    expect(failure('a,b\r\n1,"2\r\n')).toEqual({ code: "PARSE_CSV", pos: { line: 2, column: 3 } });
  });

  it("skips empty lines and a byte order mark, and counts lines inside quoted fields", () => {
    // Common practice, no source: blank lines between records carry no record; a UTF-8 BOM is no data.
    expect(scan(utf8("\ufeffa,b\n\n1,2\r\n\r\n"))).toEqual([
      ["a", "b"],
      ["1", "2"],
    ]);
    expect(scan(utf8('a\n""\n'))).toEqual([["a"], [""]]);
    expect(failure('a,b\n"x\ny\r\nz",1\n\n3\n')).toEqual({ code: "PARSE_CSV", pos: { line: 6, column: 2 } });
  });

  it("reads TSV with the quote as an ordinary byte", () => {
    expect(scan(utf8('a\tb\n"x\ty"\n'), "\t")).toEqual([
      ["a", "b"],
      ['"x', 'y"'],
    ]);
  });

  it("gives d3-dsv's rows on random tables, however the bytes are cut", () => {
    // d3-dsv 3.0.2 (npm) csvParseRows / tsvParseRows as the reference parser.
    const text = fc.string({
      unit: fc.constantFrom("a", "Z", " ", ",", '"', "\r", "\n", "\t", "é", "日", "😀", "0"),
      maxLength: 8,
    });
    fc.assert(
      fc.property(
        fc.boolean(),
        fc.integer({ min: 1, max: 5 }),
        fc.array(fc.array(text, { minLength: 5, maxLength: 5 }), { minLength: 1, maxLength: 12 }),
        fc.constantFrom("\n", "\r\n", "\r"),
        fc.boolean(),
        fc.array(fc.nat(), { maxLength: 8 }),
        fc.array(fc.boolean(), { minLength: 60, maxLength: 60 }),
        (tsv, width, table, eol, trailing, cutAt, quoteAnyway) => {
          let q = 0;
          const delimiter = tsv ? "\t" : ",";
          const rows = table.map((r) =>
            r.slice(0, width).map((v) => (tsv ? v.replace(/[\t\r\n"]/g, "_") : v)),
          );
          // A row of one empty field is a blank line, which both parsers treat differently: skip it.
          if (rows.some((r) => r.length === 1 && r[0] === "")) return;
          const written = rows
            .map((r) =>
              r
                .map((v) =>
                  !tsv && (/[",\r\n]/.test(v) || quoteAnyway[q++ % 60]) ? `"${v.replace(/"/g, '""')}"` : v,
                )
                .join(delimiter),
            )
            .join(eol);
          const source = trailing ? written + eol : written;
          const bytes = utf8(source);
          const expected = tsv ? tsvParseRows(source) : csvParseRows(source);
          expect(
            scan(
              bytes,
              delimiter,
              cutAt.map((c) => c % (bytes.length + 1)),
            ),
          ).toEqual(expected);
        },
      ),
      { numRuns: 500 },
    );
  });

  it("gives d3-dsv's rows on random tables of many rows and long fields, cut into chunks of kilobytes", () => {
    // d3-dsv 3.0.2 (npm) csvParseRows / tsvParseRows as the reference parser. Chunks longer than the
    // bytes a record carried over from the chunk before needs: that record is finished from the start
    // of the chunk and the rest is scanned in place (a record longer than the first try, too).
    const short = fc.string({
      unit: fc.constantFrom("a", " ", ",", '"', "\r", "\n", "é", "日"),
      maxLength: 8,
    });
    const long = fc.string({
      unit: fc.constantFrom("b", ",", '"', "\n", "😀"),
      minLength: 500,
      maxLength: 3000,
    });
    const text = fc.oneof({ arbitrary: short, weight: 40 }, { arbitrary: long, weight: 1 });
    fc.assert(
      fc.property(
        fc.boolean(),
        fc.array(fc.array(text, { minLength: 3, maxLength: 3 }), { minLength: 50, maxLength: 300 }),
        fc.constantFrom("\n", "\r\n", "\r"),
        fc.array(fc.nat(), { maxLength: 6 }),
        (tsv, table, eol, cutAt) => {
          const delimiter = tsv ? "\t" : ",";
          const rows = table.map((r) => r.map((v) => (tsv ? v.replace(/[\t\r\n"]/g, "_") : v)));
          const written = rows
            .map((r) =>
              r.map((v) => (!tsv && /[",\r\n]/.test(v) ? `"${v.replace(/"/g, '""')}"` : v)).join(delimiter),
            )
            .join(eol);
          const bytes = utf8(written);
          const expected = tsv ? tsvParseRows(written) : csvParseRows(written);
          const cuts = cutAt.map((c) => c % (bytes.length + 1));
          expect(scan(bytes, delimiter, cuts)).toEqual(expected);
        },
      ),
      { numRuns: 100 },
    );
  });

  it("refuses a record past the longest at the same line however the chunks are cut (common practice, no source)", () => {
    const long = "x".repeat(3000);
    const bytes = utf8(`a,b\n1,2\n${"3,4\n".repeat(400)}${long},5\n${"6,7\n".repeat(2000)}`);
    const outcome = (cuts: number[]) => {
      const scanner = new CsvScanner(0x2c, { field: () => {}, record: () => false }, 2500);
      try {
        let from = 0;
        for (const cut of cuts) {
          scanner.write(bytes.slice(from, cut));
          from = cut;
        }
        scanner.write(bytes.slice(from));
        scanner.end();
        return "read";
      } catch (error) {
        return error instanceof EspalierError ? { code: error.code, pos: error.pos } : error;
      }
    };
    const whole = outcome([]);
    expect(whole).toEqual({ code: "LIMIT_EXCEEDED", pos: { line: 403 } });
    // The long record starts at byte 1616; cut inside it, and just before and after it.
    for (const cuts of [[1700], [1615], [1617], [1000, 2000, 4000], [1620, 4620]])
      expect(outcome(cuts)).toEqual(whole);
  });

  it("stops when the sink asks", () => {
    const seen: number[] = [];
    const scanner = new CsvScanner(0x2c, {
      field: () => {},
      record: (_fields, line) => {
        seen.push(line);
        return seen.length === 2;
      },
    });
    scanner.write(utf8("a\n1\n2\n3\n"));
    scanner.end();
    expect(seen).toEqual([1, 2]);
    expect(scanner.done).toBe(true);
  });
});
