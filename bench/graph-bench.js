// Issue 11, scale of graphs: a graph of N nodes and 3N edges against a tree of N nodes, both as edge lists
// (the same format, one `parent child` pair per line, grouped by parent as graph tools list them), each
// loaded and summarised by the real command line. Informs; never gates.

import { spawnSync } from "node:child_process";
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
import { loadavg } from "node:os";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";
import { dataDir, makeRng } from "./generate.js";

const GENERATOR_VERSION = 4;
const TIME = "/usr/bin/time";
const cliScript = join(dirname(fileURLToPath(import.meta.url)), "..", "bin", "espalier.js");
/** Issue 11: the graph loads and summarises within this many times the tree's time. */
export const GRAPH_TARGET = 2.0;

/** An id of about a package name's length, unique per node. */
const id = (i) => `pkg-${((i * 2654435761) >>> 0).toString(36)}-${i.toString(36)}`;

/**
 * Writes (once) the tree and the graph: node i > 0 hangs under an earlier node chosen uniformly (a
 * random recursive tree: about ln N levels on average); the graph adds 2N more edges, so it has shared
 * nodes and a few cycles. Returns the files and three foci (deep nodes).
 */
export function graphData({ nodes, seed = 20261202, force = false, log }) {
  mkdirSync(dataDir, { recursive: true });
  const files = {
    tree: join(dataDir, `edges-tree-${nodes}.edges`),
    graph: join(dataDir, `edges-graph-${nodes}.edges`),
    manifest: join(dataDir, `edges-${nodes}.manifest.json`),
  };
  const params = { generator: GENERATOR_VERSION, nodes, seed };
  if (!force && existsSync(files.manifest)) {
    const m = JSON.parse(readFileSync(files.manifest, "utf8"));
    if (
      JSON.stringify(m.params) === JSON.stringify(params) &&
      existsSync(files.tree) &&
      statSync(files.tree).size === m.bytes.tree &&
      existsSync(files.graph) &&
      statSync(files.graph).size === m.bytes.graph
    ) {
      log?.(`graph data: reusing ${nodes.toLocaleString("en-US")}-node edge lists`);
      return { ...m, files };
    }
  }
  log?.(
    `graph data: generating a ${nodes.toLocaleString("en-US")}-node tree and a graph with 3x the edges...`,
  );
  const rng = makeRng(seed);
  const parent = new Int32Array(nodes).fill(-1);
  const depth = new Int32Array(nodes);
  for (let i = 1; i < nodes; i++) {
    parent[i] = Math.floor(rng.next() * i);
    depth[i] = depth[parent[i]] + 1;
  }
  // Extra edges, 2 per node, as dependency graphs have them: from a node nearer the root than the child
  // (a layered graph), and one in a thousand back up to an ancestor (a cycle).
  const extraFrom = new Int32Array(2 * nodes);
  const extraTo = new Int32Array(2 * nodes);
  for (let k = 0; k < 2 * nodes; k++) {
    const v = 1 + Math.floor(rng.next() * (nodes - 1));
    let u = Math.floor(rng.next() * v);
    for (let t = 0; t < 8 && depth[u] >= depth[v]; t++) u = Math.floor(rng.next() * v);
    if (depth[u] >= depth[v]) u = 0;
    if (rng.chance(0.001)) {
      // A cycle: the edge goes back up, from v to one of its ancestors.
      let a = v;
      for (let up = rng.int(1, 4); up > 0 && parent[a] >= 0; up--) a = parent[a];
      extraTo[k] = a;
      extraFrom[k] = v;
      continue;
    }
    extraTo[k] = v;
    extraFrom[k] = u;
  }
  const write = (file, withExtra) => {
    // Children of each node, grouped by parent: a counting sort of the edges by their parent.
    const edges = nodes - 1 + (withExtra ? extraFrom.length : 0);
    const from = new Int32Array(edges);
    const to = new Int32Array(edges);
    for (let i = 1; i < nodes; i++) {
      from[i - 1] = parent[i];
      to[i - 1] = i;
    }
    if (withExtra) {
      from.set(extraFrom, nodes - 1);
      to.set(extraTo, nodes - 1);
    }
    const start = new Int32Array(nodes + 1);
    for (let e = 0; e < edges; e++) start[from[e] + 1]++;
    for (let i = 0; i < nodes; i++) start[i + 1] += start[i];
    const order = new Int32Array(edges);
    const fill = start.slice(0, nodes);
    for (let e = 0; e < edges; e++) order[fill[from[e]]++] = e;
    const fd = openSync(file, "w");
    let chunk = "";
    for (let k = 0; k < edges; k++) {
      const e = order[k];
      chunk += `${id(from[e])} ${id(to[e])}\n`;
      if (chunk.length > 1 << 20) {
        writeSync(fd, chunk);
        chunk = "";
      }
    }
    writeSync(fd, chunk);
    closeSync(fd);
    return edges;
  };
  const treeEdges = write(files.tree, false);
  const graphEdges = write(files.graph, true);
  // Foci: three of the deepest nodes, spread over the index range.
  const foci = [];
  for (const part of [0.3, 0.6, 0.9]) {
    let best = Math.floor(part * (nodes - 1));
    for (let i = best; i < Math.min(nodes, best + 1000); i++) if (depth[i] > depth[best]) best = i;
    foci.push(id(best));
  }
  const manifest = {
    params,
    foci,
    edges: { tree: treeEdges, graph: graphEdges },
    bytes: { tree: statSync(files.tree).size, graph: statSync(files.graph).size },
  };
  writeFileSync(files.manifest, `${JSON.stringify(manifest, null, 2)}\n`);
  return { ...manifest, files };
}

