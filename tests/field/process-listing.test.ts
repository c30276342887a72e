import { execFileSync } from "node:child_process";
import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

/** Whether the machine has a ps that runs (procps-ng here). */
const hasPs = (() => {
  try {
    execFileSync("ps", ["-ef"], { stdio: "ignore" });
    return true;
  } catch {
    return false;
  }
})();

// Field tests: a process listing as `ps -eo pid,ppid,comm` prints it (procps-ng on this machine: a
// header of right-aligned column names, then one process a line, the numbers padded with spaces on the
// left), reduced to invented process names. It is no CSV or TSV, so it was read as a path list: each
// line one path, a name holding "/" split into folders, exit 0; and --id-field/--parent-field, which
// say how a table is linked, were ignored without a word.
const ps = [
  "    PID    PPID COMMAND",
  "      1       0 tide-init",
  "      2       0 harbor-threads",
  "      3       2 harbor-worker/0:1",
  "      4       2 harbor-worker/1:0",
  "     57       1 quay-daemon",
  "    112      57 ledger sync",
  "",
].join("\n");

/**
 * The conversion the error message gives, done here as awk would: the leading spaces dropped, the
 * first two runs of spaces become tabs (a name may hold spaces), under a header naming the columns.
 */
const psTsv = [
  "id\tparent\tname",
  ...ps
    .split("\n")
    .slice(1, -1)
    .map((line) => line.replace(/^ +/, "").replace(/ +/, "\t").replace(/ +/, "\t")),
  "",
].join("\n");

describe("a process listing as ps prints it", () => {
  it("is PARSE_PATHS at line 1 naming the conversion to a table and --input-format paths", async () => {
    const result = await cli(["-"], { stdin: ps });
    expect(result.code).toBe(2);
    expect(result.stdout).toBe("");
    expect(result.stderr).toMatch(
      /^espalier: <stdin>:1:1: the first line reads as a header of columns .*ps -eo pid=,ppid=,comm= .*--null-parent 0.*--input-format paths \[PARSE_PATHS\]\n$/,
    );
  });

  it("reads each line as a path when --input-format paths asks for it", async () => {
    const result = await cli(["-", "--input-format", "paths", "--format", "json"], { stdin: ps });
    expect(result.stderr).toBe("");
    // 7 lines, two of them split at their "/" into a folder and a name: 7 + 2 nodes, and the root.
    expect(JSON.parse(result.stdout).totals.nodes).toBe(10);
  });

  it("with --id-field and --parent-field is USAGE naming both and the path-list reading", async () => {
    const result = await cli(["-", "--id-field", "PID", "--parent-field", "PPID"], { stdin: ps });
    expect(result.code).toBe(2);
    expect(result.stdout).toBe("");
    expect(result.stderr).toMatch(
      /^espalier: <stdin>: --id-field and --parent-field do not apply: this input is read as a path list .*\[USAGE\]\n$/,
    );
  });

  it("reads as the process tree once converted as the message says", async () => {
    const result = await cli(["-", "--null-parent", "0", "--format", "json"], { stdin: psTsv });
    expect(result.stderr).toBe("");
    const json = JSON.parse(result.stdout);
    // 6 processes under the root espalier adds for the two of parent 0 (awk 'NR>1' | wc -l gives 6).
    expect(json.totals.nodes).toBe(7);
    const init = json.root.children.find((c: { name: string }) => c.name === "tide-init");
    // tide-init (1) <- quay-daemon (57) <- "ledger sync" (112): the name keeps its space.
    expect(init.nodes).toBe(3);
    expect(init.children[0].children[0].name).toBe("ledger sync");
  });
});

