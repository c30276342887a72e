// One measurement in a fresh process, so the peak resident set size belongs to this run alone.
// Usage (from bench/run.js): node bench/child.js '<job JSON>'
// Prints one JSON line on stdout: { ms, maxRssMiB, phases, check } or { error }. check.output is the SHA-1
// of the rendered text, which run.js compares with what the real command line prints.
//
// Jobs:
//   baseline  start Node, import nothing, report the peak RSS (what every run pays before any work) and
//             the engine's default heap limit (what the launcher compares its estimate with)
//   floor     the least any loader must do: read the text and parse it, with no tree built
//   full      what `espalier FILE --focus A --focus B --budget N` does, step by step as
//             src/cli/summary-command.ts and input.ts do it (chunks from a file stream, loadTreeFromStream, prepare,
//             summarize, renderText), through the modules in dist/
//   memory    the same summary through the in-memory loader: read the whole text, then loadTree
//   refocus   load once (as the CLI loads), then time summarize() for many different random foci
//   diff      what `espalier diff OLD NEW --budget N` does, step by step as src/cli/diff-command.ts does it

import { constants } from "node:buffer";
import { createHash } from "node:crypto";
import { createReadStream, existsSync, statSync, writeFileSync } from "node:fs";
import { open, readFile } from "node:fs/promises";
import { Session } from "node:inspector/promises";
import { availableParallelism, loadavg, totalmem } from "node:os";
import { getHeapStatistics } from "node:v8";
import { makeRng } from "./generate.js";

const DIST = new URL("../dist/index.js", import.meta.url);
const CLI = (name) => new URL(`../dist/cli/${name}.js`, import.meta.url);
const BUNDLED_WORKER = new URL("../dist/bundle/load-worker.js", import.meta.url);

/** The options the CSV loader handed csv-parse before it had its own scanner (the old floor's options). */
export const LOADER_CSV_OPTIONS = { delimiter: ",", quote: '"', skip_empty_lines: true };

const job = JSON.parse(process.argv[2]);
const now = () => performance.now();
/** Processor time (user + system, every thread of this process) since `from`, in ms. */
const cpuMs = (from) => {
  const used = process.cpuUsage(from);
  return (used.user + used.system) / 1000;
};
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
      return { ms: 0, heapLimit: getHeapStatistics().heap_size_limit, totalMemory: totalmem() };
    case "floor":
      return floor(job);
    case "full":
      return full(job);
    case "memory":
      return inMemory(job);
    case "refocus":
      return refocus(job);
    case "diff":
      return diff(job);
    default:
      throw new Error(`unknown job kind ${job.kind}`);
  }
}

// ---------------------------------------------------------------------------------------------------------

