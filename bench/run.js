// espalier's benchmark: full summary time and peak memory against the floor of an in-memory loader, per
// input format, on a generated tree. Informs; never gates (exit 0 whatever the ratios).
// Usage: npm run bench -- [--nodes N] [--only json,csv,paths,diff] [--repeat N] [--budget N] [--calls N]
//                         [--heap MiB] [--cpu-prof] [--no-cli] [--no-diff] [--force-data]
// See docs/performance.md for what every number means.

import { spawnSync } from "node:child_process";
import { closeSync, existsSync, mkdirSync, openSync, readSync, writeFileSync } from "node:fs";
import { cpus, loadavg } from "node:os";
import { dirname, join, relative } from "node:path";
import { fileURLToPath } from "node:url";
import { DIFF_FORMATS, ensureDiffData } from "./diff-data.js";
import { ensureData, FORMATS } from "./generate.js";
import { topFunctions } from "./prof-top.js";

const benchDir = dirname(fileURLToPath(import.meta.url));
const repoRoot = join(benchDir, "..");
const outDir = join(benchDir, "out");
const childScript = join(benchDir, "child.js");
const cliScript = join(repoRoot, "bin", "espalier.js");
const distIndex = join(repoRoot, "dist", "index.js");

/** Targets from the issues: full/floor time and peak memory ratios. */
const TARGETS = {
  issue2Time: { json: 2.0, csv: 2.0, paths: 2.0 },
  issue4Time: { json: 1.3, csv: 1.5, paths: 1.5 },
  issue4Memory: { json: 1.5, csv: 1.5, paths: 1.5 },
  refocusMs: 50,
  /** Issue 3: diff of two versions with 1% of the nodes changed / summary of one version. */
  diffTime: 2.5,
};

const log = (s) => process.stderr.write(`${s}\n`);
const options = parseArgs(process.argv.slice(2));

if (!existsSync(distIndex)) {
  log(`bench: ${relative(repoRoot, distIndex)} is missing; build first: npx tsc -p tsconfig.json`);
  process.exit(1);
}

const manifest = ensureData({ nodes: options.nodes, formats: options.only, force: options.forceData, log });
const foci = manifest.foci;
log(`foci: ${foci.join("  |  ")}`);
if (!options.diffOnly) for (const f of options.only) warmCache(manifest.files[f]);

const results = {
  when: new Date().toISOString(),
  node: process.version,
  platform: `${process.platform}-${process.arch}`,
  cpus: cpus().length,
  loadBefore: loadavg()[0],
  loadAfter: null,
  options,
  data: {
    ...manifest,
    files: Object.fromEntries(options.only.map((f) => [f, relative(repoRoot, manifest.files[f])])),
  },
  targets: TARGETS,
  baseline: child({ kind: "baseline" }),
  formats: {},
  refocus: null,
  diff: null,
};
log(`baseline: an empty Node process peaks at ${results.baseline.maxRssMiB} MiB`);

for (const format of options.diffOnly ? [] : options.only) {
  const file = manifest.files[format];
  const runs = { floor: [], full: [] };
  for (let r = 0; r < options.repeat; r++) {
    // Alternate which goes first, so slow drift of the machine does not favour one side.
    const order = r % 2 === 0 ? ["floor", "full"] : ["full", "floor"];
    for (const kind of order) {
      const res = child({ kind, format, file, foci, budget: options.budget });
      runs[kind].push(res);
      log(
        `${format} ${kind} #${r + 1}: ${res.error ? `ERROR ${res.error}` : `${fmtS(res.ms)} s, ${res.maxRssMiB} MiB`}`,
      );
    }
  }
  const entry = summarizeRuns(format, runs);
  if (options.cli) entry.cli = runCli(format, file, foci, options.budget);
  if (options.cpuProf) entry.profile = profile(format, file, foci, options.budget);
  results.formats[format] = entry;
}

results.refocus = options.diffOnly ? null : benchRefocus(options.only[0]);
results.diff = benchDiff();
results.loadAfter = loadavg()[0];

