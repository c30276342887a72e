// One measurement in a fresh process, so the peak resident set size belongs to this run alone.
// Usage (from bench/run.js): node bench/child.js '<job JSON>'
// Prints one JSON line on stdout: { ms, maxRssMiB, phases, check } or { error }.
//
// Jobs:
//   baseline  start Node, import nothing, report the peak RSS (what every run pays before any work)
//   floor     the least any in-memory loader must do: read the text and parse it, with no tree built
//   full      what `espalier FILE --focus A --focus B --budget N` does, through the dist/ API
//   refocus   load once, then time summarize() for many different random foci
//   diff      what `espalier diff OLD NEW --budget N` does, through the dist/ API (cli/diff-command.ts)

import { writeFileSync } from "node:fs";
import { readFile } from "node:fs/promises";
import { Session } from "node:inspector/promises";
import { basename } from "node:path";
import { makeRng } from "./generate.js";

const DIST = new URL("../dist/index.js", import.meta.url);

/** The options csvTable (src/load/table.ts) hands to csv-parse for a CSV file with no node limit. */
export const LOADER_CSV_OPTIONS = { delimiter: ",", quote: '"', skip_empty_lines: true };

const job = JSON.parse(process.argv[2]);
const now = () => performance.now();
const mib = (kib) => Math.round((kib / 1024) * 10) / 10;

try {
  const result = await run(job);
  result.maxRssMiB = mib(process.resourceUsage().maxRSS);
  process.stdout.write(`${JSON.stringify(result)}\n`);
} catch (error) {
  const code = error?.code ? `${error.code}: ` : "";
  const result = { error: `${code}${error?.message ?? String(error)}` };
  result.maxRssMiB = mib(process.resourceUsage().maxRSS);
  process.stdout.write(`${JSON.stringify(result)}\n`);
  process.exitCode = 1;
}

async function run(job) {
  switch (job.kind) {
    case "baseline":
      return { ms: 0 };
    case "floor":
      return floor(job);
    case "full":
      return full(job);
    case "refocus":
      return refocus(job);
    case "diff":
      return diff(job);
    default:
      throw new Error(`unknown job kind ${job.kind}`);
  }
}

// ---------------------------------------------------------------------------------------------------------

async function floor({ format, file }) {
  // Imports happen before the clock starts, as in `full`.
  const parse = format === "csv" ? (await import("csv-parse/sync")).parse : undefined;
  const t0 = now();
  const text = await readFile(file, "utf8");
  const t1 = now();
  let count = 0;
  if (format === "json") {
    const root = JSON.parse(text);
    const t2 = now();
    // One iterative walk over the children arrays, counting nodes.
    const stack = [root];
    while (stack.length > 0) {
      const node = stack.pop();
      count++;
      const kids = node.children;
      if (Array.isArray(kids)) for (let i = 0; i < kids.length; i++) stack.push(kids[i]);
    }
    const t3 = now();
    return { ms: t3 - t0, phases: { read: t1 - t0, parse: t2 - t1, walk: t3 - t2 }, check: { nodes: count } };
  }
  if (format === "csv") {
    const records = parse(text, LOADER_CSV_OPTIONS);
    const t2 = now();
    count = records.length - 1;
    return { ms: t2 - t0, phases: { read: t1 - t0, parse: t2 - t1 }, check: { nodes: count } };
  }
  if (format === "paths") {
    const lines = text.split("\n");
    let cells = 0;
    for (let i = 0; i < lines.length; i++) {
      const line = lines[i];
      if (line === "") continue;
      cells += line.split("\t").length;
      count++;
    }
    const t2 = now();
    return { ms: t2 - t0, phases: { read: t1 - t0, split: t2 - t1 }, check: { nodes: count, cells } };
  }
  throw new Error(`no floor for format ${format}`);
}

// ---------------------------------------------------------------------------------------------------------

/** The load options the CLI builds for `espalier FILE` with no field options (cli/summary-command.ts). */
function cliLoadOptions(api, file) {
  return { ...api.defaultLoadOptions, file, rootName: basename(file) };
}

/** Read as the CLI reads: bytes, then the WHATWG UTF-8 decoder (cli/read-input.ts). */
async function readAsCli(file) {
  const bytes = await readFile(file);
  return new TextDecoder("utf-8", { ignoreBOM: false }).decode(bytes);
}