// `ps -eo pid,ppid,rss,comm` (procps-ng here: a fourth column, RSS, between PPID and COMMAND). The
// message gave the conversion for pid,ppid,comm; adapted by adding rss= to ps alone, its two splits
// glued each process's RSS to its name ("12144 tide-init"), exit 0. It now follows the header's columns.
const psRss = [
  "    PID    PPID   RSS COMMAND",
  "      1       0 12144 tide-init",
  "      2       0     0 harbor-threads",
  "      3       2     0 harbor-worker/0:1",
  "     57       1 14000 quay-daemon",
  "    112      57  5120 ledger sync",
  "",
].join("\n");

/** The conversion the message gives, done as awk would: the leading spaces dropped, one split per column but the last. */
function converted(listing: string, header: string[]): string {
  const rows = listing
    .split("\n")
    .slice(1, -1)
    .map((line) => {
      let out = line.replace(/^ +/, "");
      for (let k = 1; k < header.length; k++) out = out.replace(/ +/, "\t");
      return out;
    });
  return [header.join("\t"), ...rows, ""].join("\n");
}

describe("a process listing with more columns (ps -eo pid,ppid,rss,comm)", () => {
  it("is PARSE_PATHS naming a conversion that keeps every column, and the size column", async () => {
    const result = await cli(["-"], { stdin: psRss });
    expect(result.code).toBe(2);
    expect(result.stderr).toContain(
      `ps -eo pid=,ppid=,rss=,comm= | awk -v OFS='\\t' 'BEGIN {print "id", "parent", "rss", "name"} {sub(/^ +/, ""); sub(/ +/, "\\t"); sub(/ +/, "\\t"); sub(/ +/, "\\t"); print}' | espalier - --null-parent 0 --size-field rss;`,
    );
  });

  it("reads as the process tree with the RSS column as sizes once converted so", async () => {
    const table = converted(psRss, ["id", "parent", "rss", "name"]);
    const result = await cli(["-", "--null-parent", "0", "--size-field", "rss", "--format", "json"], {
      stdin: table,
    });
    expect(result.stderr).toBe("");
    const json = JSON.parse(result.stdout);
    // The RSS column summed (awk '{s += $3} END {print s}'): 12144 + 14000 + 5120.
    expect(json.totals.size).toBe(12144 + 14000 + 5120);
    const names: string[] = [];
    const walk = (n: { name: string; children: object[] }) => {
      names.push(n.name);
      for (const c of n.children as (typeof n)[]) walk(c);
    };
    walk(json.root);
    expect(names).toContain("ledger sync");
    expect(names.some((n) => /^\d/.test(n))).toBe(false);
  });

  it("gives the pid,ppid,comm conversion for a header it does not know", async () => {
    const result = await cli(["-"], { stdin: psRss.replace("RSS", "WCHAN") });
    expect(result.code).toBe(2);
    expect(result.stderr).toContain("ps -eo pid=,ppid=,comm= | awk");
    expect(result.stderr).not.toContain("--size-field");
  });
});