mkdirSync(outDir, { recursive: true });
writeFileSync(join(outDir, "results.json"), `${JSON.stringify(results, null, 2)}\n`);
process.stdout.write(report(results));
log(`\nwrote ${relative(repoRoot, join(outDir, "results.json"))}`);

// ---------------------------------------------------------------------------------------------------------
// Children

function nodeFlags() {
  return options.heap ? [`--max-old-space-size=${options.heap}`] : [];
}

/** Runs one job in a fresh Node process and returns its JSON answer (or { error }). */
function child(job) {
  const proc = spawnSync(process.execPath, [...nodeFlags(), childScript, JSON.stringify(job)], {
    encoding: "utf8",
    maxBuffer: 64 << 20,
  });
  const lastLine = proc.stdout.trim().split("\n").pop();
  try {
    return JSON.parse(lastLine);
  } catch {
    return {
      error: `child exited ${proc.status ?? proc.signal}: ${proc.stderr.trim().split("\n").slice(-3).join(" / ")}`,
    };
  }
}

/** Medians of the repeats, and ratios from this run's medians (never mixed with another run). */
function summarizeRuns(format, runs) {
  const ok = (list) => list.filter((r) => !r.error);
  const floor = ok(runs.floor);
  const full = ok(runs.full);
  const entry = { runs, errors: [...runs.floor, ...runs.full].filter((r) => r.error).map((r) => r.error) };
  if (floor.length === 0 || full.length === 0) return entry;
  entry.floorMs = median(floor.map((r) => r.ms));
  entry.fullMs = median(full.map((r) => r.ms));
  entry.floorMiB = median(floor.map((r) => r.maxRssMiB));
  entry.fullMiB = median(full.map((r) => r.maxRssMiB));
  entry.timeRatio = entry.fullMs / entry.floorMs;
  entry.memoryRatio = entry.fullMiB / entry.floorMiB;
  entry.floorPhases = medianPhases(floor);
  entry.fullPhases = medianPhases(full);
  entry.check = full[0].check;
  entry.pass = {
    issue2Time: entry.timeRatio <= TARGETS.issue2Time[format],
    issue4Time: entry.timeRatio <= TARGETS.issue4Time[format],
    issue4Memory: entry.memoryRatio <= TARGETS.issue4Memory[format],
  };
  return entry;
}

function medianPhases(list) {
  const out = {};
  for (const key of Object.keys(list[0].phases ?? {})) out[key] = median(list.map((r) => r.phases[key]));
  return out;
}

/** The real CLI, once per format: wall time of the whole process, as a user would see it. */
function runCli(format, file, foci, budget) {
  const args = [cliScript, file, ...foci.flatMap((f) => ["--focus", f]), "--budget", String(budget)];
  const t0 = performance.now();
  const proc = spawnSync(process.execPath, [...nodeFlags(), ...args], {
    encoding: "utf8",
    maxBuffer: 64 << 20,
  });
  const ms = performance.now() - t0;
  const lines = proc.stdout ? proc.stdout.split("\n").length - 1 : 0;
  const res = { ms, exit: proc.status, lines };
  if (proc.status !== 0) res.error = proc.stderr.trim().split("\n").slice(0, 3).join(" / ");
  log(`${format} cli: ${fmtS(ms)} s, exit ${proc.status}, ${lines} lines`);
  return res;
}

/** One extra full run with the CPU profiler on (not timed: profiling slows it); the hottest functions. */
function profile(format, file, foci, budget) {
  const dir = join(outDir, "prof");
  mkdirSync(dir, { recursive: true });
  const path = join(dir, `full-${format}.cpuprofile`);
  const res = child({ kind: "full", format, file, foci, budget, profile: path });
  if (res.error) return { error: res.error };
  log(`${format} profile: ${relative(repoRoot, path)}`);
  return { file: relative(repoRoot, path), top: topFunctions(path, 15) };
}

