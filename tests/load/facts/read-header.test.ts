import { writeFileSync } from "node:fs";
import { join } from "node:path";
import { parse } from "csv-parse/sync";
import { describe, expect, it } from "vitest";
import { EspalierError } from "../../../src/errors.js";
import { readHeader } from "../../../src/load/facts/read-header.js";
import { scratchDir } from "./helpers.js";

const dir = scratchDir();
let files = 0;

function file(bytes: string | Uint8Array): string {
  const path = join(dir, `h${files++}.csv`);
  writeFileSync(path, bytes);
  return path;
}

async function codeOf(promise: Promise<unknown>): Promise<[string, unknown]> {
  try {
    await promise;
  } catch (err) {
    if (err instanceof EspalierError) return [err.code, err.pos];
    throw err;
  }
  return ["(none)", undefined];
}

/** The first record as the reference library csv-parse reads it (RFC 4180). */
function reference(text: string): string[] {
  return (parse(text, { to: 1, relax_column_count: true, bom: true }) as string[][])[0];
}

describe("readHeader(file, delimiter)", () => {
  it("reads quoted names (delimiters, line breaks, doubled quotes) as RFC 4180 does", async () => {
    const text = 'account,"service, ""main""","region\nname",usage\r\nQF-1,a,b,c\n';
    // Source: RFC 4180 §2.5-2.7 through the reference library csv-parse.
    expect(await readHeader(file(text), ",")).toEqual(reference(text));
    expect(reference(text)).toEqual(["account", 'service, "main"', "region\nname", "usage"]);
  });

  it("skips a UTF-8 byte order mark and decodes UTF-8 names", async () => {
    const text = "\uFEFFkonto,größe\nQF-1,3\n";
    // Source: csv-parse with bom: true (the mark is no part of the first name); UTF-8 per RFC 3629.
    expect(await readHeader(file(Buffer.from(text, "utf8")), ",")).toEqual(reference(text));
  });

  it("reads a header longer than one read chunk whole", async () => {
    const names = Array.from({ length: 20_000 }, (_, k) => `column_${k}`);
    const text = `${names.join(",")}\n${names.map(() => "1").join(",")}\n`;
    expect(text.indexOf("\n")).toBeGreaterThan(1 << 16);
    // Source: csv-parse reading the same text.
    expect(await readHeader(file(text), ",")).toEqual(reference(text));
  });

  it("splits a TSV header on tabs only: a quote is an ordinary character there", async () => {
    const text = 'path\t"size"\tx,y\n/a\t1\t2\n';
    // Source: IANA media type text/tab-separated-values (fields separated by tabs, no quoting).
    expect(await readHeader(file(text), "\t")).toEqual(["path", '"size"', "x,y"]);
  });

  it("is INPUT_EMPTY for an empty file", async () => {
    expect((await codeOf(readHeader(file(""), ",")))[0]).toBe("INPUT_EMPTY");
  });

  // The engine, told header = true, takes line 1 as the header even when it is empty, and then reads
  // the real header row as a fact row (tried on @duckdb/node-api 1.5.6): refused before it is asked.
  it("is PARSE_CSV at line 1 when the header line is empty", async () => {
    expect(await codeOf(readHeader(file("\naccount,cost\nQF-1,3\n"), ","))).toEqual([
      "PARSE_CSV",
      { line: 1 },
    ]);
  });

  it("is PARSE_CSV for a malformed header and LIMIT_EXCEEDED past the record limit", async () => {
    expect((await codeOf(readHeader(file('a,"b\n'), ",")))[0]).toBe("PARSE_CSV");
    expect((await codeOf(readHeader(file(`${"x".repeat(5000)}\n1\n`), ",", 1000)))[0]).toBe("LIMIT_EXCEEDED");
  });

  it("is IO for a file that is not there", async () => {
    expect((await codeOf(readHeader(join(dir, "absent.csv"), ",")))[0]).toBe("IO");
  });
});