async function floor({ format: asked, file, parser }) {
  // A storage inventory is a path list.
  const format = asked === "inventory" ? "paths" : asked;
  // Imports happen before the clock starts, as in `full`. The CSV floor is the fastest CSV parser in
  // the registries, d3-dsv's csvParse (rows as objects keyed by the header); csv-parse is the old row.
  const parse =
    format !== "csv"
      ? undefined
      : parser === "csv-parse"
        ? (await import("csv-parse/sync")).parse
        : (await import("d3-dsv")).csvParse;
  // A path list longer than the engine's longest string cannot be one string: read it in chunks.
  if (format === "paths" && statSync(file).size > constants.MAX_STRING_LENGTH) return chunkedPathsFloor(file);
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
    const records = parser === "csv-parse" ? parse(text, LOADER_CSV_OPTIONS) : parse(text);
    const t2 = now();
    count = parser === "csv-parse" ? records.length - 1 : records.length;
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

/** The path-list floor in 1 MiB chunks: each chunk's whole lines decoded at once, split as above. */
async function chunkedPathsFloor(file) {
  const t0 = now();
  let count = 0;
  let cells = 0;
  let rest = Buffer.alloc(0);
  const split = (text) => {
    const lines = text.split("\n");
    for (let i = 0; i < lines.length; i++) {
      const line = lines[i];
      if (line === "") continue;
      cells += line.split("\t").length;
      count++;
    }
  };
  for await (const chunk of createReadStream(file, { highWaterMark: 1 << 20 })) {
    const last = chunk.lastIndexOf(0x0a);
    if (last === -1) {
      rest = Buffer.concat([rest, chunk]);
      continue;
    }
    const bytes = rest.length > 0 ? Buffer.concat([rest, chunk.subarray(0, last)]) : chunk.subarray(0, last);
    split(bytes.toString("utf8"));
    rest = Buffer.from(chunk.subarray(last + 1));
  }
  split(rest.toString("utf8"));
  const t1 = now();
  return { ms: t1 - t0, phases: { "read+split": t1 - t0 }, check: { nodes: count, cells, chunked: true } };
}

// ---------------------------------------------------------------------------------------------------------

/** Read as the CLI reads: bytes, then the WHATWG UTF-8 decoder (cli/read-input.ts). */
async function readAsCli(file) {
  const bytes = await readFile(file);
  return new TextDecoder("utf-8", { ignoreBOM: false }).decode(bytes);
}

/** The interactive view's modules (dist/explore), for the re-focus job's first screen. */
async function exploreModules() {
  const [session, update, screen, warm] = await Promise.all([
    import(new URL("../dist/explore/session.js", import.meta.url)),
    import(new URL("../dist/explore/update.js", import.meta.url)),
    import(new URL("../dist/explore/screen.js", import.meta.url)),
    import(new URL("../dist/explore/warm.js", import.meta.url)),
  ]);
  return { ...session, ...update, ...screen, ...warm };
}

/** The CLI's modules (dist/cli), imported before the clock starts. */
async function cliModules() {
  const [input, settings, renderers, stream, progress, options, palette, threads, again] = await Promise.all([
    import(CLI("input")),
    import(CLI("output-settings")),
    import(CLI("renderers")),
    import(CLI("read-input-stream")),
    import(CLI("progress")),
    import(CLI("options")),
    import(new URL("../dist/render/palette.js", import.meta.url)),
    import(CLI("load-threads")),
    import(CLI("file-read-again")),
  ]);
  // The tree a worker sends back is rebuilt with these modules' classes, so the diff meets one NamePool
  // class, as the command line (all one bundle) does: taken from the bundle, the old tree's names were
  // another class, and every name comparison fell back to decoding.
  const loadInWorker = await workerLoader();
  return {
    ...input,
    ...settings,
    ...renderers,
    ...stream,
    ...progress,
    ...options,
    ...palette,
    ...threads,
    ...again,
    loadInWorker,
  };
}

/**
 * Loads a file on a worker thread as the command line does. The command line's worker is the bundle's
 * load-worker.js (one file; scripts/bundle.js); this one starts that same file and rebuilds the tree it
 * posts back with dist/'s treeFromMessage, as loadInWorker (src/cli/load-in-worker.ts) does. Without a
 * bundle, loadInWorker itself, whose worker imports the compiled modules one by one on the clock
 * (some hundred of them: about 0.3 s of CPU the command line does not spend).
 */
async function workerLoader() {
  const { loadInWorker } = await import(CLI("load-in-worker"));
  // As bin/load-bundle.js: a bundle older than the compiled modules (a plain tsc since) is not used.
  const modules = new URL("../dist/cli/load-worker.js", import.meta.url);
  if (!existsSync(BUNDLED_WORKER) || statSync(BUNDLED_WORKER).mtimeMs < statSync(modules).mtimeMs)
    return loadInWorker;
  const [{ Worker }, { treeFromMessage }, { EspalierError }] = await Promise.all([
    import("node:worker_threads"),
    import(new URL("../dist/model/tree-message.js", import.meta.url)),
    import(new URL("../dist/errors.js", import.meta.url)),
  ]);
  return (name, options) =>
    new Promise((resolve, reject) => {
      const worker = new Worker(BUNDLED_WORKER, { workerData: { name, options } });
      worker.once("message", (reply) => {
        if ("tree" in reply) resolve(treeFromMessage(reply.tree));
        else if ("error" in reply) reject(EspalierError.fromData(reply.error));
        else reject(new Error(reply.failure));
        void worker.terminate();
      });
      worker.once("error", reject);
    });
}

/**
 * What bin/espalier.js hands the CLI for a file: a 1 MiB-chunk read stream (openInput), no terminal (so
 * no progress line and no colour), an empty environment (no NO_COLOR decisions to make).
 */
function benchIO() {
  return {
    stdout: { write() {}, isTTY: false },
    stderr: { write() {}, isTTY: false },
    readStdin: () => Promise.reject(new Error("no stdin in the bench")),
    readFile: (path) => readFile(path),
    async openInput(name) {
      const handle = await open(name, "r");
      const stat = await handle.stat();
      return {
        size: stat.isFile() ? stat.size : undefined,
        chunks: handle.createReadStream({ highWaterMark: 1 << 20 }),
      };
    },
    now: () => performance.now(),
    env: {},
  };
}

/** Reads, loads and summarises as src/cli/summary-command.ts does for `espalier FILE --focus A --focus B --budget N`. */
async function full({ file, foci, budget, profile }) {
  const api = await import(DIST);
  const cli = await cliModules();
  const io = benchIO();
  // The validated options for those flags (every other option at its default), as src/cli/options.ts gives them.
  const opts = cli.summaryOptionsSchema.parse({ focus: foci, budget });
  const session = profile ? await startProfile() : undefined;
  const cpu0 = process.cpuUsage();
  const t0 = now();
  const source = await cli.readInputStream(io, file);
  const chunks = cli.withProgress(source.chunks, io, cli.displayName(file), source.size);
  // With the input's length, as the command line streams a named file (cli/input.ts, streamTree).
  const tree = await api.loadTreeFromStream(chunks, sized(cli.toLoadOptions(file, opts), source.size));
  const t1 = now();
  const cpuLoad = cpuMs(cpu0);
  const done = await summaryText(api, cli, io, opts, tree);
  const cpu = cpuMs(cpu0);
  if (session) await stopProfile(session, profile);
  return {
    ms: done.end - t0,
    cpuMs: cpu,
    phases: { "read+load": t1 - t0, ...done.phases },
    // Processor time: the load's, and the rest (prepare, summarize, render).
    cpuPhases: { "read+load": cpuLoad, rest: cpu - cpuLoad },
    check: done.check,
  };
}

/** prepare, summarize and render with the options and renderer summary-command.ts uses; times each. */
async function summaryText(api, cli, io, opts, tree) {
  const t1 = now();
  const prepared = api.prepare(tree);
  const t2 = now();
  const result = api.summarize(prepared, {
    foci: [...opts.focus],
    budget: opts.budget ?? cli.defaultBudget(io),
    importance: opts.importance,
    label: opts.label,
    pseudonymKey: undefined,
    chains: opts.chains,
    unmatchedFoci: opts.unmatchedFoci,
    headerLines: cli.headerLinesFor(opts, "summary", io),
    siblingOrder: opts.siblingOrder,
  });
  const t3 = now();
  const output = await cli.summaryRenderers[opts.format](result, cli.outputSettings(opts, io, tree), tree);
  const t4 = now();
  return {
    end: t4,
    phases: { prepare: t2 - t1, summarize: t3 - t2, render: t4 - t3 },
    check: {
      nodes: tree.length,
      size: prepared.measures.size[0],
      lines: output.split("\n").length - 1,
      selectionLines: result.selection.lines,
      foci: result.fociPaths,
      output: sha1(output),
    },
  };
}

/** Load options with the input's length, when known, as cli/input.ts streams a named file. */
function sized(options, size) {
  return size === undefined ? options : { ...options, inputBytes: size };
}

function sha1(text) {
  return createHash("sha1").update(text).digest("hex");
}

/** The in-memory path a library caller takes: the whole text, then loadTree (the CLI no longer does). */
async function inMemory({ file, foci, budget, profile }) {
  const api = await import(DIST);
  const cli = await cliModules();
  const io = benchIO();
  const opts = cli.summaryOptionsSchema.parse({ focus: foci, budget });
  const session = profile ? await startProfile() : undefined;
  const t0 = now();
  const text = await readAsCli(file);
  const t1 = now();
  const tree = api.loadTree(text, cli.toLoadOptions(file, opts));
  const t2 = now();
  const done = await summaryText(api, cli, io, opts, tree);
  if (session) await stopProfile(session, profile);
  return {
    ms: done.end - t0,
    phases: { read: t1 - t0, load: t2 - t1, ...done.phases },
    check: done.check,
  };
}

// ---------------------------------------------------------------------------------------------------------

async function refocus({ file, budget, calls, seed, profile }) {
  const api = await import(DIST);
  const cli = await cliModules();
  const explore = await exploreModules();
  const io = benchIO();
  const t0 = now();
  const source = await cli.readInputStream(io, file);
  const opts = cli.summaryOptionsSchema.parse({ budget });
  const tree = await api.loadTreeFromStream(source.chunks, cli.toLoadOptions(file, opts));
  const prepared = api.prepare(tree);
  const loadMs = now() - t0;
  // What `espalier explore` does before its first key can arrive (src/cli/explore-command.ts): the
  // first screen (here one of `budget` lines, no focus), then in its first quiet moment warmFits
  // (src/explore/warm.ts). The calls below are the re-focus a key then asks for.
  const w0 = now();
  const view = explore.summarySession(prepared, { units: "bytes", chains: true });
  const state = explore.startState(view, {
    rows: budget + explore.STATUS_ROWS,
    cols: 120,
    foci: new Int32Array(0),
    importance: "depth",
    fociFile: "foci.txt",
  });
  explore.draw(view, state, false);
  explore.warmFits(view, state);
  const firstScreenMs = now() - w0;
  const rng = makeRng(seed);
  const summarizeMs = [];
  const summarizeCpuMs = [];
  const renderMs = [];
  const specs = [];
  const session = profile ? await startProfile() : undefined;
  for (let c = 0; c < calls; c++) {
    // Two random nodes per call, named by the paths espalier prints (every printed path reads back).
    const foci = [0, 1].map(() => prepared.index.path(1 + Math.floor(rng.next() * (tree.length - 1))));
    specs.push(foci);
    const a = now();
    const cpu = process.cpuUsage();
    const result = api.summarize(prepared, { foci, budget, importance: "depth" });
    const b = now();
    const used = process.cpuUsage(cpu);
    api.renderText(result.view, { units: "bytes", sizes: tree.hasSizes });
    const c2 = now();
    summarizeMs.push(b - a);
    // CPU time of the whole process (the collector's threads included): what the call costs, without
    // the time it waited for a core on a busy machine.
    summarizeCpuMs.push((used.user + used.system) / 1000);
    renderMs.push(c2 - b);
  }
  if (session) await stopProfile(session, profile);
  return {
    ms: loadMs,
    firstScreenMs,
    summarizeMs,
    summarizeCpuMs,
    renderMs,
    check: { nodes: tree.length, foci: specs },
  };
}

// ---------------------------------------------------------------------------------------------------------

/**
 * `espalier diff OLD NEW --budget N` with no other option, as cli/diff-command.ts runs it: both
 * versions streamed, at once when the command line would use two threads (a second processor idle, or
 * ESPALIER_LOAD_THREADS=2: cli/load-threads.ts), OLD on a worker thread (loadInWorker, as
 * bin/espalier.js provides it), else OLD then NEW here; NEW as the summary loads its input (OLD under NEW's root name, so a synthetic root never shows
 * as renamed), diffTrees with no foci, and the text rendering with NEW's sizes, the matching's name
 * and the CLI's text options.
 */
async function diff({ oldFile, newFile, budget, profile }) {
  const api = await import(DIST);
  const cli = await cliModules();
  const io = benchIO();
  const opts = cli.diffOptionsSchema.parse({ budget });
  const load = async (file, options) => {
    const source = await cli.readInputStream(io, file);
    const chunks = cli.withProgress(source.chunks, io, cli.displayName(file), source.size);
    return api.loadTreeFromStream(chunks, sized(options, source.size));
  };
  // Two threads only when the command line would take them (cli/load-threads.ts): a second processor idle.
  const threads = cli.loadThreads(process.env[cli.LOAD_THREADS_ENV], {
    cores: availableParallelism(),
    load: loadavg()[0],
  });
  const session = profile ? await startProfile() : undefined;
  const cpu0 = process.cpuUsage();
  const t0 = now();
  // Without --compare-field each load keeps its records' other fields as it reads, as
  // cli/compared-fields.ts asks (the bench's tables and documents have none to compare).
  const keeping = { ...opts, keepOtherFields: opts.compareField.length === 0 };
  const newOptions = cli.toLoadOptions(newFile, keeping);
  const oldOptions = { ...cli.toLoadOptions(oldFile, keeping), rootName: newOptions.rootName };
  let oldDone = 0;
  let newDone = 0;
  let oldCpu = 0;
  // On one thread OLD's table keeps its bytes and cells for NEW's, and a JSON document where its node
  // objects lie, its file read again by NEW's load, as cli/input.ts asks.
  const again = threads === 2 ? undefined : cli.fileReadAgain(oldFile);
  const loadOld = () =>
    (threads === 2
      ? cli.loadInWorker(oldFile, oldOptions)
      : load(oldFile, { ...oldOptions, keepForLaterVersion: true, inputReadAgain: again !== undefined })
    ).then((tree) => {
      oldDone = now();
      oldCpu = cpuMs(cpu0);
      return tree;
    });
  // On one thread NEW's table may read OLD's bytes for the cells they share, as cli/input.ts does.
  const loadNew = (oldTree) =>
    load(
      newFile,
      oldTree
        ? { ...newOptions, earlierVersion: oldTree, ...(again?.unchanged() ? { earlierInput: again } : {}) }
        : newOptions,
    ).then((tree) => {
      newDone = now();
      return tree;
    });
  const [oldTree, newTree] =
    threads === 2
      ? await Promise.all([loadOld(), loadNew()])
      : await loadOld().then(async (old) => [old, await loadNew(old)]);
  again?.close();
  const t2 = now();
  const loadsCpu = cpuMs(cpu0);
  // The fields the command line compares (cli/diff-command.ts): --compare-field, else `version` where
  // both versions keep it; the header says which (cli/output-settings.ts, comparedSaid).
  const { defaultComparedFields } = await import(new URL("../dist/diff/field-edits.js", import.meta.url));
  const compareFields =
    opts.compareField.length > 0 ? opts.compareField : defaultComparedFields(oldTree, newTree);
  const result = api.diffTrees(oldTree, newTree, {
    foci: [],
    budget: opts.budget ?? cli.defaultBudget(io),
    importance: opts.importance,
    label: opts.label,
    pseudonymKey: undefined,
    chains: opts.chains,
    headerLines: cli.headerLinesFor(opts, "diff", io),
    siblingOrder: opts.siblingOrder,
    compareFields,
    unmatchedFoci: opts.unmatchedFoci,
  });
  const t3 = now();
  const diffCpu = cpuMs(cpu0);
  const { tree } = result.combined;
  const settings = {
    ...cli.outputSettings(opts, io, tree, [oldTree, newTree]),
    compared: cli.comparedSaid(compareFields, [oldTree, newTree]),
  };
  const output = await cli.diffRenderers[opts.format](result, settings, tree);
  const t4 = now();
  const cpu = cpuMs(cpu0);
  if (session) await stopProfile(session, profile);
  return {
    ms: t4 - t0,
    cpuMs: cpu,
    threads,
    // Wall time of each stage. On one thread NEW's load starts when OLD's ends, so it is counted from
    // there (counted from the start, it held OLD's load too and looked like time spent waiting); on two
    // the loads overlap, and each is counted from the start.
    phases: {
      "read+loadOld": oldDone - t0,
      "read+loadNew": threads === 2 ? newDone - t0 : newDone - oldDone,
      diff: t3 - t2,
      render: t4 - t3,
    },
    // Processor time of each stage (each load on its own only on one thread: two overlap, and the
    // worker's time is counted when it ends), not cumulative.
    cpuPhases:
      threads === 2
        ? { loads: loadsCpu, diff: diffCpu - loadsCpu, render: cpu - diffCpu }
        : { loadOld: oldCpu, loadNew: loadsCpu - oldCpu, diff: diffCpu - loadsCpu, render: cpu - diffCpu },
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
      output: sha1(output),
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