/** Load once, then time summarize() for many random foci (issue 4: each re-focus <= 50 ms). */
function benchRefocus(format) {
  if (!format) return null;
  const res = child({
    kind: "refocus",
    format,
    file: manifest.files[format],
    budget: options.budget,
    calls: options.calls,
    seed: 7,
  });
  if (res.error) {
    log(`refocus: ERROR ${res.error}`);
    return { format, error: res.error };
  }
  const out = {
    format,
    calls: res.summarizeMs.length,
    medianMs: median(res.summarizeMs),
    maxMs: Math.max(...res.summarizeMs),
    firstMs: res.summarizeMs[0],
    renderMedianMs: median(res.renderMs),
    summarizeMs: res.summarizeMs,
    foci: res.check.foci,
  };
  out.pass = out.maxMs <= TARGETS.refocusMs;
  log(`refocus (${format}): median ${out.medianMs.toFixed(1)} ms, max ${out.maxMs.toFixed(1)} ms`);
  return out;
}

/**
 * Issue 3: `espalier diff` of two 1M-node versions with 1% of the nodes changed takes at most 2.5x the
 * time of summarising one version. Per format (CSV with ids: matched by id; nested JSON: matched by
 * path), alternating children time the summary of OLD (no foci) and the diff OLD -> NEW (no foci), both
 * as the CLI runs them; the ratio is of this run's medians. Then the real CLI once, and a profile.
 */
function benchDiff() {
  if (!options.diff) return { skipped: true, reason: "--no-diff" };
  const formats = options.only.filter((f) => DIFF_FORMATS.includes(f));
  if (formats.length === 0)
    return { skipped: true, reason: `--only names none of the diff's formats (${DIFF_FORMATS.join(", ")})` };
  const base = ensureData({ nodes: options.nodes, formats: DIFF_FORMATS, log });
  const v2 = ensureDiffData({ base, force: options.forceData, log });
  const out = {
    target: TARGETS.diffTime,
    fraction: v2.params.fraction,
    seed: v2.params.seed,
    nodes: v2.nodes,
    edits: v2.edits,
    files: Object.fromEntries(DIFF_FORMATS.map((f) => [f, relative(repoRoot, v2.files[f])])),
    formats: {},
  };
  for (const format of formats) {
    const oldFile = base.files[format];
    const newFile = v2.files[format];
    warmCache(oldFile);
    warmCache(newFile);
    const runs = { summary: [], diff: [] };
    const loadBefore = loadavg()[0];
    for (let r = 0; r < options.repeat; r++) {
      const order = r % 2 === 0 ? ["summary", "diff"] : ["diff", "summary"];
      for (const kind of order) {
        const res =
          kind === "summary"
            ? child({ kind: "full", format, file: oldFile, foci: [], budget: options.budget })
            : child({ kind: "diff", format, oldFile, newFile, budget: options.budget });
        runs[kind].push(res);
        log(
          `diff ${format} ${kind} #${r + 1}: ${res.error ? `ERROR ${res.error}` : `${fmtS(res.ms)} s, ${res.maxRssMiB} MiB`}`,
        );
      }
    }
    const entry = summarizeDiffRuns(runs);
    entry.load = [loadBefore, loadavg()[0]];
    entry.expected = v2.changes[format === "csv" ? "id" : "path"];
    if (options.cli) entry.cli = runDiffCli(format, oldFile, newFile, options.budget);
    if (options.cpuProf) entry.profile = profileDiff(format, oldFile, newFile, options.budget);
    out.formats[format] = entry;
  }
  return out;
}

function summarizeDiffRuns(runs) {
  const ok = (list) => list.filter((r) => !r.error);
  const summary = ok(runs.summary);
  const diff = ok(runs.diff);
  const entry = { runs, errors: [...runs.summary, ...runs.diff].filter((r) => r.error).map((r) => r.error) };
  if (summary.length === 0 || diff.length === 0) return entry;
  entry.summaryMs = median(summary.map((r) => r.ms));
  entry.diffMs = median(diff.map((r) => r.ms));
  entry.summaryMiB = median(summary.map((r) => r.maxRssMiB));
  entry.diffMiB = median(diff.map((r) => r.maxRssMiB));
  entry.timeRatio = entry.diffMs / entry.summaryMs;
  entry.memoryRatio = entry.diffMiB / entry.summaryMiB;
  entry.summaryPhases = medianPhases(summary);
  entry.diffPhases = medianPhases(diff);
  entry.check = diff[0].check;
  entry.pass = entry.timeRatio <= TARGETS.diffTime;
  return entry;
}

