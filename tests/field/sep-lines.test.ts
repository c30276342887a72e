import { execFileSync } from "node:child_process";
import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

// Field tests: a table saved with the line spreadsheets write before its header to name the separator
// (`sep=,` or `sep=;`; a convention of spreadsheet programs, common practice, no source). On standard
// input it was detected as a path list, each row one top-level name ("sep=,", "id,parent,name,size",
// "1,,Ledger,0"), exit 0; from a file named .csv it was refused as a header of two columns, saying
// nothing of the line. The conversions the messages name are checked against tail (GNU coreutils) and
// the python3 csv module, whose sum of sizes the tree must give.
const has = (cmd: string, args: string[]) => {
  try {
    execFileSync(cmd, args);
    return true;
  } catch {
    return false;
  }
};
const tools = has("tail", ["--version"]) && has("python3", ["-c", "import csv"]);

// An invented ledger's accounts and their balances in whole units.
const commas = "sep=,\r\nid,parent,name,size\r\n1,,Ledger,0\r\n2,1,Payables,340\r\n3,1,Receivables,125\r\n";
const semicolons = commas.replaceAll(",", ";");

describe("a table after a sep= line", () => {
  it("on standard input is PARSE_PATHS at line 1 naming the line and the way to drop it", async () => {
    for (const [stdin, separator] of [
      [commas, ","],
      [semicolons, ";"],
      [commas.replaceAll("\r\n", "\n"), ","],
    ]) {
      const r = await cli(["-"], { stdin });
      expect(r.code).toBe(2);
      expect(r.stdout).toBe("");
      expect(r.stderr).toMatch(
        new RegExp(
          `^espalier: <stdin>:1:1: line 1, "sep=${separator}", is the line .*tail -n \\+2 FILE.*\\[PARSE_PATHS\\]\\n$`,
        ),
      );
    }
  });

  it("from a file named .csv says what line 1 is", async () => {
    for (const [text, code] of [
      [commas, "PARSE_CSV"],
      [semicolons, "FIELD_MISSING"],
    ]) {
      const r = await cli(["ledger.csv"], { files: { "ledger.csv": text } });
      expect(r.code).toBe(2);
      expect(r.stderr).toMatch(
        new RegExp(`line 1, "sep=.", is the line .*tail -n \\+2 FILE.*\\[${code}\\]\\n$`),
      );
    }
  });

  it.skipIf(!tools)(
    "with the line dropped as the message says, is read with the csv module's sum",
    async () => {
      const sum = (csv: string) =>
        Number(
          execFileSync(
            "python3",
            ["-c", "import csv, sys; print(sum(int(r['size']) for r in csv.DictReader(sys.stdin)))"],
            {
              input: csv,
              encoding: "utf8",
            },
          ),
        );
      const dropped = execFileSync("tail", ["-n", "+2"], { input: commas, encoding: "utf8" });
      const converted = execFileSync(
        "sh",
        [
          "-c",
          `tail -n +2 | python3 -c 'import csv, sys; csv.writer(sys.stdout).writerows(csv.reader(sys.stdin, delimiter=";"))'`,
        ],
        { input: semicolons, encoding: "utf8" },
      );
      for (const table of [dropped, converted]) {
        const r = await cli(["-", "--format", "json"], { stdin: table });
        expect(r.code).toBe(0);
        const read = JSON.parse(r.stdout);
        expect(read.totals.size).toBe(sum(table));
        expect(read.totals.nodes).toBe(3);
      }
    },
  );
});
