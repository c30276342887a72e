import fc from "fast-check";
import { describe, expect, it } from "vitest";
import type { LoadOptions } from "../../../src/load/load-options.js";
import type { NamePool } from "../../../src/model/names.js";
import type { Tree } from "../../../src/model/tree.js";
import { opts } from "../helpers.js";
import {
  awkwardAt,
  cutsFor,
  expectSameTreeAndSummaries,
  loadByReference,
  loadStreamed,
  type Outcome,
  outcomeOf,
  outcomeOfAsync,
  type Rng,
  rng,
  utf8,
} from "../stream/helpers.js";

// Names with what a CSV cell can hold (RFC 4180 section 2: quotes, commas, line breaks), beyond
// ASCII, empty, and near one another (a renamed row's name shares its start with the earlier one).
const NAMES = [
  "Optics",
  "Optic",
  "Mira Quell",
  "é",
  "日本",
  "😀",
  "a, b",
  'say "hi"',
  "two\nlines",
  "",
  " padded ",
];

interface Row {
  id: string;
  parent: string;
  name: string;
  size: string;
}

/** A CSV cell, quoted when it must be (RFC 4180 section 2.6) and sometimes when it need not be. */
function cell(r: Rng, value: string): string {
  const must = /[",\r\n]/.test(value);
  return must || r.chance(0.2) ? `"${value.replace(/"/g, '""')}"` : value;
}

function csv(r: Rng, rows: readonly Row[], columns: readonly (keyof Row)[]): Uint8Array {
  const lines = [columns.join(",")];
  for (const row of rows) lines.push(columns.map((c) => cell(r, row[c])).join(","));
  return utf8(`${lines.join("\n")}\n`);
}

/** An earlier version: rows linked by id (plain numbers, text, leading zeros), parents before children. */
function earlierRows(r: Rng, count: number): Row[] {
  const rows: Row[] = [];
  for (let k = 1; k <= count; k++) {
    const id = r.pick([`${k}`, `${k}`, `q${k}`, `0${k}`, `日${k}`]);
    const parent = k === 1 || r.chance(0.1) ? "" : rows[r.int(0, k - 2)].id;
    rows.push({ id, parent, name: r.pick(NAMES), size: r.pick(["", "0", "12", "3.5"]) });
  }
  return rows;
}

/**
 * A later version of `rows`, edited as two exports of one table differ: rows removed (their children
 * then name a parent no row has, now and then: MISSING_PARENT), renamed, moved to another parent,
 * resized, a run of rows put elsewhere, rows added (new ids, or an id repeated: DUPLICATE_ID).
 */
function laterRows(r: Rng, rows: readonly Row[]): Row[] {
  const out = rows.filter(() => !r.chance(0.1)).map((row) => ({ ...row }));
  for (const row of out) {
    if (r.chance(0.15)) row.name = r.pick(NAMES);
    if (r.chance(0.05) && out.length > 1) row.parent = r.pick(out).id;
    if (r.chance(0.1)) row.size = r.pick(["", "7", "12"]);
  }
  if (r.chance(0.3) && out.length > 3) {
    const from = r.int(0, out.length - 2);
    const run = out.splice(from, r.int(1, 3));
    out.splice(r.int(0, out.length), 0, ...run);
  }
  const added = r.int(0, 4);
  for (let k = 0; k < added; k++) {
    const id = r.chance(0.1) && out.length > 0 ? r.pick(out).id : `new${k}`;
    const row = { id, parent: out.length > 0 ? r.pick(out).id : "", name: r.pick(NAMES), size: "1" };
    out.splice(r.int(0, out.length), 0, row);
  }
  return out;
}

/** The code and data row of an error (syntax faults have no row), or the tree. */
function comparable(outcome: Outcome): unknown {
  if ("tree" in outcome) return "tree";
  const pos = (outcome.pos ?? {}) as { row?: number };
  return { code: outcome.code, row: pos.row };
}

describe("a CSV table read against an earlier version of itself (LoadOptions.earlierVersion)", () => {
  it("reads the table the reference reads (csv-parse on the decoded text), however the bytes are cut", async () => {
    await fc.assert(
      fc.asyncProperty(fc.integer(), fc.integer({ min: 1, max: 40 }), async (seed, count) => {
        const r = rng(seed);
        const columns = r.pick<(keyof Row)[]>([
          ["id", "parent", "name", "size"],
          ["name", "id", "size", "parent"],
          ["parent", "size", "name", "id"],
        ]);
        const old = earlierRows(r, count);
        const options: LoadOptions = opts({ format: "csv", file: "v2.csv" });
        const oldTree = await loadStreamed(csv(r, old, columns), options, []);
        const later = csv(r, laterRows(r, old), r.chance(0.7) ? columns : ["id", "parent", "name", "size"]);
        const expected = outcomeOf(() => loadByReference(later, options));
        const cuts = cutsFor(r, later.length, r.int(0, 8), awkwardAt(later, [0x0a, 0x22, 0x2c]));
        const inputBytes = r.pick([undefined, later.length]);
        const against = { ...options, earlierVersion: oldTree, ...(inputBytes ? { inputBytes } : {}) };
        const actual = await outcomeOfAsync(() => loadStreamed(later, against, cuts));
        expect(comparable(actual)).toEqual(comparable(expected));
        if ("tree" in actual && "tree" in expected) expectSameTreeAndSummaries(r, actual.tree, expected.tree);
      }),
      { numRuns: 300 },
    );
  });

  it("places the cells a row shares with the earlier version in that version's bytes, and copies the others", async () => {
    const options = opts({ format: "csv", file: "v2.csv" });
    const oldTree = await loadStreamed(
      utf8("id,parent,name\n1,,Tidewater\n2,1,Harbour Ops\n3,1,Ledger\n4,3,Payroll\n"),
      options,
      [],
    );
    // Row 2 removed, row 4 renamed, row 5 added: rows 1 and 3 are as before.
    const later = utf8("id,parent,name\n1,,Tidewater\n3,1,Ledger\n4,3,Payroll Desk\n5,1,Quay\n");
    const tree = await loadStreamed(later, { ...options, earlierVersion: oldTree }, []);
    expect(tree.name).toEqual(["Tidewater", "Ledger", "Payroll Desk", "Quay"]);
    expect(tree.ids).toEqual(["1", "3", "4", "5"]);
    const bytesOf = (t: Tree, names: "name" | "ids") => (t[names] as NamePool).byteRuns()!;
    const [oldNames, newNames] = [bytesOf(oldTree, "name"), bytesOf(tree, "name")];
    // One buffer for both versions' names; "Ledger" (old row 3, new row 2) at one place in it.
    expect(newNames.bytes).toBe(oldNames.bytes);
    expect(newNames.start[1]).toBe(oldNames.start[2]);
    expect(newNames.start[2]).not.toBe(oldNames.start[3]);
    expect(bytesOf(tree, "ids").start[2]).toBe(bytesOf(oldTree, "ids").start[3]);
  });
});