/** `espalier diff OLD NEW --budget N`, once, timed from outside (start-up included). */
function runDiffCli(format, oldFile, newFile, budget) {
  const t0 = performance.now();
  const proc = spawnSync(
    process.execPath,
    [...nodeFlags(), cliScript, "diff", oldFile, newFile, "--budget", String(budget)],
    { encoding: "utf8", maxBuffer: 64 << 20 },
  );
  const ms = performance.now() - t0;
  const lines = proc.stdout ? proc.stdout.split("\n").length - 1 : 0;
  const res = { ms, exit: proc.status, lines };
  if (proc.status !== 0) res.error = proc.stderr.trim().split("\n").slice(0, 3).join(" / ");
  log(`diff ${format} cli: ${fmtS(ms)} s, exit ${proc.status}, ${lines} lines`);
  return res;
}

function profileDiff(format, oldFile, newFile, budget) {
  const dir = join(outDir, "prof");
  mkdirSync(dir, { recursive: true });
  const path = join(dir, `diff-${format}.cpuprofile`);
  const res = child({ kind: "diff", format, oldFile, newFile, budget, profile: path });
  if (res.error) return { error: res.error };
  log(`diff ${format} profile: ${relative(repoRoot, path)}`);
  return { file: relative(repoRoot, path), top: topFunctions(path, 15) };
}

// ---------------------------------------------------------------------------------------------------------
// Report

function report(r) {
  const rows = [];
  rows.push([
    "format",
    "floor s",
    "full s",
    "time x",
    "issue 2",
    "issue 4",
    "floor MiB",
    "full MiB",
    "mem x",
    "issue 4 mem",
    "CLI s",
  ]);
  for (const format of Object.keys(r.formats)) {
    const e = r.formats[format];
    if (e.timeRatio === undefined) {
      rows.push([format, "error", "", "", "", "", "", "", "", "", ""]);
      continue;
    }
    rows.push([
      format,
      fmtS(e.floorMs),
      fmtS(e.fullMs),
      e.timeRatio.toFixed(2),
      `${passMiss(e.pass.issue2Time)} <=${TARGETS.issue2Time[format].toFixed(1)}`,
      `${passMiss(e.pass.issue4Time)} <=${TARGETS.issue4Time[format].toFixed(1)}`,
      e.floorMiB.toFixed(0),
      e.fullMiB.toFixed(0),
      e.memoryRatio.toFixed(2),
      `${passMiss(e.pass.issue4Memory)} <=${TARGETS.issue4Memory[format].toFixed(1)}`,
      e.cli ? (e.cli.error ? "error" : fmtS(e.cli.ms)) : "-",
    ]);
  }
  const lines = [];
  const n = r.data.nodes.toLocaleString("en-US");
  lines.push("");
  lines.push(
    `espalier bench: ${n} nodes, budget ${r.options.budget}, median of ${r.options.repeat}, ${r.node} ${r.platform}`,
  );
  lines.push(`(peak RSS includes Node's own ${r.baseline.maxRssMiB} MiB; ratios are full / floor)`);
  const busy = Math.max(r.loadBefore, r.loadAfter);
  if (busy > r.cpus / 2)
    lines.push(
      `warning: the machine was busy (1-min load ${busy.toFixed(1)} on ${r.cpus} CPUs); times are noisy`,
    );
  if (rows.length > 1) {
    lines.push("");
    lines.push(...table(rows));
    lines.push("");
    lines.push("where the full time goes (median ms):");
  }
  for (const format of Object.keys(r.formats)) {
    const e = r.formats[format];
    if (e.fullPhases) {
      const fl = Object.entries(e.floorPhases)
        .map(([k, v]) => `${k} ${v.toFixed(0)}`)
        .join(", ");
      const fu = Object.entries(e.fullPhases)
        .map(([k, v]) => `${k} ${v.toFixed(0)}`)
        .join(", ");
      lines.push(`  ${format.padEnd(6)} full: ${fu}   | floor: ${fl}`);
    }
    for (const err of e.errors ?? []) lines.push(`  ${format.padEnd(6)} ERROR ${err}`);
    if (e.cli?.error) lines.push(`  ${format.padEnd(6)} CLI ERROR ${e.cli.error}`);
    if (e.check && e.check.nodes !== r.data.nodes)
      lines.push(`  ${format.padEnd(6)} note: loaded ${e.check.nodes} nodes, generated ${r.data.nodes}`);
  }
  const rf = r.refocus;
  if (rf) {
    lines.push("");
    if (rf.error) lines.push(`re-focus (${rf.format}): ERROR ${rf.error}`);
    else
      lines.push(
        `re-focus (${rf.format}, ${rf.calls} calls of summarize() on one loaded tree): median ${rf.medianMs.toFixed(1)} ms, ` +
          `max ${rf.maxMs.toFixed(1)} ms (first ${rf.firstMs.toFixed(1)} ms)   ${passMiss(rf.pass)} <=${TARGETS.refocusMs} ms each`,
      );
  }
  lines.push("");
  lines.push(...diffReport(r.diff));
  for (const format of Object.keys(r.formats)) {
    const p = r.formats[format].profile;
    if (!p) continue;
    lines.push("");
    if (p.error) {
      lines.push(`profile ${format}: ERROR ${p.error}`);
      continue;
    }
    lines.push(`profile ${format} (${p.file}), top self time:`);
    for (const t of p.top)
      lines.push(
        `  ${t.selfMs.toFixed(0).padStart(6)} ms ${t.percent.toFixed(1).padStart(5)}%  ${t.name}  ${t.where}`,
      );
  }
  for (const [format, e] of Object.entries(r.diff.formats ?? {})) {
    const p = e.profile;
    if (!p) continue;
    lines.push("");
    if (p.error) {
      lines.push(`profile diff ${format}: ERROR ${p.error}`);
      continue;
    }
    lines.push(`profile diff ${format} (${p.file}), top self time:`);
    for (const t of p.top)
      lines.push(
        `  ${t.selfMs.toFixed(0).padStart(6)} ms ${t.percent.toFixed(1).padStart(5)}%  ${t.name}  ${t.where}`,
      );
  }
  lines.push("");
  return lines.join("\n");
}

