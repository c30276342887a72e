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
 * The independent count: each row's path of names (its managers' names down to its own), read from the
 * CSV here (RFC 4180 rows; these hold no quotes). Rows whose path of names is in both versions are the
 * rows a sorted line diff of the two lists leaves unchanged.
 */
function namePaths(csv: string): string[] {
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
  return rows.map(([id]) => path(id)).sort();
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
        message: expect.stringContaining(", while 9 have"),
      }),
    ]);
    expect(result.stderr).toMatch(/^espalier: note: next\.csv: matched by id, .*\[IDS_RENUMBERED\]\n$/);
    const text = await cli(["diff", "march.csv", "next.csv", "--parent-field", "manager"], {
      files: { "march.csv": march, "next.csv": next },
    });
    expect(text.stdout.split("\n")[0]).toContain("; ids look renumbered (9 nodes pair by path)");
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
