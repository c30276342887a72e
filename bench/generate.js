// Deterministic benchmark data: one invented tree written three ways (nested JSON, an id/parent CSV table
// and a "size<TAB>path" list). Seeded PRNG, no clock; the same parameters give byte-identical files, so a
// manifest next to the files lets later runs reuse them.
//
// Usage on its own: node bench/generate.js [--nodes N] [--only json,csv,paths] [--force]

import {
  closeSync,
  existsSync,
  mkdirSync,
  openSync,
  readFileSync,
  statSync,
  writeFileSync,
  writeSync,
} from "node:fs";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";

/** Bump when the generator's output changes for the same parameters (invalidates old manifests). */
export const GENERATOR_VERSION = 1;
export const FORMATS = ["json", "csv", "paths"];
export const EXTENSIONS = { json: "json", csv: "csv", paths: "paths" };

const benchDir = dirname(fileURLToPath(import.meta.url));
export const dataDir = join(benchDir, "out", "data");

// ---------------------------------------------------------------------------------------------------------
// Seeded PRNG (mulberry32). Shapes use Math.pow on its output; V8 computes that with its own fdlibm port,
// so the files are the same on every platform for a given Node major.

export function makeRng(seed) {
  let a = seed >>> 0;
  const next = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  return {
    next,
    int: (lo, hi) => lo + Math.floor(next() * (hi - lo + 1)),
    chance: (p) => next() < p,
    pick: (items) => items[Math.floor(next() * items.length)],
  };
}

// ---------------------------------------------------------------------------------------------------------
// Invented words: onset + vowel + coda syllables. Never "/", "~", tab or newline, so every name is its own
// path segment unescaped and fits the path list. A few names carry a space, an accent or a comma (which
// the CSV must quote).

const ONSETS = ["b", "d", "f", "g", "k", "l", "m", "n", "p", "r", "s", "t", "v", "z", "br", "dr", "gl", "kr"];
const ONSETS2 = ["pl", "st", "th", "sh", "ch", "tr", "qu", "sk", "fl", "h", "w", "j"];
const VOWELS = ["a", "e", "i", "o", "u", "a", "e", "o", "ai", "ea", "ou", "y"];
const CODAS = ["", "", "", "n", "r", "l", "s", "x", "m", "nd", "st", "rk"];
const EXTS = [
  "txt",
  "md",
  "json",
  "csv",
  "log",
  "bin",
  "dat",
  "cfg",
  "ts",
  "js",
  "png",
  "svg",
  "yaml",
  "lock",
];
const ACCENTS = { a: "á", e: "é", o: "ø", u: "ü", i: "í" };

function word(rng) {
  const syllables = rng.int(1, 3);
  let w = "";
  for (let s = 0; s < syllables; s++) {
    w += rng.chance(0.75) ? rng.pick(ONSETS) : rng.pick(ONSETS2);
    w += rng.pick(VOWELS);
    if (s === syllables - 1 || rng.chance(0.25)) w += rng.pick(CODAS);
  }
  return w;
}

function inventName(rng, isDir) {
  let name = word(rng);
  const roll = rng.next();
  if (roll < 0.15) name += `-${word(rng)}`;
  else if (roll < 0.17) name += ` ${word(rng)}`;
  else if (roll < 0.19) name += `_${rng.int(1, 999)}`;
  else if (roll < 0.1905) name += `, ${word(rng)}`;
  if (rng.chance(0.005)) name = name.replace(/[aeoui]/, (v) => ACCENTS[v]);
  if (!isDir && rng.chance(0.85)) name += `.${rng.pick(EXTS)}`;
  return name;
}

// ---------------------------------------------------------------------------------------------------------
// Shape. A node with budget B (its subtree's node count) is a leaf when B = 1; otherwise it gets k
// children, some of them subdirectories that share the remaining budget by skewed weights, the rest
// files. k grows with B where the depth left is short, so the tree stays within maxDepth without one
// giant flat level; how much depth a directory leaves in reserve varies, so some branches run deep.
// At 1M nodes (seed 20240611): fan-out mostly 1-30, a few directories of hundreds to ~2,000, deepest
// node at depth 14, mean depth 8, 86% leaves.

