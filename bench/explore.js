// Per-move latency of the interactive view (espalier explore) on a generated 1M-node tree: a scripted
// session of keys and resizes is run through the view's own state machine and screen (update + draw +
// the frame's bytes), exactly what the terminal edge does per key, and each move is timed.
// Informs; never gates.
// Usage: npm run bench:explore -- [--nodes N] [--rows R] [--cols C] [--repeat N] [--pseudonymize] [--json]

import { readFileSync } from "node:fs";
import { cpus, loadavg } from "node:os";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";
import { ensureData } from "./generate.js";

const root = join(dirname(fileURLToPath(import.meta.url)), "..");
const dist = (p) => import(join(root, "dist", p));
const { defaultLoadOptions } = await dist("load/load-options.js");
const { loadTree } = await dist("load/index.js");
const { prepare } = await dist("summarize.js");
const { summarySession } = await dist("explore/session.js");
const { startState, update } = await dist("explore/update.js");
const { draw } = await dist("explore/screen.js");
const { frame } = await dist("explore/terminal.js");
const { resolveFoci } = await dist("focus/resolve.js");
const { warmFits } = await dist("explore/warm.js");

const args = process.argv.slice(2);
const arg = (name, fallback) => {
  const i = args.indexOf(name);
  return i >= 0 ? args[i + 1] : fallback;
};
const nodes = Number(arg("--nodes", "1000000"));
const rows = Number(arg("--rows", "40"));
const cols = Number(arg("--cols", "120"));
const key = args.includes("--pseudonymize") ? "bench-secret" : undefined;
const repeat = Number(arg("--repeat", "3"));
const log = (s) => process.stderr.write(`${s}\n`);

const manifest = ensureData({ nodes, formats: ["json"], force: false, log });
const t0 = performance.now();
const tree = loadTree(readFileSync(manifest.files.json, "utf8"), { ...defaultLoadOptions, format: "json" });
const t1 = performance.now();
const prepared = prepare(tree);
const t2 = performance.now();
const plain = summarySession(prepared, { units: "bytes", chains: true, pseudonymKey: key });
// The same session, timing its fits (the library's summarize and the line layout): the rest of a move
// is the view's own work.
let fitMs = 0;
const session = {
  ...plain,
  fit: (...a) => {
    const t = performance.now();
    try {
      return plain.fit(...a);
    } finally {
      fitMs += performance.now() - t;
    }
  },
};
const t3 = performance.now();
if (key !== undefined) session.search.advance(Number.MAX_SAFE_INTEGER);
const t4 = performance.now();
log(
  `load ${ms(t1 - t0)}, prepare ${ms(t2 - t1)}, session and name index ${ms(t3 - t2)}` +
    (key !== undefined ? `, pseudonyms of every name ${ms(t4 - t3)} (in slices between keys in use)` : ""),
);

// The script: moves through the tree, folds, foci, searches, importance, undo, resizes.
const k = (name) => ({ name });
const c = (ch) => ({ char: ch });
const typed = (text) => Array.from(text, c);
const script = [
  ...Array(15).fill(k("down")),
  ...Array(6).fill(k("right")),
  k("enter"),
  c("o"),
  ...Array(4).fill(k("left")),
  c("+"),
  ...Array(10).fill(k("down")),
  k("tab"),
  k("back-tab"),
  c("/"),
  ...typed("quen"),
  k("backspace"),
  k("enter"),
  ...Array(5).fill(c("n")),
  ...Array(3).fill(c("N")),
  c("/"),
  ...typed("**/*.cfg"),
  k("escape"),
  c("i"),
  ...Array(8).fill(k("down")),
  k("right"),
  c("i"),
  k("end"),
  k("home"),
  { kind: "resize", rows: 24, cols: 80 },
  ...Array(5).fill(k("down")),
  { kind: "resize", rows: 50, cols: 40 },
  k("enter"),
  c("-"),
  c("x"),
  ...Array(12).fill(c("u")),
  c("h"),
  k("down"),
  k("escape"),
];