function diffReport(d) {
  if (d.skipped) return [`diff: skipped (${d.reason})`];
  const lines = [];
  const n = d.nodes.old.toLocaleString("en-US");
  lines.push(
    `diff (issue 3): ${n} -> ${d.nodes.new.toLocaleString("en-US")} nodes, ${(d.fraction * 100).toFixed(0)}% changed; ` +
      "summary = OLD alone, no foci; diff = OLD -> NEW, no foci; ratio diff / summary",
  );
  const rows = [
    [
      "format",
      "matched",
      "summary s",
      "diff s",
      "diff x",
      "issue 3",
      "summary MiB",
      "diff MiB",
      "mem x",
      "CLI s",
      "load 1m",
    ],
  ];
  for (const [format, e] of Object.entries(d.formats)) {
    if (e.timeRatio === undefined) {
      rows.push([format, "error", "", "", "", "", "", "", "", "", ""]);
      continue;
    }
    rows.push([
      format,
      `by ${e.check.by}`,
      fmtS(e.summaryMs),
      fmtS(e.diffMs),
      e.timeRatio.toFixed(2),
      `${passMiss(e.pass)} <=${d.target.toFixed(1)}`,
      e.summaryMiB.toFixed(0),
      e.diffMiB.toFixed(0),
      e.memoryRatio.toFixed(2),
      e.cli ? (e.cli.error ? "error" : fmtS(e.cli.ms)) : "-",
      e.load.map((l) => l.toFixed(1)).join("-"),
    ]);
  }
  lines.push(...table(rows));
  const phases = (p) =>
    Object.entries(p)
      .map(([k, v]) => `${k} ${v.toFixed(0)}`)
      .join(", ");
  for (const [format, e] of Object.entries(d.formats)) {
    if (e.diffPhases) {
      lines.push(
        `  ${format.padEnd(6)} diff: ${phases(e.diffPhases)}   | summary: ${phases(e.summaryPhases)} (ms)`,
      );
      const got = e.check.changes;
      const same = Object.keys(e.expected).every((k) => got[k] === e.expected[k]);
      const counts = (c) =>
        Object.entries(c)
          .map(([k, v]) => `${v} ${k}`)
          .join(", ");
      lines.push(
        `  ${format.padEnd(6)} changes: ${counts(got)}${same ? " (as made)" : `; MADE ${counts(e.expected)}`}`,
      );
    }
    for (const err of e.errors ?? []) lines.push(`  ${format.padEnd(6)} ERROR ${err}`);
    if (e.cli?.error) lines.push(`  ${format.padEnd(6)} CLI ERROR ${e.cli.error}`);
  }
  return lines;
}

