import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

const march = readFileSync("fixtures/examples/org-march.csv", "utf8");
const april = readFileSync("fixtures/examples/org-april.csv", "utf8");

/** `csv` with every id (and every manager's) mapped to another one, and names by `name`; structure kept. */
function renumbered(csv: string, id: (old: string) => string, name = (n: string) => n): string {
  const [header, ...rows] = csv.trimEnd().split("\n");
  const row = (line: string) => {
    const [i, manager, n] = line.split(",");
    return [id(i), manager === "" ? "" : id(manager), name(n)].join(",");
  };
  return `${[header, ...rows.map(row)].join("\n")}\n`;
}

/**
 * The independent count: each row's id and path of names (its managers' names down to its own), in the
 * rows' order, read from the CSV here (RFC 4180 rows; these hold no quotes).
 */
function rowPaths(csv: string): [string, string][] {
  const rows = csv
    .trimEnd()
    .split("\n")
    .slice(1)
    .map((row) => row.split(","));
  const byId = new Map(rows.map(([id, manager, name]) => [id, { manager, name }]));
  const path = (id: string): string => {
    const row = byId.get(id)!;
    return row.manager === "" ? row.name : `${path(row.manager)}/${row.name}`;
  };
  return rows.map(([id]) => [id, path(id)]);
}

/** Every row's path of names, sorted: rows whose path is in both versions a sorted line diff leaves. */
function namePaths(csv: string): string[] {
  return rowPaths(csv)
    .map(([, path]) => path)
    .sort();
}

/** The paths of names of the rows of `csv` whose id `other` lacks. */
function pathsById(csv: string, other: string): string[] {
  const kept = new Set(rowPaths(other).map(([id]) => id));
  return rowPaths(csv)
    .filter(([id]) => !kept.has(id))
    .map(([, path]) => path);
}

const args = ["--parent-field", "manager", "--format", "json"];

