// A second version of the benchmark tree, for timing `espalier diff`: the generated id/parent CSV is read
// back, a seeded share of its nodes is changed by a mix of edits (leaves resized, nodes renamed, small
// subtrees moved to another directory, leaves and small subtrees removed, new files and directories
// added), and the result is written as CSV (same ids: matched by id) and as nested JSON (matched by
// path: a move or a rename there is a removal plus an addition). Seeded PRNG, no clock: the same
// parameters give byte-identical files, reused through a manifest like the base data.
//
// Usage on its own: node bench/diff-data.js [--nodes N] [--force]

import { existsSync, readFileSync, statSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { csvCell, dataDir, ensureData, makeRng, Out } from "./generate.js";

/** Bump when the edits change for the same parameters (invalidates old manifests). */
export const DIFF_DATA_VERSION = 1;
/** The formats the second version is written in, i.e. the diff benchmark's formats. */
export const DIFF_FORMATS = ["csv", "json"];

/** Shares of the changed nodes per kind of edit (an added or removed subtree counts all its nodes). */
const MIX = { resize: 0.35, rename: 0.2, move: 0.1, remove: 0.175, add: 0.175 };
/** Largest subtree renamed or moved (a rename or move of a large one is a huge removal + addition by path). */
const MAX_RENAMED = 20;
const MAX_MOVED = 50;
/** Largest subtree removed at once; size of an added directory (its files). */
const MAX_REMOVED = 6;
const MAX_ADDED_FILES = 8;

// Per-node flags.
const REMOVED = 1;
const MOVING = 2; // inside a moved subtree (its root included)
const MOVE_ROOT = 4;
const TARGET = 8; // receives a moved subtree or an added node
const RENAMED = 16;
const RESIZED = 32;
const PROTECTED = 64; // the root and the foci's ancestors: their paths stay

export function diffDataFiles(nodes) {
  return {
    csv: join(dataDir, `tree-${nodes}.v2.csv`),
    json: join(dataDir, `tree-${nodes}.v2.json`),
  };
}

function manifestPath(nodes) {
  return join(dataDir, `tree-${nodes}.v2.manifest.json`);
}

/**
 * Makes sure the second version exists for the base data described by `base` (a manifest from
 * ensureData with the CSV present), writing it if not. Returns its manifest with `files`.
 */
export function ensureDiffData({ base, fraction = 0.01, seed = 31337, force = false, log }) {
  const files = diffDataFiles(base.nodes);
  const params = { diffData: DIFF_DATA_VERSION, base: base.params, fraction, seed };
  const mPath = manifestPath(base.nodes);
  if (!force && existsSync(mPath)) {
    const manifest = JSON.parse(readFileSync(mPath, "utf8"));
    const same = JSON.stringify(manifest.params) === JSON.stringify(params);
    const present = DIFF_FORMATS.every(
      (f) => existsSync(files[f]) && statSync(files[f]).size === manifest.bytes[f],
    );
    if (same && present) {
      log?.(`diff data: reusing the second version in ${dataDir}`);
      return { ...manifest, files };
    }
  }
  log?.(
    `diff data: changing ${fraction * 100}% of ${base.nodes.toLocaleString("en-US")} nodes (seed ${seed})...`,
  );
  const t0 = performance.now();
  const tree = readCsvTree(base.files.csv);
  const edits = makeEdits(tree, { fraction, seed, foci: base.foci });
  const bytes = {
    csv: writeCsv(tree, edits, files.csv),
    json: writeJson(tree, edits, files.json),
  };
  const manifest = {
    params,
    nodes: { old: tree.n, new: tree.n - edits.counts.id.removed + edits.counts.id.added },
    edits: edits.tally,
    changes: edits.counts,
    bytes,
    seconds: Math.round(performance.now() - t0) / 1000,
  };
  writeFileSync(mPath, `${JSON.stringify(manifest, null, 2)}\n`);
  log?.(`diff data: written in ${manifest.seconds} s`);
  return { ...manifest, files };
}

// ---------------------------------------------------------------------------------------------------------
// The base tree, read back from the generated CSV: ids 1..n in pre-order, one row each, in id order.

function readCsvTree(file) {
  const lines = readFileSync(file, "utf8").split("\n");
  if (lines[0] !== "id,parent,name,size") throw new Error(`${file}: unexpected header ${lines[0]}`);
  if (lines[lines.length - 1] === "") lines.pop();
  const n = lines.length - 1;
  const parent = new Int32Array(n + 1);
  const size = new Float64Array(n + 1);
  const name = new Array(n + 1);
  for (let id = 1; id <= n; id++) {
    // The generator quotes only names holding a comma, never holds a quote: split at the outer commas.
    const line = lines[id];
    const c1 = line.indexOf(",");
    const c2 = line.indexOf(",", c1 + 1);
    const c3 = line.lastIndexOf(",");
    if (Number(line.slice(0, c1)) !== id) throw new Error(`${file}: row ${id} holds id ${line.slice(0, c1)}`);
    parent[id] = c2 === c1 + 1 ? 0 : Number(line.slice(c1 + 1, c2));
    const cell = line.slice(c2 + 1, c3);
    name[id] = cell.startsWith('"') ? cell.slice(1, -1).replace(/""/g, '"') : cell;
    size[id] = Number(line.slice(c3 + 1));
  }
  // Children in input order (compressed rows), subtree node counts (pre-order: children after parents).
  const childCount = new Int32Array(n + 2);
  for (let id = 2; id <= n; id++) childCount[parent[id]]++;
  const childStart = new Int32Array(n + 2);
  for (let id = 1; id <= n; id++) childStart[id + 1] = childStart[id] + childCount[id];
  const childList = new Int32Array(n);
  const fill = childStart.slice();
  for (let id = 2; id <= n; id++) childList[fill[parent[id]]++] = id;
  const sub = new Int32Array(n + 1).fill(1);
  for (let id = n; id >= 2; id--) sub[parent[id]] += sub[id];
  const children = (id) => childList.subarray(childStart[id], childStart[id + 1]);
  return { n, parent, size, name, childCount, children, sub };
}

// ---------------------------------------------------------------------------------------------------------
// Edits. Each node takes part in at most one edit of its own (a node inside a moved subtree may still be
// renamed or resized); removals come first, then moves, additions, renames and resizes, each picking
// random nodes the earlier edits left free. Moved subtrees never hold a move target and targets never lie
// in a moved subtree, so no move makes a cycle. Names stay unique among siblings: a name once used under a
// parent (even by a node since removed or moved away) is never given to another node there.

function makeEdits(tree, { fraction, seed, foci }) {
  const { n, parent, childCount, sub, name, size } = tree;
  const rng = makeRng(seed);
  const flags = new Uint8Array(n + 1);
  const goal = Math.max(10, Math.round(n * fraction));
  const attempts = 200 * goal; // cap for the rejection sampling (small trees may run out of candidates)
  const randomNode = () => rng.int(2, n);

  flags[1] |= PROTECTED;
  for (const path of foci ?? []) {
    let node = 1;
    for (const segment of path.split("/")) {
      const next = [...tree.children(node)].find((c) => name[c] === segment);
      if (next === undefined) break;
      node = next;
      flags[node] |= PROTECTED;
    }
  }
  const free = (root, mask) => {
    for (let i = root; i < root + sub[root]; i++) if (flags[i] & mask) return false;
    return true;
  };

  // Sibling names in the new version, per parent (built lazily; names are only ever added).
  const siblingNames = new Map();
  const namesUnder = (p) => {
    let set = siblingNames.get(p);
    if (!set) {
      set = new Set(p <= n ? Array.from(tree.children(p), (c) => name[c]) : []);
      siblingNames.set(p, set);
    }
    return set;
  };
  const uniqueName = (p, base) => {
    const set = namesUnder(p);
    let result = base;
    for (let k = 2; set.has(result); k++) result = `${base}-${k}`;
    set.add(result);
    return result;
  };
  // A name of the right kind borrowed from elsewhere in the tree (file names keep their look).
  const borrowName = (dir) => {
    for (;;) {
      const i = randomNode();
      if (childCount[i] > 0 === dir) return name[i];
    }
  };
  const randomDir = () => {
    for (;;) {
      const i = rng.int(1, n);
      if (childCount[i] > 0) return i;
    }
  };

  const newParent = new Map(); // moved root -> new parent
  const newName = new Map(); // renamed node -> new name
  const newSize = new Map(); // resized leaf -> new size
  const inserts = new Map(); // parent -> [{ at, id }]: moved-in and added children, at a random place
  const added = []; // { id, parent, name, size, dir }
  const addedChildren = new Map(); // added directory -> its children's ids
  const tally = { removeRoots: 0, moves: 0, addRoots: 0, renames: 0, resizes: 0 };
  const insert = (p, id) => {
    let list = inserts.get(p);
    if (!list) {
      list = [];
      inserts.set(p, list);
    }
    list.push({ at: rng.next(), id });
    flags[p] |= TARGET;
  };

  let removed = 0;
  for (let t = 0; removed < goal * MIX.remove && t < attempts; t++) {
    const i = randomNode();
    const wantDir = rng.chance(0.3);
    if (wantDir ? childCount[i] === 0 || sub[i] > MAX_REMOVED : childCount[i] > 0) continue;
    if (!free(i, 0xff)) continue;
    for (let j = i; j < i + sub[i]; j++) flags[j] |= REMOVED;
    removed += sub[i];
    tally.removeRoots++;
  }

  for (let t = 0; tally.moves < goal * MIX.move && t < attempts; t++) {
    const s = randomNode();
    if (sub[s] > MAX_MOVED || !free(s, 0xff)) continue;
    const target = randomDir();
    if (flags[target] & (REMOVED | MOVING) || target === parent[s]) continue;
    if (target >= s && target < s + sub[s]) continue;
    if (namesUnder(target).has(name[s])) continue;
    namesUnder(target).add(name[s]);
    for (let j = s; j < s + sub[s]; j++) flags[j] |= MOVING;
    flags[s] |= MOVE_ROOT;
    newParent.set(s, target);
    insert(target, s);
    tally.moves++;
  }

  let nextId = n + 1;
  let addedNodes = 0;
  const addNode = (p, dir) => {
    const id = nextId++;
    const nodeName = uniqueName(p, borrowName(dir));
    const nodeSize = dir ? 4096 : size[borrowLeaf()];
    added.push({ id, parent: p, name: nodeName, size: nodeSize, dir });
    addedNodes++;
    return id;
  };
  const borrowLeaf = () => {
    for (;;) {
      const i = randomNode();
      if (childCount[i] === 0) return i;
    }
  };
  for (let t = 0; addedNodes < goal * MIX.add && t < attempts; t++) {
    const p = randomDir();
    if (flags[p] & REMOVED) continue;
    const dir = rng.chance(0.2);
    const id = addNode(p, dir);
    insert(p, id);
    tally.addRoots++;
    if (dir) {
      const kids = [];
      const files = rng.int(1, MAX_ADDED_FILES);
      for (let k = 0; k < files; k++) kids.push(addNode(id, false));
      addedChildren.set(id, kids);
    }
  }

  for (let t = 0; tally.renames < goal * MIX.rename && t < attempts; t++) {
    const i = randomNode();
    if (flags[i] & (REMOVED | MOVE_ROOT | RENAMED | RESIZED | PROTECTED | TARGET)) continue;
    if (sub[i] > MAX_RENAMED) continue;
    let fresh = borrowName(childCount[i] > 0);
    if (fresh === name[i]) fresh = `${fresh}-2`;
    newName.set(i, uniqueName(parent[i], fresh));
    flags[i] |= RENAMED;
    tally.renames++;
  }

  for (let t = 0; tally.resizes < goal * MIX.resize && t < attempts; t++) {
    const i = randomNode();
    if (childCount[i] > 0 || flags[i] & (REMOVED | MOVE_ROOT | RENAMED | RESIZED)) continue;
    let s = Math.round(size[i] * (0.5 + 1.5 * rng.next())) + rng.int(0, 4095);
    if (s === size[i]) s++;
    newSize.set(i, s);
    flags[i] |= RESIZED;
    tally.resizes++;
  }

  return {
    flags,
    newParent,
    newName,
    newSize,
    inserts,
    added,
    addedChildren,
    tally,
    counts: expectedCounts(tree, flags, added.length),
  };
}

/**
 * The changes `espalier diff` should report, per matching (docs/diff.md). By path, a node whose path
 * changed (it, or an ancestor, was renamed or is the root of a moved subtree) is removed and added.
 */
function expectedCounts(tree, flags, addedCount) {
  const { n, parent } = tree;
  const byId = { added: addedCount, removed: 0, moved: 0, renamed: 0, resized: 0 };
  const byPath = { added: addedCount, removed: 0, moved: 0, renamed: 0, resized: 0 };
  const pathChanged = new Uint8Array(n + 1);
  for (let i = 1; i <= n; i++) {
    const f = flags[i];
    pathChanged[i] = f & (MOVE_ROOT | RENAMED) || (i > 1 && pathChanged[parent[i]]) ? 1 : 0;
    if (f & REMOVED) byId.removed++;
    else if (f & MOVE_ROOT) byId.moved++;
    else if (f & RENAMED) byId.renamed++;
    else if (f & RESIZED) byId.resized++;
    if (f & REMOVED || pathChanged[i]) byPath.removed++;
    if (!(f & REMOVED) && pathChanged[i]) byPath.added++;
    if (f & RESIZED && !pathChanged[i]) byPath.resized++;
  }
  return { id: byId, path: byPath };
}

// ---------------------------------------------------------------------------------------------------------
// Writers

/** Same ids; rows in id order (a moved row may now come before its parent), added rows last. */
function writeCsv(tree, edits, file) {
  const { n, parent, name, size } = tree;
  const { flags, newParent, newName, newSize, added } = edits;
  const out = new Out(file);
  out.write("id,parent,name,size\n");
  for (let id = 1; id <= n; id++) {
    if (flags[id] & REMOVED) continue;
    const p = newParent.get(id) ?? parent[id];
    const nm = newName.get(id) ?? name[id];
    out.write(`${id},${p === 0 ? "" : p},${csvCell(nm)},${newSize.get(id) ?? size[id]}\n`);
  }
  for (const a of added) out.write(`${a.id},${a.parent},${csvCell(a.name)},${a.size}\n`);
  return out.close();
}

/** The generator's JSON layout; moved-in and added children at random places among the others. */
function writeJson(tree, edits, file) {
  const { n, name, size, childCount } = tree;
  const { flags, newName, newSize, inserts, added, addedChildren } = edits;
  const addedById = new Map(added.map((a) => [a.id, a]));
  const out = new Out(file);
  const childrenOf = (id) => {
    const base =
      id <= n ? Array.from(tree.children(id)).filter((c) => !(flags[c] & (REMOVED | MOVE_ROOT))) : [];
    const extra = id <= n ? inserts.get(id) : addedChildren.get(id)?.map((c) => ({ at: 0, id: c }));
    if (!extra) return base;
    const placed = extra
      .map((e) => ({ slot: Math.floor(e.at * (base.length + 1)), id: e.id }))
      .sort((a, b) => a.slot - b.slot);
    const merged = [];
    let k = 0;
    for (let slot = 0; slot <= base.length; slot++) {
      while (k < placed.length && placed[k].slot === slot) merged.push(placed[k++].id);
      if (slot < base.length) merged.push(base[slot]);
    }
    return merged;
  };
  const writeNode = (id) => {
    const a = addedById.get(id);
    const nm = a ? a.name : (newName.get(id) ?? name[id]);
    const sz = a ? a.size : (newSize.get(id) ?? size[id]);
    out.write(`{"name":${JSON.stringify(nm)},"size":${sz}`);
    if (a ? !a.dir : childCount[id] === 0) {
      out.write("}");
      return;
    }
    out.write(`,"children":[`);
    const kids = childrenOf(id);
    for (let k = 0; k < kids.length; k++) {
      if (k > 0) out.write(",");
      writeNode(kids[k]);
    }
    out.write("]}");
  };
  writeNode(1);
  out.write("\n");
  return out.close();
}

// ---------------------------------------------------------------------------------------------------------

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  const args = process.argv.slice(2);
  const i = args.indexOf("--nodes");
  const nodes = Number(i >= 0 ? args[i + 1] : 1_000_000);
  const base = ensureData({ nodes, formats: ["csv"], log: console.log });
  const { files, ...rest } = ensureDiffData({ base, force: args.includes("--force"), log: console.log });
  console.log(JSON.stringify({ ...rest, files }, null, 2));
}