function childBudgets(rng, budget, depth, maxDepth) {
  const rest = budget - 1;
  const levelsLeft = maxDepth - depth;
  if (levelsLeft <= 1) return new Array(rest).fill(1);
  // Fan-out: skewed towards small directories, with a floor that keeps the remaining depth sufficient.
  const u = rng.next();
  let k = rng.chance(0.004) ? rng.int(300, 3000) : 1 + Math.floor(u * u * 48);
  const needed = Math.ceil(1.6 * rest ** (1 / Math.max(1.5, levelsLeft - rng.int(1, 7))));
  if (k < needed) k = needed + rng.int(0, needed >> 1);
  if (k > rest) k = rest;
  // Subdirectories among the k: at least one when budget is left over, usually a third or so.
  const spare = rest - k;
  const out = new Array(k).fill(1);
  if (spare === 0) return out;
  let dirs = Math.max(1, Math.round(k * (0.1 + 0.5 * rng.next())));
  if (dirs > k) dirs = k;
  // Which children are directories: spread through the list (input order matters to nobody, but a
  // directory listing usually interleaves them).
  const dirSlots = [];
  const stride = k / dirs;
  for (let d = 0; d < dirs; d++) dirSlots.push(Math.min(k - 1, Math.floor(d * stride + rng.next() * stride)));
  const weights = dirSlots.map(() => {
    const w = rng.next();
    return w + 0.05;
  });
  let total = 0;
  for (const w of weights) total += w;
  let given = 0;
  let biggest = 0;
  for (let d = 0; d < dirs; d++) {
    const share = Math.floor((spare * weights[d]) / total);
    out[dirSlots[d]] += share;
    given += share;
    if (weights[d] > weights[biggest]) biggest = d;
  }
  out[dirSlots[biggest]] += spare - given;
  return out;
}

// ---------------------------------------------------------------------------------------------------------
// Writers: buffered, synchronous, one file per format.

/** A file written in pieces of about 1 MiB; `close()` returns the bytes written. */
export class Out {
  constructor(path) {
    this.fd = openSync(path, "w");
    this.parts = [];
    this.length = 0;
    this.bytes = 0;
  }
  write(s) {
    this.parts.push(s);
    this.length += s.length;
    if (this.length > 1 << 20) this.flush();
  }
  flush() {
    if (this.parts.length === 0) return;
    const buf = Buffer.from(this.parts.join(""), "utf8");
    writeSync(this.fd, buf);
    this.bytes += buf.length;
    this.parts = [];
    this.length = 0;
  }
  close() {
    this.flush();
    closeSync(this.fd);
    return this.bytes;
  }
}