describe("a process listing with a user's name first (ps -ef, ps aux)", () => {
  // Shaped as procps-ng's ps -ef prints here (UID, then PID and PPID, a command with "/" and spaces
  // last), the names invented: no line starts with a number, so the rule above did not hold, and each
  // line was read as one path split at its "/"s, exit 0.
  const psEf = [
    "UID          PID    PPID  C STIME TTY          TIME CMD",
    "tide           1       0  0 13:48 ?        00:00:01 /srv/tide-init --harbor",
    "tide          57       1  0 13:49 ?        00:00:00 /usr/bin/quay-daemon -c /etc/quay.conf",
    "kelp         112      57  0 18:33 pts/0    00:00:00 ledger sync",
    "",
  ].join("\n");

  it("is PARSE_PATHS at line 1 naming the pid,ppid,comm conversion", async () => {
    const result = await cli(["-"], { stdin: psEf });
    expect(result.code).toBe(2);
    expect(result.stdout).toBe("");
    expect(result.stderr).toMatch(
      /^espalier: <stdin>:1:1: .*fills its columns.*ps -eo pid=,ppid=,comm= .*\[PARSE_PATHS\]\n$/,
    );
  });

  it("keeps the columns of ps -eo user,pid,ppid,comm, every one known", async () => {
    const text = [
      "USER         PID    PPID COMMAND",
      "tide           1       0 tide-init",
      "kelp          57       1 quay",
      "",
    ];
    const result = await cli(["-"], { stdin: text.join("\n") });
    expect(result.stderr).toContain("ps -eo user=,pid=,ppid=,comm= ");
  });

  it.skipIf(!hasPs)("the machine's own ps -ef and ps aux are PARSE_PATHS too", async () => {
    for (const args of [["-ef"], ["aux"]]) {
      const result = await cli(["-"], { stdin: execFileSync("ps", args, { encoding: "utf8" }) });
      expect(result.code, args[0]).toBe(2);
      expect(result.stderr, args[0]).toMatch(/^espalier: <stdin>:1:1: .*\[PARSE_PATHS\]\n$/);
    }
  });

  it("a list whose first line is words in capitals and whose paths hold fewer words is read", async () => {
    const list = "HARBOR LOGS\nHARBOR LOGS/tide.log\nquay/berths.txt\n";
    const result = await cli(["-", "--format", "json"], { stdin: list });
    expect(result.code).toBe(0);
    // "HARBOR LOGS" (listed, holding tide.log), tide.log, quay, berths.txt, and the root joining them.
    expect(JSON.parse(result.stdout).totals.nodes).toBe(5);
  });
});

describe("options that name how another reading links its nodes", () => {
  it("--parent-field on a table linked by its path column is USAGE, not a tree linked by path", async () => {
    // A lock-file-like listing of paths (common practice, no source): no "manager" column, so the rows
    // were linked by path and the option was ignored.
    const table = "path,size\nservices,0\nservices/ledger,120\n";
    const result = await cli(["-", "--input-format", "csv", "--parent-field", "manager"], { stdin: table });
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(
      /--parent-field does not apply: this input is read as a CSV table linked by a path column.*\[USAGE\]\n$/,
    );
  });

  it("--path-field on a table linked by id and parent is USAGE", async () => {
    const table = "id,parent,path\nQ1,,a\nQ2,Q1,a/b\n";
    const result = await cli(["-", "--input-format", "csv", "--path-field", "path"], { stdin: table });
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(
      /--path-field does not apply: .*linked by id and parent columns.*\[USAGE\]/,
    );
  });

  it("--nodes and --id-field on nested JSON (npm ls --all --json shape) are USAGE", async () => {
    const listing = JSON.stringify({
      name: "tidewater",
      dependencies: {
        "mooring-log": { version: "1.2.0", dependencies: { "tidal-math": { version: "0.3.1" } } },
      },
    });
    const result = await cli(["-", "--id-field", "name", "--nodes", "fixtures/tidewater-packages.csv"], {
      stdin: listing,
    });
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(
      /--id-field and --nodes do not apply: this input is read as nested nodes .*\[USAGE\]\n$/,
    );
  });

  it("--children-field named in the config file, on a CSV table, is USAGE too", async () => {
    const table = "id,parent,name\nQ1,,Rosa\nQ2,Q1,Arjun\n";
    const result = await cli(["-", "--input-format", "csv"], {
      stdin: table,
      files: { ".espalier.yaml": "childrenField: reports\n" },
    });
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(
      /--children-field does not apply: .*CSV table linked by id and parent.*\[USAGE\]/,
    );
  });

  it("leaves the options the reading does read alone", async () => {
    const table = "pid,ppid,name\n1,,Rosa\n2,1,Arjun\n";
    const result = await cli(["-", "--input-format", "csv", "--id-field", "pid", "--parent-field", "ppid"], {
      stdin: table,
    });
    expect(result.stderr).toBe("");
    expect(result.code).toBe(0);
  });
});
