import { readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import { loadTree } from "../../src/load/index.js";
import { defaultLoadOptions } from "../../src/load/load-options.js";
import { type Measures, measure } from "../../src/model/measure.js";
import type { Tree } from "../../src/model/tree.js";

// Source: Unicode emoji-test.txt (Unicode Emoji, UTS #51 data file), via Debian package unicode-data: published group/subgroup subtotals
// (fixtures/external/emoji-test.txt, Emoji 15.0, package version 15.0.0-1; see fixtures/external/README.md).
//
// What the published numbers count, read from that file:
// - "# <group> subtotal:\t\tN" counts every data line of the group, whatever its status (fully-qualified,
//   minimally-qualified, unqualified, component): e.g. Smileys & Emotion = 166 + 2 + 12 = 180.
// - "# <group> subtotal:\t\tN\tw/o modifiers" counts the data lines with no skin-tone modifier code point
//   (U+1F3FB..U+1F3FF): e.g. People & Body 508 of 2998, Component 4 of 9 (the 4 hair components).
// - "# Status Counts" gives the number of data lines of each status over the whole file.
// This version publishes subtotals for groups only; the parser below also takes subgroup subtotals, should a
// version print them. So each data line becomes the path group/subgroup/status/<code points>: the status is
// kept as a level (the status counts need it), and every code point sequence is one leaf.

const fixture = fileURLToPath(new URL("../../fixtures/external/emoji-test.txt", import.meta.url));

interface Subtotal {
  /** group, or group/subgroup */
  segments: string[];
  count: number;
  withoutModifiers: number | null;
}

interface Parsed {
  paths: string[];
  subtotals: Subtotal[];
  statusCounts: Map<string, number>;
  /** Data lines under each group/subgroup heading, counted here (not published). */
  linesPerSubgroup: Map<string, number>;
}

function parseEmojiTest(text: string): Parsed {
  const paths: string[] = [];
  const subtotals: Subtotal[] = [];
  const statusCounts = new Map<string, number>();
  const linesPerSubgroup = new Map<string, number>();
  let group = "";
  let subgroup = "";
  let inStatusCounts = false;
  for (const line of text.split("\n")) {
    const groupHead = /^# group: (.+)$/.exec(line);
    const subgroupHead = /^# subgroup: (.+)$/.exec(line);
    const subtotal = /^# (.+) subtotal:\t+(\d+)(\tw\/o modifiers)?$/.exec(line);
    const status = inStatusCounts ? /^# ([a-z-]+) : (\d+)$/.exec(line) : null;
    const data = /^([0-9A-F]+(?: [0-9A-F]+)*)\s*; ([a-z-]+)\s+#/.exec(line);
    if (groupHead) {
      group = groupHead[1];
      subgroup = "";
    } else if (subgroupHead) {
      subgroup = subgroupHead[1];
    } else if (subtotal) {
      const label = subtotal[1];
      const segments = label === subgroup ? [group, subgroup] : label === group ? [group] : null;
      if (segments === null) throw new Error(`subtotal for unknown heading: ${line}`);
      let entry = subtotals.find((s) => s.segments.join("/") === segments.join("/"));
      if (!entry) {
        entry = { segments, count: -1, withoutModifiers: null };
        subtotals.push(entry);
      }
      if (subtotal[3]) entry.withoutModifiers = Number(subtotal[2]);
      else entry.count = Number(subtotal[2]);
    } else if (line === "# Status Counts") {
      inStatusCounts = true;
    } else if (status) {
      statusCounts.set(status[1], Number(status[2]));
    } else if (data) {
      paths.push(`${group}/${subgroup}/${data[2]}/${data[1]}`);
      const key = `${group}/${subgroup}`;
      linesPerSubgroup.set(key, (linesPerSubgroup.get(key) ?? 0) + 1);
    }
  }
  return { paths, subtotals, statusCounts, linesPerSubgroup };
}

/** Children of node i in the pre-order layout: i + 1, then each next sibling at c + count[c]. */
function childNamed(tree: Tree, m: Measures, i: number, name: string): number {
  for (let c = i + 1; c < i + m.count[i]; c += m.count[c]) if (tree.name.get(c) === name) return c;
  return -1;
}

function findByPath(tree: Tree, m: Measures, segments: readonly string[]): number {
  let i = 0;
  for (const s of segments) {
    i = childNamed(tree, m, i, s);
    if (i < 0) return -1;
  }
  return i;
}

function childIndices(m: Measures, i: number): number[] {
  const out: number[] = [];
  for (let c = i + 1; c < i + m.count[i]; c += m.count[c]) out.push(c);
  return out;
}

/** A skin-tone modifier, U+1F3FB..U+1F3FF, among the code points of a leaf name. */
const hasModifier = (codePoints: string) => /\b1F3F[B-F]\b/.test(codePoints);

describe("loadTree(emoji-test.txt as group/subgroup/status/code points, paths)", () => {
  const parsed = parseEmojiTest(readFileSync(fixture, "utf8"));
  const tree = loadTree(parsed.paths.join("\n") + "\n", { ...defaultLoadOptions, format: "paths" });
  const m = measure(tree);

  it("parses the published numbers it checks", () => {
    // Emoji 15.0: 10 groups with subtotals, 4 statuses, 4733 data lines.
    expect(parsed.subtotals.length).toBeGreaterThanOrEqual(10);
    expect(parsed.subtotals.every((s) => s.count >= 0 && s.withoutModifiers !== null)).toBe(true);
    expect([...parsed.statusCounts.keys()].sort()).toEqual([
      "component",
      "fully-qualified",
      "minimally-qualified",
      "unqualified",
    ]);
    expect(parsed.paths.length).toBe(4733);
  });

  it("has one leaf per data line", () => {
    expect(m.leaves[0]).toBe(parsed.paths.length);
    expect(tree.length).toBe(
      1 +
        new Set(parsed.paths.flatMap((p) => p.split("/").map((_, k, a) => a.slice(0, k + 1).join("/")))).size,
    );
  });

  it("matches every published subtotal", () => {
    for (const s of parsed.subtotals) {
      const i = findByPath(tree, m, s.segments);
      expect(i, s.segments.join("/")).toBeGreaterThan(0);
      expect(m.leaves[i], `${s.segments.join("/")} subtotal`).toBe(s.count);
    }
  });

  it('matches every published "w/o modifiers" subtotal', () => {
    for (const s of parsed.subtotals) {
      const i = findByPath(tree, m, s.segments);
      let without = 0;
      for (let k = i; k < i + m.count[i]; k++)
        if (m.count[k] === 1 && !hasModifier(tree.name.get(k))) without++;
      expect(without, `${s.segments.join("/")} w/o modifiers`).toBe(s.withoutModifiers);
    }
  });

  it("matches the grand totals of the Status Counts section", () => {
    const leavesByStatus = new Map<string, number>();
    for (const g of childIndices(m, 0)) {
      for (const sg of childIndices(m, g)) {
        for (const st of childIndices(m, sg)) {
          leavesByStatus.set(tree.name.get(st), (leavesByStatus.get(tree.name.get(st)) ?? 0) + m.leaves[st]);
        }
      }
    }
    expect(leavesByStatus).toEqual(parsed.statusCounts);
    let sum = 0;
    for (const n of parsed.statusCounts.values()) sum += n;
    expect(m.leaves[0]).toBe(sum);
  });

  it("has each subgroup with as many leaves as lines under its heading (counted from the file, not published)", () => {
    for (const [key, lines] of parsed.linesPerSubgroup) {
      const i = findByPath(tree, m, key.split("/"));
      expect(i, key).toBeGreaterThan(0);
      expect(m.leaves[i], key).toBe(lines);
    }
  });
});