const foci = resolveFoci(prepared.index, manifest.foci.slice(0, 1));
let state = startState(session, { rows, cols, foci, importance: "depth", fociFile: "foci.txt" });
frame(draw(session, state, false).rows); // the first screen is drawn before any key
// The edge's first quiet moment (before any key): warm.ts fits the other importance and the view one
// Down away.
const w0 = performance.now();
warmFits(session, state);
log(`warm-up between the first screen and the first key: ${ms(performance.now() - w0)}`);
const times = [];
const cpu = [];
const cpuSlow = [];
const own = [];
const ownSlow = [];
const slow = [];
for (const event of Array.from({ length: repeat }, () => script).flat()) {
  fitMs = 0;
  const c = process.cpuUsage();
  const a = performance.now();
  state = update(session, state, event);
  const bytes = frame(draw(session, state, false).rows);
  const t = performance.now() - a;
  const used = process.cpuUsage(c);
  times.push(t);
  cpu.push((used.user + used.system) / 1000);
  if ((used.user + used.system) / 1000 > 20)
    cpuSlow.push(`${describe(event)} ${ms((used.user + used.system) / 1000)}`);
  own.push(t - fitMs);
  if (t - fitMs > 20) ownSlow.push(`${describe(event)} ${ms(t - fitMs)}`);
  if (t > 50) slow.push(`${describe(event)} ${ms(t)}`);
  if (bytes.length === 0) throw new Error("empty frame");
}
const sorted = [...times].sort((x, y) => x - y);
const q = (p, list = sorted) => list[Math.min(list.length - 1, Math.floor(p * list.length))];
const ownSorted = [...own].sort((x, y) => x - y);
const cpuSorted = [...cpu].sort((x, y) => x - y);
const result = {
  nodes: tree.length,
  terminal: `${rows}x${cols}`,
  pseudonymize: key !== undefined,
  moves: times.length,
  ms: { min: sorted[0], p50: q(0.5), p90: q(0.9), p99: q(0.99), max: sorted[sorted.length - 1] },
  over50ms: slow.length,
  /** CPU time of each move (all the process's threads, the collector's included): what it costs the machine. */
  cpuMs: {
    p50: q(0.5, cpuSorted),
    p90: q(0.9, cpuSorted),
    p99: q(0.99, cpuSorted),
    max: cpuSorted[cpuSorted.length - 1],
  },
  cpuOver50ms: cpu.filter((x) => x > 50).length,
  /** The view's own part of each move: update, draw and the frame, without the fits. */
  ownMs: { p50: q(0.5, ownSorted), p90: q(0.9, ownSorted), max: ownSorted[ownSorted.length - 1] },
  load: loadavg()[0],
};
log(
  `${times.length} moves on ${tree.length.toLocaleString("en")} nodes (${rows}x${cols}): ` +
    `min ${ms(result.ms.min)}, median ${ms(result.ms.p50)}, p90 ${ms(result.ms.p90)}, ` +
    `p99 ${ms(result.ms.p99)}, max ${ms(result.ms.max)}; over 50 ms: ${slow.length}` +
    (slow.length ? ` (${slow.join("; ")})` : ""),
);
log(
  `CPU time per move: median ${ms(result.cpuMs.p50)}, p90 ${ms(result.cpuMs.p90)}, p99 ${ms(result.cpuMs.p99)}, ` +
    `max ${ms(result.cpuMs.max)}; over 50 ms: ${result.cpuOver50ms}` +
    (cpuSlow.length ? ` (over 20 ms: ${cpuSlow.join("; ")})` : ""),
);
log(
  `of which the view's own work (all but the fits): median ${ms(result.ownMs.p50)}, p90 ${ms(result.ownMs.p90)}, ` +
    `max ${ms(result.ownMs.max)}${ownSlow.length ? ` (over 20 ms: ${ownSlow.join("; ")})` : ""}; load average ${result.load.toFixed(1)} on ${cpus().length} cores`,
);
if (args.includes("--json")) process.stdout.write(`${JSON.stringify(result)}\n`);

function ms(x) {
  return `${x.toFixed(1)} ms`;
}

function describe(event) {
  return "char" in event ? event.char : (event.name ?? event.kind);
}