/**
 * The real command line on the tree and on the graph, `repeat` times each, alternating which goes first;
 * the medians of wall time and of CPU time (user + system, from GNU time), and their ratios. On a shared
 * machine the wall time moves with the other processes; the CPU time much less.
 */
export function benchGraph({ nodes, repeat, log }) {
  const data = graphData({ nodes, log });
  // Room for the three focus paths in both inputs (a cycle edge can lengthen a graph's longest paths).
  const budget = 400;
  const runs = { tree: [], graph: [] };
  for (let r = 0; r < repeat; r++) {
    for (const kind of r % 2 === 0 ? ["tree", "graph"] : ["graph", "tree"]) {
      const args = [cliScript, data.files[kind], "--input-format", "edges", "--budget", String(budget)];
      for (const f of data.foci) args.push("--focus", f);
      const res = timed(args);
      runs[kind].push(res);
      log(
        `graph bench ${kind} #${r + 1}: ${res.error ? `ERROR ${res.error}` : `${(res.ms / 1000).toFixed(2)} s wall, ${(res.cpuMs / 1000).toFixed(2)} s CPU, ${res.maxRssMiB} MiB`} (load ${loadavg()[0].toFixed(1)})`,
      );
    }
  }
  const median = (list, key) => {
    const xs = list
      .filter((x) => !x.error)
      .map((x) => x[key])
      .sort((a, b) => a - b);
    return xs.length === 0 ? null : xs[Math.floor(xs.length / 2)];
  };
  const figures = (key) => {
    const tree = median(runs.tree, key);
    const graph = median(runs.graph, key);
    return { tree, graph, ratio: tree && graph ? graph / tree : null };
  };
  const wall = figures("ms");
  const cpu = figures("cpuMs");
  return {
    nodes,
    budget,
    edges: data.edges,
    bytes: data.bytes,
    foci: data.foci,
    wall,
    cpu,
    target: GRAPH_TARGET,
    pass: cpu.ratio === null ? null : cpu.ratio <= GRAPH_TARGET,
    peakMiB: {
      tree: Math.max(...runs.tree.map((x) => x.maxRssMiB ?? 0)),
      graph: Math.max(...runs.graph.map((x) => x.maxRssMiB ?? 0)),
    },
    runs,
  };
}

/** `node ARGS` under GNU time: wall ms, CPU ms (user + system), peak MiB, or { error }. */
function timed(args) {
  const env = { ...process.env };
  delete env.ESPALIER_HEAP_RESTARTED;
  const t0 = performance.now();
  const proc = spawnSync(TIME, ["-f", "TIMES %U %S %M", process.execPath, ...args], {
    encoding: "utf8",
    maxBuffer: 256 << 20,
    env,
  });
  const ms = performance.now() - t0;
  const m = /TIMES ([\d.]+) ([\d.]+) (\d+)\s*$/.exec(proc.stderr ?? "");
  if (proc.status !== 0 || !m)
    return { ms, error: `exit ${proc.status}: ${(proc.stderr ?? "").trim().slice(0, 200)}` };
  return {
    ms,
    cpuMs: (Number(m[1]) + Number(m[2])) * 1000,
    maxRssMiB: Math.round(Number(m[3]) / 102.4) / 10,
  };
}

/** The report's lines for the graph case. */
export function graphLines(g) {
  if (!g) return [];
  if (g.skipped) return ["", `graph (issue 11): skipped (${g.reason})`];
  const s = (ms) => (ms === null ? "-" : `${(ms / 1000).toFixed(2)} s`);
  const x = (r) => (r === null ? "-" : r.toFixed(2));
  return [
    "",
    `graph (issue 11): ${g.nodes.toLocaleString("en-US")} nodes + ${g.edges.graph.toLocaleString("en-US")} edges vs a ` +
      `${g.nodes.toLocaleString("en-US")}-node tree, both edge lists, real command line (budget ${g.budget}), median:`,
    `  CPU time:  tree ${s(g.cpu.tree)}, graph ${s(g.cpu.graph)}, ratio ${x(g.cpu.ratio)} (target <= ${g.target.toFixed(1)}) ${g.pass === null ? "" : g.pass ? "PASS" : "MISS"}`,
    `  wall time: tree ${s(g.wall.tree)}, graph ${s(g.wall.graph)}, ratio ${x(g.wall.ratio)}; peak ${g.peakMiB.tree} / ${g.peakMiB.graph} MiB`,
  ];
}
