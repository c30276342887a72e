import type { Buffer } from "node:buffer";
import { execFileSync } from "node:child_process";
import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

// Field tests: JSON and YAML documents an old system wrote in Latin-1 (ISO/IEC 8859-1), made here from
// UTF-8 ones by iconv (glibc). RFC 8259 section 8.1 wants JSON in UTF-8 and YAML 1.2 (section 5.2, from memory)
// reads UTF-8 or UTF-16; each Latin-1 byte above 0x7F reads as U+FFFD (WHATWG Encoding Standard, UTF-8
// decoder). Path lists, tables and edge lists said so with UNDECODABLE_BYTES; a document printed
// "caf\uFFFD" with no word, exit 0. Counts come from the UTF-8 original: JSON.parse (ECMA-262) for
// its strings, keys included, holding a character above U+007F; its lines for YAML.
const hasIconv = (() => {
  try {
    return execFileSync("iconv", ["-f", "utf-8", "-t", "latin1"], { input: "é" }).length === 1;
  } catch {
    return false;
  }
})();
const latin1 = (utf8: string): Buffer =>
  execFileSync("iconv", ["-f", "utf-8", "-t", "latin1"], { input: utf8 });

/** Strings of a JSON value (keys too) holding a character above U+007F. */
function highStrings(value: unknown): number {
  const high = (s: string) => (/[^\x00-\x7f]/.test(s) ? 1 : 0);
  if (typeof value === "string") return high(value);
  if (Array.isArray(value)) return value.reduce<number>((n, v) => n + highStrings(v), 0);
  if (value !== null && typeof value === "object")
    return Object.entries(value).reduce<number>((n, [k, v]) => n + high(k) + highStrings(v), 0);
  return 0;
}

// An invented bakery's menu, as node objects, a children-by-name object and rows.
const nodes = JSON.stringify(
  {
    name: "bakery",
    children: [
      { name: "café-menu", size: 120 },
      {
        name: "pâtisserie",
        children: [
          { name: "tarte-tatin", size: 40 },
          { name: "crème", size: 12 },
        ],
      },
      { name: "weekly", size: 900 },
    ],
  },
  null,
  2,
);
const byName = '{"bakery": {"café": {"size": 3}, "pâtisserie": {"éclair": {"size": 2}}}}\n';
const rows =
  '[{"id": "bakery", "parent": ""}, {"id": "café", "parent": "bakery"}, {"id": "thé", "parent": "café"}]\n';
const yaml = "bakery:\n  café-menu: 120\n  pâtisserie:\n    crème: 12\n    tarte: 40\n  weekly: 900\n";

describe.skipIf(!hasIconv)("documents whose bytes are not UTF-8", () => {
  it("JSON node objects, children by name, rows and values say UNDECODABLE_BYTES counting strings", async () => {
    for (const [utf8, args] of [
      [nodes, []],
      [byName, []],
      [rows, []],
      [nodes, ["--read-as", "values"]],
    ] as const) {
      const count = highStrings(JSON.parse(utf8));
      expect(count).toBeGreaterThan(0);
      const firstLine = utf8.split("\n").findIndex((l) => /[^\x00-\x7f]/.test(l)) + 1;
      const r = await cli(["-", "--input-format", "json", "--format", "json", ...args], {
        stdin: latin1(utf8),
      });
      expect(r.code, r.stderr).toBe(0);
      expect(JSON.parse(r.stdout).input.notes, utf8).toEqual([
        expect.objectContaining({ code: "UNDECODABLE_BYTES", count, line: firstLine }),
      ]);
      // The same document in UTF-8: no note, the same nodes and sizes.
      const clean = await cli(["-", "--input-format", "json", "--format", "json", ...args], { stdin: utf8 });
      expect(JSON.parse(clean.stdout).input.notes).toBeUndefined();
      expect(JSON.parse(clean.stdout).totals.nodes).toBe(JSON.parse(r.stdout).totals.nodes);
    }
  });

  it("JSON read as a graph (an adjacency map, rows with --graph) says UNDECODABLE_BYTES counting lines", async () => {
    const map = '{\n  "bakery": ["café", "pâtisserie"],\n  "pâtisserie": ["café"]\n}\n';
    for (const utf8 of [map, rows]) {
      const lines = utf8.split("\n").filter((l) => /[^\x00-\x7f]/.test(l)).length;
      const first = utf8.split("\n").findIndex((l) => /[^\x00-\x7f]/.test(l)) + 1;
      const r = await cli(["-", "--graph", "--format", "json"], { stdin: latin1(utf8) });
      expect(r.code, r.stderr).toBe(0);
      expect(JSON.parse(r.stdout).input.notes, utf8).toEqual([
        expect.objectContaining({ code: "UNDECODABLE_BYTES", count: lines, line: first }),
      ]);
      const clean = await cli(["-", "--graph", "--format", "json"], { stdin: utf8 });
      expect(JSON.parse(clean.stdout).input.notes).toBeUndefined();
      expect(JSON.parse(clean.stdout).totals.nodes).toBe(JSON.parse(r.stdout).totals.nodes);
    }
  });

  it("a YAML document says UNDECODABLE_BYTES counting its lines", async () => {
    const lines = yaml.split("\n").filter((l) => /[^\x00-\x7f]/.test(l)).length;
    expect(lines).toBe(3);
    const r = await cli(["-", "--input-format", "yaml", "--format", "json"], { stdin: latin1(yaml) });
    expect(r.code, r.stderr).toBe(0);
    expect(JSON.parse(r.stdout).input.notes).toEqual([
      expect.objectContaining({ code: "UNDECODABLE_BYTES", count: lines, line: 2 }),
    ]);
    const text = await cli(["-", "--input-format", "yaml"], { stdin: latin1(yaml) });
    expect(text.stdout.split("\n")[0]).toContain(`; ${lines} entries not UTF-8, read with U+FFFD;`);
    const clean = await cli(["-", "--input-format", "yaml", "--format", "json"], { stdin: yaml });
    expect(JSON.parse(clean.stdout).input.notes).toBeUndefined();
  });
});
