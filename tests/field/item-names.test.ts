import { execFileSync } from "node:child_process";
import { describe, expect, it } from "vitest";
import { parse } from "yaml";
import { loadTree } from "../../src/load/index.js";
import { defaultLoadOptions, ITEM_NAME_FIELD, MOST_ITEM_NAMES } from "../../src/load/load-options.js";
import { cli } from "../helpers/cli.js";

// Field tests: a document read as values named each list item by its index alone, so a CI job's
// steps read `0`, `1`, `2` and `lsblk -J -b`'s devices `0`, `1` however the items name themselves.
// An item with a string `name` now shows it after the index; its name and path stay the index.

/** lsblk (util-linux) where the machine has it: the real tool's JSON, its devices named by `name`. */
const lsblk = (() => {
  try {
    return execFileSync("lsblk", ["-J", "-b"], { encoding: "utf8" });
  } catch {
    return undefined;
  }
})();

/** The text lines of the tree (the header and key left out), each trimmed of its mark. */
const treeLines = (stdout: string) =>
  stdout
    .trimEnd()
    .split("\n")
    .filter((line) => /^\s*[.*:] /.test(line))
    .map((line) => line.replace(/^\s*[.*:] /, ""));

describe.skipIf(lsblk === undefined)("lsblk -J -b read as values", () => {
  it("shows each device's index and its name, as JSON.parse reads lsblk's own output (RFC 8259)", async () => {
    const devices: { name: string }[] = JSON.parse(lsblk!).blockdevices;
    const result = await cli(["lsblk.json", "--budget", "60", "--no-chains"], {
      files: { "lsblk.json": lsblk! },
    });
    expect(result.code).toBe(0);
    const lines = treeLines(result.stdout);
    devices.forEach((device, k) => {
      expect(lines.some((line) => line.startsWith(`${k} name=${device.name}  `))).toBe(true);
    });
  });

  it("keeps each device's name and path its index: the JSON summary's, and a focus by it", async () => {
    const result = await cli(["lsblk.json", "--format", "json", "--focus", "blockdevices/0"], {
      files: { "lsblk.json": lsblk! },
    });
    const doc = JSON.parse(result.stdout);
    const list = doc.root.children.find((c: { name: string }) => c.name === "blockdevices");
    expect(list.children[0]).toMatchObject({ name: "0", path: "blockdevices/0", focus: true });
    expect(list.children[0].label).toBeUndefined();
  });
});

// An invented CI configuration (a fictional monorepo's release job), read by the yaml library
// (YAML 1.2, the reference reader from the registry) for the names each step should show.
const workflow = `name: tidewater release
jobs:
  publish:
    runs-on: harbor-runner
    steps:
      - uses: tidewater/checkout@v3
      - name: Build the ledger
        run: make ledger
      - name: 42
        run: echo numbered
      - name:
          text: nested
      - name: first
        name2: other
        run: sign
`;

describe("a YAML list's items read as values", () => {
  it("show a string name after the index; a number, a mapping or none shows the index alone", async () => {
    const result = await cli(["release.yml", "--budget", "40", "--no-chains"], {
      files: { "release.yml": workflow },
    });
    expect(result.code).toBe(0);
    const steps: Record<string, unknown>[] = parse(workflow).jobs.publish.steps;
    const lines = treeLines(result.stdout);
    steps.forEach((step, k) => {
      const shown = lines.find((line) => line.startsWith(`${k} `) || line.startsWith(`${k}  `));
      expect(shown).toBeDefined();
      if (typeof step.name === "string") expect(shown!.startsWith(`${k} name=${step.name}  `)).toBe(true);
      else expect(shown!.startsWith(`${k}  `)).toBe(true);
    });
  });

  it("show what --label says instead, and {item name} is the name", async () => {
    const plain = await cli(["release.yml", "--budget", "40", "--label", "{name}"], {
      files: { "release.yml": workflow },
    });
    expect(plain.stdout).not.toContain("name=");
    const words = await cli(["release.yml", "--budget", "40", "--label", "{name}: {item name}"], {
      files: { "release.yml": workflow },
    });
    expect(words.stdout).toContain("1: Build the ledger  ");
  });

  it("hide the name under --pseudonymize, as any value a label prints", async () => {
    const result = await cli(["release.yml", "--budget", "40", "--pseudonymize"], {
      files: { "release.yml": workflow },
      env: { ESPALIER_PSEUDONYM_KEY: "0123456789abcdef0123456789abcdef" },
    });
    expect(result.code).toBe(0);
    expect(result.stdout).not.toContain("ledger");
    expect(result.stdout).toMatch(/ name=anon-[0-9a-f]{12} /);
  });

  it("count and size the same as with the index alone: only the line's words change", async () => {
    const named = JSON.parse(
      (await cli(["release.yml", "--format", "json"], { files: { "release.yml": workflow } })).stdout,
    );
    const plain = JSON.parse(
      (
        await cli(["release.yml", "--format", "json", "--label", "{name}"], {
          files: { "release.yml": workflow },
        })
      ).stdout,
    );
    expect(named.totals).toEqual(plain.totals);
    expect(named.totals.size).toBe(Buffer.byteLength(workflow));
  });
});

describe("JSON list items read as values", () => {
  const load = (text: string) => loadTree(text, { ...defaultLoadOptions, readAs: "values", file: "x.json" });

  it("keep the last name where the key repeats, as JSON.parse reads it (ECMA-262 JSON.parse)", () => {
    const text = '{"crew": [{"name": "first", "name": "Ada-7"}, {"name": "B\\u00e9"}, {"id": 3}]}';
    const tree = load(text);
    const names = tree.fields.get(ITEM_NAME_FIELD)!;
    const parsed = JSON.parse(text).crew;
    // Nodes in pre-order: root, crew, item 0, its two name leaves, item 1, its leaf, item 2, its leaf.
    const items = [2, 5, 7];
    expect(items.map((i) => tree.name.get(i))).toEqual(["0", "1", "2"]);
    expect(items.map((i) => names[i])).toEqual(parsed.map((p: { name?: string }) => p.name ?? ""));
  });

  it(`keep none past ${MOST_ITEM_NAMES.toLocaleString("en")} named items`, () => {
    const many = (n: number) => JSON.stringify(Array.from({ length: n }, (_, k) => ({ name: `n${k}` })));
    expect(load(many(3)).fields.has(ITEM_NAME_FIELD)).toBe(true);
    expect(load(many(MOST_ITEM_NAMES)).fields.has(ITEM_NAME_FIELD)).toBe(true);
    expect(load(many(MOST_ITEM_NAMES + 1)).fields.has(ITEM_NAME_FIELD)).toBe(false);
  });
});