describe("idsRenumberedNote", () => {
  it("says so when no id was kept while every node pairs by name and place", async () => {
    const next = renumbered(march, (id) => `P${100 + Number(id.slice(1))}`);
    const result = await cli(["diff", "march.csv", "next.csv", ...args], {
      files: { "march.csv": march, "next.csv": next },
    });
    const diff = JSON.parse(result.stdout);
    // Every row's path of names is in both lists: the sorted lists are equal, the root aside.
    const paths = namePaths(march);
    expect(namePaths(next)).toEqual(paths);
    expect(diff.changes).toMatchObject({ added: paths.length - 1, removed: paths.length - 1 });
    expect(diff.notes).toEqual([
      expect.objectContaining({
        version: "NEW",
        code: "IDS_RENUMBERED",
        message: expect.stringContaining(", while 9 of them pair by path"),
      }),
    ]);
    expect(result.stderr).toMatch(/^espalier: note: next\.csv: matched by id, .*\[IDS_RENUMBERED\]\n$/);
    const text = await cli(["diff", "march.csv", "next.csv", "--parent-field", "manager"], {
      files: { "march.csv": march, "next.csv": next },
    });
    expect(text.stdout.split("\n")[0]).toContain("; ids look renumbered (9 nodes pair by path)");
  });

  it("says so when half the ids changed, counting the removed nodes that pair by name and place", async () => {
    // Every second row (E2, E4, …) numbered afresh, its reports' manager column with it.
    const next = renumbered(march, (id) =>
      Number(id.slice(1)) % 2 === 0 ? `P${100 + Number(id.slice(1))}` : id,
    );
    const result = await cli(["diff", "march.csv", "next.csv", ...args], {
      files: { "march.csv": march, "next.csv": next },
    });
    const diff = JSON.parse(result.stdout);
    // The independent count: the paths of names of the rows whose id only March has, against those of
    // the rows whose id only the next version has; every one of the first is among the second.
    const removed = pathsById(march, next);
    const added = pathsById(next, march);
    expect(removed.length).toBe(5);
    expect(removed.filter((path) => added.includes(path))).toHaveLength(5);
    expect(diff.changes).toMatchObject({ added: added.length, removed: removed.length });
    expect(diff.notes).toEqual([
      expect.objectContaining({
        version: "NEW",
        code: "IDS_RENUMBERED",
        message: expect.stringContaining(", while 5 of them pair by path"),
      }),
    ]);
    const text = await cli(["diff", "march.csv", "next.csv", "--parent-field", "manager"], {
      files: { "march.csv": march, "next.csv": next },
    });
    expect(text.stdout.split("\n")[0]).toContain("; ids look renumbered (5 nodes pair by path)");
  });

  it("says so when ids number the rows and a row taken out shifts them: nodes read as moved and renamed", async () => {
    // A listing of the fictional harbour depot's sheds, bays and crates, its rows numbered as an export
    // numbers them (id = row number), then the same listing with one early crate taken out: every later
    // row's number is one less, so by id later rows name other nodes.
    const rows: [string, string][] = [["depot", ""]];
    for (let shed = 1; shed <= 4; shed++) {
      rows.push([`shed-${shed}`, "depot"]);
      for (let bay = 1; bay <= 3; bay++) {
        rows.push([`bay-${bay}`, `depot/shed-${shed}`]);
        for (let crate = 1; crate <= 4; crate++)
          rows.push([`crate-${crate}`, `depot/shed-${shed}/bay-${bay}`]);
      }
    }
    const table = (kept: [string, string][]): string => {
      const pathOf = (k: number) => (kept[k][1] === "" ? "" : `${kept[k][1]}/`) + kept[k][0];
      const number = new Map(kept.map((_, k) => [pathOf(k), String(k + 1)]));
      const lines = kept.map(
        ([name, parent], k) => `${k + 1},${parent === "" ? "" : number.get(parent)},${name}`,
      );
      return `id,manager,name\n${lines.join("\n")}\n`;
    };
    const before = table(rows);
    const after = table(rows.filter((_, k) => k !== 3));
    const result = await cli(["diff", "before.csv", "after.csv", ...args], {
      files: { "before.csv": before, "after.csv": after },
    });
    const diff = JSON.parse(result.stdout);
    // The independent count: the paths of names both versions have (RFC 4180 rows, no quotes here), and
    // among them those whose id differs between the versions.
    const byPath = (csv: string) => new Map(rowPaths(csv).map(([id, path]) => [path, id]));
    const [oldPaths, newPaths] = [byPath(before), byPath(after)];
    const otherId = [...newPaths].filter(
      ([path, id]) => path !== "depot" && oldPaths.has(path) && oldPaths.get(path) !== id,
    );
    expect(otherId).toHaveLength(rows.length - 4);
    expect(diff.changes.moved + diff.changes.renamed).toBeGreaterThan((rows.length - 1) / 10);
    expect(diff.notes).toEqual([
      expect.objectContaining({
        version: "NEW",
        code: "IDS_RENUMBERED",
        message: expect.stringContaining(`, while ${otherId.length} nodes of NEW pair by path`),
      }),
    ]);
  });

  it("writes its numbers as the header does, the count the header says named alike (field test: 999999 beside 998,998)", async () => {
    // Field test: a million-row org chart numbered afresh, one person gone: standard error said
    // `999999 found no id` in raw digits where the header said `998,998 nodes pair by path`. Here
    // an invented chart of 1,500 people (the columns of an org export: id, manager, name), numbered
    // afresh in NEW but for the root, the last person (a leaf) gone.
    const people = 1500;
    const chart = (offset: number, kept: number) => {
      const rows = ["id,manager,name"];
      const id = (k: number) => (k === 1 ? "1" : String(k + offset));
      for (let k = 1; k <= kept; k++) rows.push(`${id(k)},${k === 1 ? "" : id(k >> 1)},Crew ${k}`);
      return `${rows.join("\n")}\n`;
    };
    const files = { "old.csv": chart(0, people), "new.csv": chart(100_000, people - 1) };
    const result = await cli(["diff", "old.csv", "new.csv", "--parent-field", "manager", "--width", "100"], {
      files,
    });
    expect(result.code).toBe(0);
    // Below the root every id changed: 1,499 found no id; all but the one gone pair by path, 1,498.
    expect(result.stderr).toContain(
      "of OLD's 1,499 nodes below the root 1,499 found no id in NEW, while 1,498 of them pair by path",
    );
    expect(result.stderr).not.toMatch(/[0-9]{4}/);
    const header = result.stdout.split("\n").slice(0, 4).join(" ");
    expect(header).toContain("ids look renumbered (1,498 nodes pair by path)");
  });

  it("says nothing when the ids were kept (a month of real changes) or most changed along with names", async () => {
    for (const [oldText, newText] of [
      [march, april],
      [
        march,
        renumbered(
          march,
          (id) => `P${id}`,
          (name) => name.replaceAll("a", "o"),
        ),
      ],
    ]) {
      const result = await cli(["diff", "old.csv", "new.csv", ...args], {
        files: { "old.csv": oldText, "new.csv": newText },
      });
      expect(JSON.parse(result.stdout).notes).toBeUndefined();
      expect(result.stderr).toBe("");
    }
  });

  it("names no person under --pseudonymize", async () => {
    const next = renumbered(march, (id) => `P${id}`);
    const result = await cli(["diff", "march.csv", "next.csv", ...args, "--pseudonymize"], {
      files: { "march.csv": march, "next.csv": next },
      env: { ESPALIER_PSEUDONYM_KEY: "test-key-test-key" },
    });
    expect(result.stderr).toContain("[IDS_RENUMBERED]");
    for (const name of namePaths(march).flatMap((p) => p.split("/")))
      expect(result.stderr).not.toContain(name);
  });
});
