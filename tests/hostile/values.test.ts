import { describe, expect, it } from "vitest";
import { loadTree } from "../../src/load/index.js";
import type { InputFormat } from "../../src/load/load-options.js";
import { measure } from "../../src/model/measure.js";
import { cli } from "../helpers/cli.js";
import { caught, opts } from "../load/helpers.js";
import { oneErrorLine } from "./error-line.js";

// 2^53 + 1 = 9007199254740993 is the first integer a double cannot hold (IEEE 754 binary64: 53-bit
// significand); ECMA-262 names 2^53 - 1 Number.MAX_SAFE_INTEGER.
const PAST_2_53 = "9007199254740993";
const HALF = "4503599627370496"; // 2^52: two of them reach 2^53, one more than the largest exact total

/** Each format with a size written as `size`, on line 2 (in a table, data row 1). */
const formats: { format: InputFormat; input: (size: string) => string }[] = [
  { format: "json", input: (s) => `{"name": "quill",\n "size": ${s}}` },
  { format: "yaml", input: (s) => `name: quill\nsize: ${s}\n` },
  { format: "csv", input: (s) => `id,parent,size\n1,,${s}\n` },
  { format: "tsv", input: (s) => `id\tparent\tsize\n1\t\t${s}\n` },
  { format: "rows", input: (s) => `[\n{"id": "1", "parent": "", "size": ${s}}]` },
  { format: "paths", input: (s) => `0\tquill\n${s}\tquill/a\n` },
];

async function sizeError(format: InputFormat, input: string) {
  return oneErrorLine(await cli(["-", "--input-format", format], { stdin: input }));
}

describe("espalier - (faults of value): rejected with BAD_SIZE and a position, never a wrong total", () => {
  it("a negative size, in every format", async () => {
    for (const { format, input } of formats) {
      const e = await sizeError(format, input("-1"));
      expect(e.code, format).toBe("BAD_SIZE");
      expect(e.line, format).toBe(2);
    }
  });

  it("a size past 2^53 - 1, where doubles stop counting exactly, in every format", async () => {
    for (const { format, input } of formats) {
      const e = await sizeError(format, input(PAST_2_53));
      expect(e.code, format).toBe("BAD_SIZE");
      expect(e.line, format).toBe(2);
    }
  });

  it("a size past 2^53 - 1 is quoted as the input writes it, never as the double it rounds to", async () => {
    // 2^53 + 1 = 9007199254740993 has no double; the nearest is 9007199254740992 (IEEE 754 binary64,
    // round to nearest even; ECMA-262 Number.MAX_SAFE_INTEGER is 2^53 - 1).
    // Not yet for JSON rows (--input-format rows): their cells reach the table as parsed numbers.
    for (const { format, input } of formats.filter((f) => f.format !== "rows")) {
      const r = await cli(["-", "--input-format", format], { stdin: input(PAST_2_53) });
      expect(r.stderr, format).toContain(PAST_2_53);
      expect(r.stderr, format).not.toContain("9007199254740992");
    }
  });

  it("an infinite size (1e400 overflows a double), in every format", async () => {
    for (const { format, input } of formats)
      expect((await sizeError(format, input("1e400"))).code, format).toBe("BAD_SIZE");
  });

  it("a size that is not a number: text, NaN, Infinity, a boolean", async () => {
    const cases: [InputFormat, string, string][] = [
      ["json", "json", '"12"'],
      ["json", "json", "true"],
      ["yaml", "yaml", ".nan"],
      ["yaml", "yaml", ".inf"],
      ["yaml", "yaml", "-.inf"],
      ["yaml", "yaml", '"12"'],
      ["yaml", "yaml", "true"],
      ["csv", "csv", "12abc"],
      ["csv", "csv", "NaN"],
      ["csv", "csv", "Infinity"],
      ["csv", "csv", "0x10"],
      ["tsv", "tsv", "12 KB"],
      ["rows", "rows", '"12"'],
      ["rows", "rows", "false"],
      ["paths", "paths", "NaN"],
      ["paths", "paths", "-0x1"],
    ];
    for (const [format, kind, size] of cases) {
      const { input } = formats.find((f) => f.format === kind)!;
      expect((await sizeError(format, input(size))).code, `${format} ${size}`).toBe("BAD_SIZE");
    }
  });

  it("NaN and Infinity are not JSON (RFC 8259, section 6): PARSE_JSON", async () => {
    for (const size of ["NaN", "Infinity", "-Infinity"]) {
      expect((await sizeError("json", `{"name": "quill", "size": ${size}}`)).code, size).toBe("PARSE_JSON");
    }
  });

  it("sizes each fine but adding up past 2^53 - 1: BAD_SIZE at the node where the total crosses it", async () => {
    const csv = `id,parent,size\n1,,${HALF}\n2,1,1\n3,1,${HALF}\n`;
    expect(await sizeError("csv", csv)).toMatchObject({ code: "BAD_SIZE", line: 4 });
    const paths = `${HALF}\tq\n${HALF}\tq/a\n`;
    expect(await sizeError("paths", paths)).toMatchObject({ code: "BAD_SIZE", line: 2 });
    const yaml = `name: q\nsize: ${HALF}\nchildren:\n  - name: a\n    size: ${HALF}\n`;
    expect((await sizeError("yaml", yaml)).code).toBe("BAD_SIZE");
    const json = `{"name": "q", "size": ${HALF}, "children": {"a": ${HALF}}}`;
    expect((await sizeError("json", json)).code).toBe("BAD_SIZE");
  });

  it("the largest exact total, 2^53 - 1, is accepted and printed exactly", async () => {
    const r = await cli(["-", "--input-format", "csv", "--format", "json"], {
      stdin: `id,parent,size\n1,,${HALF}\n2,1,4503599627370495\n`,
    });
    expect(r.code, r.stderr).toBe(0);
    expect(JSON.parse(r.stdout).totals.size).toBe(Number.MAX_SAFE_INTEGER);
  });

  it("documented choices: an empty table cell is 0, YAML hexadecimal is a number (YAML 1.2 core schema), -0 is 0", async () => {
    const empty = await cli(["-", "--input-format", "csv", "--format", "json"], {
      stdin: "id,parent,size\n1,,\n",
    });
    expect(JSON.parse(empty.stdout).totals.size).toBe(0);
    const hex = await cli(["-", "--input-format", "yaml", "--format", "json"], {
      stdin: "name: q\nsize: 0x10\n",
    });
    expect(JSON.parse(hex.stdout).totals.size).toBe(16);
    const negativeZero = await cli(["-", "--input-format", "json", "--units", "plain", "--bare"], {
      stdin: '{"name": "q", "size": -0}',
    });
    expect(negativeZero.stdout).toBe(". q  0\n");
  });
});

describe("loadTree(text) (faults of value, in memory)", () => {
  it("rejects the same sizes with BAD_SIZE", () => {
    for (const { format, input } of formats) {
      for (const size of ["-1", PAST_2_53, "1e400"]) {
        expect(caught(() => loadTree(input(size), opts({ format }))).code, `${format} ${size}`).toBe(
          "BAD_SIZE",
        );
      }
    }
  });

  it("keeps every accepted total exact: the root's size is the sum of the own sizes", () => {
    const tree = loadTree(`id,parent,size\n1,,${HALF}\n2,1,${Number(HALF) - 1}\n`, opts({ format: "csv" }));
    expect(measure(tree).size[0]).toBe(Number.MAX_SAFE_INTEGER);
  });
});
