import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import fc from "fast-check";
import { beforeAll, describe, expect, it } from "vitest";
import { GENERAL_DIFF_ENV } from "../../src/cli/general-diff.js";
import { loadTreeFromStream } from "../../src/load/stream/index.js";
import type { Tree } from "../../src/model/tree.js";
import { cli } from "../helpers/cli.js";
import { opts } from "../load/helpers.js";
import { chunked, type Rng, rng, utf8 } from "../load/stream/helpers.js";

// Names a CSV cell can hold (RFC 4180 section 2: commas, quotes), beyond ASCII, repeated among
// siblings now and then, and once empty (a node then named by its id).
const NAMES = ["harbour", "ledger", "quay", "tide, low", 'say "aye"', "é", "港", "dock", "dock", "pier"];

interface Row {
  id: string;
  parent: string;
  name: string;
  size: string;
}

/** A CSV cell, quoted when it must be (RFC 4180 section 2.6). */
function cell(value: string): string {
  return /[",\r\n]/.test(value) ? `"${value.replace(/"/g, '""')}"` : value;
}

function csv(rows: readonly Row[]): string {
  return `id,parent,name,size\n${rows.map((r) => [r.id, r.parent, r.name, r.size].map(cell).join(",")).join("\n")}\n`;
}

/**
 * An earlier version: a random tree, its rows mostly in pre-order (the direct path's case), ids plain
 * numbers, text or with leading zeros, sizes mostly plain digits.
 */
function earlierRows(r: Rng, count: number): Row[] {
  const parentOf = [-1];
  for (let k = 1; k < count; k++) parentOf.push(r.int(0, k - 1));
  const children: number[][] = parentOf.map(() => []);
  for (let k = 1; k < count; k++) children[parentOf[k]].push(k);
  // Pre-order (a parent before its subtree, children in order), or as generated.
  const order: number[] = [];
  if (r.chance(0.85)) {
    const stack = [0];
    while (stack.length > 0) {
      const k = stack.pop()!;
      order.push(k);
      for (let c = children[k].length - 1; c >= 0; c--) stack.push(children[k][c]);
    }
  } else for (let k = 0; k < count; k++) order.push(k);
  const style = r.pick(["plain", "plain", "text", "zeros"]);
  const idOf = (k: number) => (style === "plain" ? `${k + 1}` : style === "text" ? `u${k + 1}` : `0${k + 1}`);
  // A table in ten with cells the direct path leaves alone: an empty name, a size with a fraction.
  const odd = r.chance(0.1) ? 0.1 : 0;
  return order.map((k) => ({
    id: idOf(k),
    parent: k === 0 ? "" : idOf(parentOf[k]),
    name: r.chance(odd) ? "" : r.pick(NAMES),
    size: r.chance(odd) ? "3.5" : `${r.int(0, 5000)}`,
  }));
}

/** The rows of the subtree of `id` (the row and every row below it by parent), as a set of ids. */
function subtreeOf(rows: readonly Row[], id: string): Set<string> {
  const out = new Set([id]);
  for (let grew = true; grew; ) {
    grew = false;
    for (const row of rows) {
      if (!out.has(row.id) && out.has(row.parent)) {
        out.add(row.id);
        grew = true;
      }
    }
  }
  return out;
}

/**
 * A later version edited by a mix of the bench's edits (bench/diff-data.js: resize, rename, move,
 * remove, add) and harder ones: rows reordered, an id repeated, a parent removed under its children,
 * every id renumbered, a move into its own subtree (a cycle).
 */
function laterRows(r: Rng, old: readonly Row[]): Row[] {
  let rows = old.map((row) => ({ ...row }));
  const edits = r.int(0, 8);
  let fresh = 0;
  for (let e = 0; e < edits && rows.length > 0; e++) {
    const x = r.int(0, rows.length - 1);
    const row = rows[x];
    switch (r.pick(["resize", "resize", "rename", "move", "move", "remove", "add", "add", "odd"])) {
      case "resize":
        row.size = `${r.int(0, 9000)}`;
        break;
      case "rename":
        row.name = r.pick(NAMES);
        break;
      case "move": {
        if (x === 0) break;
        const inside = subtreeOf(rows, row.id);
        const targets = rows.filter((t) => !inside.has(t.id));
        if (targets.length > 0) row.parent = r.pick(targets).id;
        break;
      }
      case "remove": {
        if (x === 0) break;
        const gone = subtreeOf(rows, row.id);
        rows = rows.filter((t) => !gone.has(t.id));
        break;
      }
      case "add": {
        const parent = r.pick(rows).id;
        const added = {
          id: `${r.pick(["9", "n", "0"])}${1000 + fresh++}`,
          parent,
          name: r.pick(NAMES),
          size: "7",
        };
        rows.splice(r.chance(0.5) ? rows.length : r.int(1, rows.length), 0, added);
        break;
      }
      default:
        harder(r, rows, x);
    }
  }
  return rows;
}

/** One of the edits the direct path does not take (it leaves them to the general path, or the error). */
function harder(r: Rng, rows: Row[], x: number): void {
  const row = rows[x];
  switch (r.int(0, 5)) {
    case 0: {
      // Two rows swap places.
      const y = r.int(0, rows.length - 1);
      [rows[x], rows[y]] = [rows[y], rows[x]];
      break;
    }
    case 1:
      // An id repeated: DUPLICATE_ID.
      rows.push({ ...rows[r.int(0, rows.length - 1)], name: "copy" });
      break;
    case 2:
      // A row gone, its children left: MISSING_PARENT (or nothing, for a leaf).
      if (x > 0) rows.splice(x, 1);
      break;
    case 3:
      // Every id renumbered.
      for (const t of rows) {
        t.id = `r${t.id}`;
        if (t.parent !== "") t.parent = `r${t.parent}`;
      }
      break;
    case 4: {
      // A move into its own subtree: a cycle.
      const inside = [...subtreeOf(rows, row.id)];
      if (x > 0) row.parent = r.pick(inside);
      break;
    }
    default:
      row.size = r.pick(["", "1.5", "12"]);
  }
}

let dir = "";
const at = (name: string) => join(dir, name);

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), "espalier-direct-"));
});

/** NEW's tree as a diff's one-thread load reads it against OLD's; whether its arrays wait to be read. */
async function readsAsOld(oldText: string, newText: string): Promise<boolean> {
  const options = opts({ format: "csv", file: "v.csv" });
  const oldBytes = utf8(oldText);
  const newBytes = utf8(newText);
  let oldTree: Tree;
  let newTree: Tree;
  try {
    oldTree = await loadTreeFromStream(chunked(oldBytes, []), {
      ...options,
      keepForLaterVersion: true,
      inputBytes: oldBytes.length,
    });
    newTree = await loadTreeFromStream(chunked(newBytes, []), {
      ...options,
      earlierVersion: oldTree,
      inputBytes: newBytes.length,
    });
  } catch {
    return false;
  }
  return Object.getOwnPropertyDescriptor(newTree, "parent")?.get !== undefined;
}

describe("directCombined(oldTree, newTree, plan)", () => {
  it("gives the diff's text and JSON byte for byte as the general matching and splice do, on random CSV versions and edits", async () => {
    let direct = 0;
    let runs = 0;
    await fc.assert(
      fc.asyncProperty(fc.integer(), fc.integer({ min: 1, max: 40 }), async (seed, count) => {
        const r = rng(seed);
        const old = earlierRows(r, count);
        const later = laterRows(r, old);
        if (later.length === 0) return;
        const [oldText, newText] = [csv(old), csv(later)];
        writeFileSync(at("old.csv"), oldText);
        writeFileSync(at("new.csv"), newText);
        runs++;
        if (await readsAsOld(oldText, newText)) direct++;
        const args = ["diff", at("old.csv"), at("new.csv"), "--budget", `${r.int(4, 40)}`];
        if (r.chance(0.4)) args.push("--format", "json");
        if (r.chance(0.3)) args.push("--focus", r.pick(later).id);
        const env = { ESPALIER_LOAD_THREADS: "1", COLUMNS: "100" };
        const laid = await cli(args, { env });
        const general = await cli(args, { env: { ...env, [GENERAL_DIFF_ENV]: "1" } });
        expect(laid).toEqual(general);
      }),
      { numRuns: 250 },
    );
    // The direct layout was what most of those runs compared (the rest fell back, as they must).
    expect(direct).toBeGreaterThan(runs / 2);
  }, 120_000);

  it("lays a moved subtree, an added directory and a removed node out as the splice does", async () => {
    // Tidewater's archive moves under ops, a row of ledger is removed, a new folder with two files is added.
    const old =
      "id,parent,name,size\n1,,tidewater,0\n2,1,ops,4\n3,2,quay,10\n4,1,ledger,4\n5,4,jan,20\n6,4,feb,30\n7,1,archive,4\n8,7,old,40\n";
    const next =
      "id,parent,name,size\n1,,tidewater,0\n2,1,ops,4\n3,2,quay,12\n4,1,ledger,4\n6,4,feb,30\n7,2,archive,4\n8,7,old,40\n9,4,mar,5\n10,1,new,4\n11,10,a,1\n12,10,b,2\n";
    writeFileSync(at("o.csv"), old);
    writeFileSync(at("n.csv"), next);
    expect(await readsAsOld(old, next)).toBe(true);
    const args = ["diff", at("o.csv"), at("n.csv"), "--budget", "30", "--format", "json"];
    const env = { ESPALIER_LOAD_THREADS: "1" };
    const laid = await cli(args, { env });
    expect(laid).toEqual(await cli(args, { env: { ...env, [GENERAL_DIFF_ENV]: "1" } }));
    const { changes } = JSON.parse(laid.stdout) as { changes: Record<string, number> };
    expect(changes).toMatchObject({ added: 4, removed: 1, moved: 1, resized: 1 });
  });
});
