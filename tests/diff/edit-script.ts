import fc from "fast-check";
import { buildTree } from "../../src/model/build-tree.js";
import { StringNames } from "../../src/model/names.js";
import type { Tree } from "../../src/model/tree.js";
import { arbTree } from "../helpers/random-tree.js";

/** What an edit script did to one node, keyed by id. */
export interface Expected {
  kind: "added" | "removed" | "moved" | "renamed" | "edited" | "resized";
  /** For a move: the old parent's id. */
  from?: string;
  /** For a move: the new parent's id. */
  to?: string;
}

/** The record field every node of both versions has, for `compareFields`. */
export const EDIT_FIELD = "version";

export interface Edited {
  /** The old version, ids "n0", "n1", … by pre-order index; each node's `version` is "1.<index>". */
  oldTree: Tree;
  newTree: Tree;
  expected: Map<string, Expected>;
}

const ops = ["add", "remove", "move", "rename", "edit", "resize"] as const;
const arbOp = fc.record({ op: fc.constantFrom(...ops), a: fc.nat(), b: fc.nat(), v: fc.nat({ max: 999 }) });

/**
 * A random tree with ids and a random edit script applied to it. Each node is edited at most once and
 * edits never interfere (a removed subtree holds no edited node, a moved node lands outside its own
 * subtree and off its old parent), so the script's effect is exactly the list of its edits.
 */
export const arbEdited = (maxNodes = 40, maxEdits = 8): fc.Arbitrary<Edited> =>
  fc.tuple(arbTree(maxNodes), fc.array(arbOp, { maxLength: maxEdits })).map(([tree, script]) => {
    const n = tree.length;
    const ids = Array.from({ length: n }, (_, i) => `n${i}`);
    const version = new Map(ids.map((id, i) => [id, `1.${i}`]));
    const oldTree: Tree = {
      ...tree,
      ids: new StringNames(ids),
      fields: new Map([[EDIT_FIELD, ids.map((id) => version.get(id)!)]]),
    };
    const order = [...ids];
    const parent = new Map<string, string | null>(
      ids.map((id, i) => [id, i === 0 ? null : ids[tree.parent[i]]]),
    );
    const name = new Map(ids.map((id, i) => [id, tree.name.get(i)]));
    const size = new Map(ids.map((id, i) => [id, tree.ownSize[i]]));
    const alive = new Set(ids);
    const touched = new Set<string>();
    const expected = new Map<string, Expected>();
    let fresh = 0;
    const live = () => order.filter((id) => alive.has(id));
    const subtree = (root: string) => {
      const out = new Set([root]);
      for (let grew = true; grew; ) {
        grew = false;
        for (const id of live()) {
          const p = parent.get(id);
          if (p && out.has(p) && !out.has(id)) {
            out.add(id);
            grew = true;
          }
        }
      }
      return out;
    };
    for (const { op, a, b, v } of script) {
      const nodes = live();
      const untouched = nodes.filter((id) => id !== "n0" && !touched.has(id));
      if (op === "add") {
        const id = `new${fresh++}`;
        order.push(id);
        alive.add(id);
        parent.set(id, nodes[a % nodes.length]);
        name.set(id, ["a", "b", "c"][v % 3]);
        size.set(id, v);
        version.set(id, `1.${v}`);
        touched.add(id);
        expected.set(id, { kind: "added" });
      } else if (op === "remove") {
        const candidates = untouched.filter((id) => [...subtree(id)].every((d) => !touched.has(d)));
        if (candidates.length === 0) continue;
        for (const d of subtree(candidates[a % candidates.length])) {
          alive.delete(d);
          touched.add(d);
          expected.set(d, { kind: "removed" });
        }
      } else if (op === "move") {
        if (untouched.length === 0) continue;
        const m = untouched[a % untouched.length];
        const inside = subtree(m);
        const targets = nodes.filter((t) => !inside.has(t) && t !== parent.get(m));
        if (targets.length === 0) continue;
        const t = targets[b % targets.length];
        expected.set(m, { kind: "moved", from: parent.get(m)!, to: t });
        parent.set(m, t);
        touched.add(m);
      } else if (op === "rename") {
        if (untouched.length === 0) continue;
        const m = untouched[a % untouched.length];
        name.set(m, `renamed${fresh++}`);
        touched.add(m);
        expected.set(m, { kind: "renamed" });
      } else if (op === "edit") {
        const pool = touched.has("n0") ? untouched : ["n0", ...untouched];
        if (pool.length === 0) continue;
        const m = pool[a % pool.length];
        // An empty value counts as a value too ("" against "1.k" is an edit).
        version.set(m, v % 7 === 0 ? "" : `2.${v}`);
        touched.add(m);
        expected.set(m, { kind: "edited" });
      } else {
        const pool = touched.has("n0") ? untouched : ["n0", ...untouched];
        if (pool.length === 0) continue;
        const m = pool[a % pool.length];
        size.set(m, size.get(m)! + 1 + (v % 100));
        touched.add(m);
        expected.set(m, { kind: "resized" });
      }
    }
    const kept = live();
    const at = new Map(kept.map((id, i) => [id, i]));
    const newTree = buildTree({
      parentOf: Int32Array.from(kept.map((id) => (parent.get(id) === null ? -1 : at.get(parent.get(id)!)!))),
      name: kept.map((id) => name.get(id)!),
      ownSize: Float64Array.from(kept.map((id) => size.get(id)!)),
      hasSizes: true,
      ids: kept,
      origin: Int32Array.from(kept.map((_, i) => i + 1)),
      originIsRow: true,
      fields: new Map([[EDIT_FIELD, kept.map((id) => version.get(id)!)]]),
      rootName: "(root)",
    });
    return { oldTree, newTree, expected };
  });

/** The same pair without ids, so that nodes match by path. */
export function withoutIds({ oldTree, newTree }: Edited): [Tree, Tree] {
  return [
    { ...oldTree, ids: null },
    { ...newTree, ids: null },
  ];
}