function table(rows) {
  const widths = rows[0].map((_, c) => Math.max(...rows.map((row) => String(row[c]).length)));
  const line = (row) =>
    row.map((cell, c) => (c === 0 ? cell.padEnd(widths[c]) : cell.padStart(widths[c]))).join("  ");
  return [line(rows[0]), widths.map((w) => "-".repeat(w)).join("  "), ...rows.slice(1).map(line)];
}

function passMiss(ok) {
  return ok ? "PASS" : "MISS";
}

function fmtS(ms) {
  return (ms / 1000).toFixed(2);
}

function median(values) {
  const s = [...values].sort((a, b) => a - b);
  const mid = s.length >> 1;
  return s.length % 2 === 1 ? s[mid] : (s[mid - 1] + s[mid]) / 2;
}

/** Reads a file once so every timed run starts with it in the page cache (first or not). */
function warmCache(file) {
  const fd = openSync(file, "r");
  const buf = Buffer.allocUnsafe(8 << 20);
  while (readSync(fd, buf, 0, buf.length, null) > 0);
  closeSync(fd);
}

function parseArgs(argv) {
  const o = {
    nodes: 1_000_000,
    only: FORMATS,
    repeat: 3,
    budget: 40,
    calls: 20,
    heap: undefined,
    cpuProf: false,
    cli: true,
    diff: true,
    diffOnly: false,
    forceData: false,
  };
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    const value = () => {
      const v = argv[++i];
      if (v === undefined) usage(`${a} needs a value`);
      return v;
    };
    const count = () => {
      const v = Number(value().replace(/_/g, ""));
      if (!Number.isInteger(v) || v < 1) usage(`${a} needs a whole number >= 1`);
      return v;
    };
    if (a === "--nodes") o.nodes = count();
    else if (a === "--only") {
      const list = value().split(",");
      for (const f of list)
        if (!FORMATS.includes(f) && f !== "diff")
          usage(`--only: unknown format ${f} (${FORMATS.join(",")},diff)`);
      // "diff" in the list: only the diff benchmark, for the listed formats it covers (all when none).
      o.diffOnly = list.includes("diff");
      o.only = list.filter((f) => f !== "diff");
      if (o.diffOnly && o.only.length === 0) o.only = [...DIFF_FORMATS];
      if (o.diffOnly && !o.only.some((f) => DIFF_FORMATS.includes(f)))
        usage(`--only diff: the diff covers ${DIFF_FORMATS.join(", ")}`);
    } else if (a === "--repeat") o.repeat = count();
    else if (a === "--budget") o.budget = count();
    else if (a === "--calls") o.calls = count();
    else if (a === "--heap") o.heap = count();
    else if (a === "--cpu-prof") o.cpuProf = true;
    else if (a === "--no-cli") o.cli = false;
    else if (a === "--no-diff") o.diff = false;
    else if (a === "--force-data") o.forceData = true;
    else usage(`unknown option ${a}`);
  }
  return o;
}

function usage(message) {
  log(`bench: ${message}`);
  log(
    "usage: npm run bench -- [--nodes N] [--only json,csv,paths,diff] [--repeat N] [--budget N] [--calls N] [--heap MiB] [--cpu-prof] [--no-cli] [--no-diff] [--force-data]",
  );
  process.exit(2);
}
