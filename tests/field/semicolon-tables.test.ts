import { execFileSync } from "node:child_process";
import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

// Field tests: a table as a spreadsheet saves "CSV" where the comma is the decimal mark: ";" between
// cells, a UTF-8 byte-order mark, CRLF line ends, cells in quotes. RFC 4180 (section 2) separates
// fields by commas, so espalier does not read it as CSV; from a file named .csv it was FIELD_MISSING
// saying so, but on standard input it was detected as a path list, each whole row one top-level name
// ("1;;Quill;0"), exit 0. The conversion the message names is checked against the python3 csv module
// (the reference reader and writer of the Python standard library), whose sum of sizes the tree must give.
const python = (() => {
  try {
    execFileSync("python3", ["-c", "import csv"]);
    return true;
  } catch {
    return false;
  }
})();

// An invented stationer's departments and their stock value in whole units.
const table =
  '\ufeffid;parent;name;size\r\n"1";"";"Stationer";"0"\r\n"2";"1";"Paper";"120"\r\n"3";"1";"Inks";"45"\r\n"4";"2";"Card; heavy";"30"\r\n';

describe("a table separated by semicolons", () => {
  it("on standard input is PARSE_PATHS naming the conversion, not a list of rows read as paths", async () => {
    // Row 4's quoted cell holds a semicolon of its own, so that line has one more.
    const even = table.replace("Card; heavy", "Card");
    for (const stdin of [even, even.replaceAll("\r\n", "\n"), even.replaceAll('"', "")]) {
      const r = await cli(["-"], { stdin });
      expect(r.code).toBe(2);
      expect(r.stdout).toBe("");
      expect(r.stderr).toMatch(
        /^espalier: <stdin>:1:1: every line holds 3 semicolons, .*delimiter=";".*\[PARSE_PATHS\]\n$/,
      );
    }
    // --input-format paths reads each line as a path, as asked.
    expect((await cli(["-", "--input-format", "paths", "--bare"], { stdin: even })).code).toBe(0);
  });

  it.skipIf(!python)(
    "converted as the message says, is read with the sizes the csv module reads",
    async () => {
      const converted = execFileSync(
        "python3",
        ["-c", 'import csv, sys; csv.writer(sys.stdout).writerows(csv.reader(sys.stdin, delimiter=";"))'],
        { input: table.replace("\ufeff", ""), encoding: "utf8" },
      );
      const sum = execFileSync(
        "python3",
        ["-c", "import csv, sys; print(sum(int(r['size']) for r in csv.DictReader(sys.stdin)))"],
        { input: converted, encoding: "utf8" },
      );
      const r = await cli(["-", "--format", "json"], { stdin: converted });
      expect(r.code).toBe(0);
      const read = JSON.parse(r.stdout);
      expect(read.totals.size).toBe(Number(sum));
      expect(read.totals.nodes).toBe(4);
    },
  );

  it("from a file named .csv is PARSE_CSV or FIELD_MISSING naming the same conversion", async () => {
    // Quoted cells: a quote closed before a ";" (PARSE_CSV); unquoted: one column named "id;parent;…".
    for (const [text, code] of [
      [table, "PARSE_CSV"],
      [table.replaceAll('"', ""), "FIELD_MISSING"],
    ]) {
      const r = await cli(["stock.csv"], { files: { "stock.csv": text } });
      expect(r.code).toBe(2);
      expect(r.stderr).toMatch(new RegExp(`semicolon-separated.*delimiter=";".*\\[${code}\\]\n$`));
    }
  });
});