/** A CSV cell (RFC 4180): quoted when it holds a comma, a quote or a line break. */
export const csvCell = (s) => (/[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s);

/**
 * Generates the tree in pre-order and streams it to the requested formats. Memory is O(depth + widest
 * directory), so 10M nodes need no more than 1M. Returns statistics and two deep foci (paths).
 */
export function generate({ nodes, seed, maxDepth, formats, paths }) {
  const rng = makeRng(seed);
  const outs = {};
  for (const f of formats) outs[f] = new Out(paths[f]);
  const json = outs.json;
  const csv = outs.csv;
  const list = outs.paths;
  if (csv) csv.write("id,parent,name,size\n");

  const depthHistogram = new Array(maxDepth + 1).fill(0);
  let totalSize = 0;
  let leaves = 0;
  let maxFanout = 0;
  let nextId = 1;
  // Deep focus candidates: one reservoir sample per top-level child, among nodes at depth >= focusDepth.
  const focusDepth = Math.max(1, Math.min(maxDepth - 2, Math.round(maxDepth * 0.7)));
  const focusRng = makeRng(seed ^ 0x5eed);
  const candidates = new Map(); // top-level child index -> { seen, path, subtree }

  // Stack frame: a directory being written. Children are emitted one at a time from `budgets`.
  const stack = [];
  const names = [];

  const emit = (budget, depth, parentId, name, topIndex) => {
    const id = nextId++;
    const isDir = budget > 1;
    const kids = isDir ? childBudgets(rng, budget, depth, maxDepth) : null;
    const size = isDir ? 4096 * (1 + Math.floor(kids.length / 128)) : ownFileSize(rng);
    depthHistogram[depth]++;
    totalSize += size;
    if (!isDir) leaves++;
    else if (kids.length > maxFanout) maxFanout = kids.length;
    names.push(name);
    const pathText = names.slice(1).join("/");
    if (json) {
      json.write(`{"name":${JSON.stringify(name)},"size":${size}`);
      json.write(isDir ? `,"children":[` : "}");
    }
    if (csv) csv.write(`${id},${parentId === 0 ? "" : parentId},${csvCell(name)},${size}\n`);
    if (list) list.write(`${size}\t${depth === 0 ? "." : `./${pathText}`}\n`);
    if (depth >= focusDepth && topIndex >= 0) {
      let c = candidates.get(topIndex);
      if (!c) {
        c = { seen: 0, path: "" };
        candidates.set(topIndex, c);
      }
      c.seen++;
      if (focusRng.next() * c.seen < 1) c.path = pathText;
    }
    if (isDir) {
      stack.push({ id, depth, kids, next: 0, taken: new Set(), topIndex });
    } else {
      names.pop();
    }
  };

  emit(nodes, 0, 0, "quillfeather-archive", -1);
  while (stack.length > 0) {
    const top = stack[stack.length - 1];
    if (top.next === top.kids.length) {
      stack.pop();
      names.pop();
      if (json) json.write(stack.length === 0 ? "]}\n" : "]}");
      continue;
    }
    const budget = top.kids[top.next];
    if (json && top.next > 0) json.write(",");
    const topIndex = top.depth === 0 ? top.next : top.topIndex;
    top.next++;
    let name = inventName(rng, budget > 1);
    if (top.taken.has(name)) {
      let n = 2;
      while (top.taken.has(`${name}-${n}`)) n++;
      name = `${name}-${n}`;
    }
    top.taken.add(name);
    emit(budget, top.depth + 1, top.id, name, topIndex);
  }
  const bytes = {};
  for (const f of formats) {
    outs[f].close();
    bytes[f] = outs[f].bytes;
  }
  // The two deep foci: from the two top-level subtrees with the most deep nodes (different branches).
  const ranked = [...candidates.entries()].sort((a, b) => b[1].seen - a[1].seen || a[0] - b[0]);
  const foci = ranked.slice(0, 2).map(([, c]) => c.path);
  let deepest = 0;
  for (let d = 0; d <= maxDepth; d++) if (depthHistogram[d] > 0) deepest = d;
  return {
    nodes: nextId - 1,
    leaves,
    totalSize,
    maxFanout,
    deepest,
    depthHistogram,
    foci,
    bytes,
  };
}

/** A file's own size in bytes: mostly small, a long tail of large ones. */
function ownFileSize(rng) {
  const u = rng.next();
  if (rng.chance(0.02)) return 0;
  return 16 + Math.floor(u ** 10 * 60_000_000) + rng.int(0, 8191);
}

// ---------------------------------------------------------------------------------------------------------
// Reuse: a manifest per node count records the parameters and what was written.

export function dataFiles(nodes) {
  const out = {};
  for (const f of FORMATS) out[f] = join(dataDir, `tree-${nodes}.${EXTENSIONS[f]}`);
  return out;
}

function manifestPath(nodes) {
  return join(dataDir, `tree-${nodes}.manifest.json`);
}

/**
 * Makes sure the files for `formats` exist with these parameters, generating them if not (all formats
 * at once: one pass writes all three). Returns the manifest.
 */
export function ensureData({ nodes, seed = 20240611, maxDepth = 15, formats = FORMATS, force = false, log }) {
  mkdirSync(dataDir, { recursive: true });
  const files = dataFiles(nodes);
  const params = { generator: GENERATOR_VERSION, nodes, seed, maxDepth };
  const mPath = manifestPath(nodes);
  if (!force && existsSync(mPath)) {
    const manifest = JSON.parse(readFileSync(mPath, "utf8"));
    const same = JSON.stringify(manifest.params) === JSON.stringify(params);
    const present = formats.every(
      (f) =>
        manifest.bytes[f] !== undefined &&
        existsSync(files[f]) &&
        statSync(files[f]).size === manifest.bytes[f],
    );
    if (same && present) {
      log?.(`data: reusing ${nodes.toLocaleString("en-US")}-node files in ${dataDir}`);
      return { ...manifest, files };
    }
  }
  log?.(
    `data: generating ${nodes.toLocaleString("en-US")}-node tree (seed ${seed}, max depth ${maxDepth})...`,
  );
  const t0 = performance.now();
  const stats = generate({ nodes, seed, maxDepth, formats: FORMATS, paths: files });
  const manifest = { params, ...stats, seconds: Math.round(performance.now() - t0) / 1000 };
  writeFileSync(mPath, `${JSON.stringify(manifest, null, 2)}\n`);
  log?.(`data: written in ${manifest.seconds} s`);
  return { ...manifest, files };
}

// ---------------------------------------------------------------------------------------------------------

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  const args = process.argv.slice(2);
  const at = (flag) => {
    const i = args.indexOf(flag);
    return i >= 0 ? args[i + 1] : undefined;
  };
  const nodes = Number(at("--nodes") ?? 1_000_000);
  const formats = (at("--only") ?? FORMATS.join(",")).split(",");
  const m = ensureData({ nodes, formats, force: args.includes("--force"), log: console.log });
  const { files, ...rest } = m;
  console.log(JSON.stringify({ ...rest, files }, null, 2));
}
