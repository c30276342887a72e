import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

// Field tests: a process table as `ps -eo pid,ppid,comm` prints it (POSIX ps, -o: the columns are
// named by the keywords; ppid 0 is "no parent" on Linux, common practice, no source), turned into
// TSV, with invented command names. It has no "name" column: its nodes are named by their pids, and
// the header says so, so a reader sees that the names sit in another column (--name-field comm).
const processes = [
  "pid\tppid\tcomm",
  "1\t0\tharbourd",
  "212\t1\tnetkeel",
  "213\t1\tquaylog",
  "480\t212\tnetkeel-w",
  "",
].join("\n");

/** The table read as TSV from standard input, linked by pid and ppid. */
const LINKED = [
  "-",
  "--input-format",
  "tsv",
  "--id-field",
  "pid",
  "--parent-field",
  "ppid",
  "--null-parent",
  "0",
];

describe("a table linked by id without a name column", () => {
  it("is named by its ids and the header says which column names it, in text and JSON", async () => {
    const text = await cli([...LINKED, "--budget", "8", "--width", "200"], { stdin: processes });
    expect(text.stderr).toBe("");
    expect(text.stdout.split("\n")[0]).toMatch(
      /^summary: 4 nodes; named by pid \(no name column\); no focus; /,
    );
    // The lines show pids: 1, then 212 and 213 under it, 480 under 212.
    expect(text.stdout).toContain(". 212 / 480");
    const json = JSON.parse((await cli([...LINKED, "--format", "json"], { stdin: processes })).stdout);
    expect(json.input.namesFrom).toBe("pid");
    expect(json.root.name).toBe("1");
  });

  it("says nothing once --name-field or --label chooses the text, and nothing for a table with a name column", async () => {
    const named = await cli([...LINKED, "--name-field", "comm", "--width", "200"], { stdin: processes });
    expect(named.stdout.split("\n")[0]).toMatch(/^summary: 4 nodes; no focus; /);
    expect(named.stdout).toContain(". netkeel / netkeel-w");
    const labelled = await cli([...LINKED, "--label", "{comm}", "--width", "200"], { stdin: processes });
    expect(labelled.stdout.split("\n")[0]).toMatch(/^summary: 4 nodes; no focus; /);
    const withName = processes.replace("pid\tppid\tcomm", "pid\tppid\tname");
    const json = JSON.parse((await cli([...LINKED, "--format", "json"], { stdin: withName })).stdout);
    expect(json.input.namesFrom).toBeUndefined();
    expect(json.root.name).toBe("harbourd");
  });

  it("says it in a diff's header too, where either version has no name column", async () => {
    const result = await cli(["diff", "old.tsv", "new.tsv", ...LINKED.slice(1), "--width", "200"], {
      files: { "old.tsv": processes, "new.tsv": processes.replace("213\t1\tquaylog\n", "") },
    });
    expect(result.stdout.split("\n")[0]).toMatch(/; named by pid \(no name column\); /);
  });
});