async function full({ file, foci, budget, profile }) {
  const api = await import(DIST);
  const session = profile ? await startProfile() : undefined;
  const t0 = now();
  const text = await readAsCli(file);
  const t1 = now();
  const tree = api.loadTree(text, cliLoadOptions(api, file));
  const t2 = now();
  const prepared = api.prepare(tree);
  const t3 = now();
  const result = api.summarize(prepared, { foci, budget, importance: "depth" });
  const t4 = now();
  const output = api.renderText(result.view, { units: "bytes", sizes: tree.hasSizes });
  const t5 = now();
  if (session) await stopProfile(session, profile);
  return {
    ms: t5 - t0,
    phases: { read: t1 - t0, load: t2 - t1, prepare: t3 - t2, summarize: t4 - t3, render: t5 - t4 },
    check: {
      nodes: tree.length,
      size: prepared.measures.size[0],
      lines: output.split("\n").length - 1,
      selectionLines: result.selection.lines,
      foci: result.fociPaths,
    },
  };
}

// ---------------------------------------------------------------------------------------------------------

async function refocus({ file, budget, calls, seed, profile }) {
  const api = await import(DIST);
  const t0 = now();
  const text = await readAsCli(file);
  const tree = api.loadTree(text, cliLoadOptions(api, file));
  const prepared = api.prepare(tree);
  const loadMs = now() - t0;
  const rng = makeRng(seed);
  const summarizeMs = [];
  const renderMs = [];
  const specs = [];
  const session = profile ? await startProfile() : undefined;
  for (let c = 0; c < calls; c++) {
    // Two random nodes per call, named by the paths espalier prints (every printed path reads back).
    const foci = [0, 1].map(() => prepared.index.path(1 + Math.floor(rng.next() * (tree.length - 1))));
    specs.push(foci);
    const a = now();
    const result = api.summarize(prepared, { foci, budget, importance: "depth" });
    const b = now();
    api.renderText(result.view, { units: "bytes", sizes: tree.hasSizes });
    const c2 = now();
    summarizeMs.push(b - a);
    renderMs.push(c2 - b);
  }
  if (session) await stopProfile(session, profile);
  return { ms: loadMs, summarizeMs, renderMs, check: { nodes: tree.length, foci: specs } };
}

// ---------------------------------------------------------------------------------------------------------

/**
 * `espalier diff OLD NEW --budget N` with no other option, as cli/diff-command.ts runs it: read both
 * versions, then load both (OLD under NEW's root name, so a synthetic root never shows as renamed),
 * diffTrees with no foci, and the text rendering with NEW's sizes and the matching's name.
 */
async function diff({ oldFile, newFile, budget, profile }) {
  const api = await import(DIST);
  const session = profile ? await startProfile() : undefined;
  const t0 = now();
  const oldText = await readAsCli(oldFile);
  const newText = await readAsCli(newFile);
  const t1 = now();
  const newOptions = cliLoadOptions(api, newFile);
  const oldTree = api.loadTree(oldText, { ...cliLoadOptions(api, oldFile), rootName: newOptions.rootName });
  const tOld = now();
  const newTree = api.loadTree(newText, newOptions);
  const t2 = now();
  const result = api.diffTrees(oldTree, newTree, { foci: [], budget, importance: "depth" });
  const t3 = now();
  const output = api.renderDiffText(result.view, result.totals, {
    units: "bytes",
    sizes: result.combined.tree.hasSizes,
    by: result.combined.by,
  });
  const t4 = now();
  if (session) await stopProfile(session, profile);
  return {
    ms: t4 - t0,
    phases: { read: t1 - t0, loadOld: tOld - t1, loadNew: t2 - tOld, diff: t3 - t2, render: t4 - t3 },
    check: {
      by: result.combined.by,
      oldNodes: oldTree.length,
      newNodes: newTree.length,
      combinedNodes: result.combined.tree.length,
      changes: result.totals.changes,
      delta: result.totals.delta,
      lines: output.split("\n").length - 1,
      selectionLines: result.selection.lines,
      head: output.slice(0, output.indexOf("\n")),
    },
  };
}

// ---------------------------------------------------------------------------------------------------------

/** A CPU profile of the timed part only (module loading and start-up stay out of it). */
async function startProfile() {
  const session = new Session();
  session.connect();
  await session.post("Profiler.enable");
  await session.post("Profiler.setSamplingInterval", { interval: 200 });
  await session.post("Profiler.start");
  return session;
}

async function stopProfile(session, file) {
  const { profile } = await session.post("Profiler.stop");
  writeFileSync(file, JSON.stringify(profile));
  session.disconnect();
}
