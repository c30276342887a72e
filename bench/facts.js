// espalier's fact-table benchmark (issue 17): the summary of a generated table against the engine's own
// bare query over the same file, both timed in this run (ratios, not absolute times, are what compare
// on a shared machine), and espalier's peak memory taken from outside (GNU time, the largest process of
// the tree, the engine inside included). Generates its data with the engine under bench/out/facts/,
// never committed. Informs; never gates.
// Usage: npm run bench -- --facts [--inventory-rows N] [--cost-rows N] [--only-facts inventory,costs]
//                                  [--force-data] [--no-group-floor]
// The inventory has 10M rows unless asked: the issue's 100M-row run is opt-in (--inventory-rows 100000000:
// 1.8 GB of Parquet, tens of GB of the engine's spill files under the system's temporary directory, and an
// hour or more of a loaded 2-core machine).

import { spawnSync } from "node:child_process";
import { existsSync, mkdirSync, renameSync, statSync, writeFileSync } from "node:fs";
import { cpus, loadavg, tmpdir } from "node:os";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";

const benchDir = dirname(fileURLToPath(import.meta.url));
const repoRoot = join(benchDir, "..");
const dataDir = join(benchDir, "out", "facts");
const cliScript = join(repoRoot, "bin", "espalier.js");
const TIME = "/usr/bin/time";
const log = (s) => process.stderr.write(`${s}\n`);

/** Targets from issue 17. */
const TARGETS = {
  /** 100M-row Parquet inventory, two foci: summary / engine's bare count(*), sum(size). */
  inventoryTime: 3,
  /** Peak memory of that summary, MiB. */
  inventoryPeakMiB: 2048,
  /** 10M-row cost CSV, four levels: summary / engine's bare scan. */
  costTime: 2,
};

export async function benchFacts(argv) {
  const o = {
    inventoryRows: 10_000_000,
    costRows: 10_000_000,
    only: ["inventory", "costs"],
    force: false,
    groupFloor: true,
    budget: 40,
  };
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    const n = () => Number(String(argv[++i]).replace(/_/g, ""));
    if (a === "--inventory-rows") o.inventoryRows = n();
    else if (a === "--cost-rows") o.costRows = n();
    else if (a === "--only-facts") o.only = String(argv[++i]).split(",");
    else if (a === "--force-data") o.force = true;
    else if (a === "--no-group-floor") o.groupFloor = false;
  }
  mkdirSync(dataDir, { recursive: true });
  const results = {
    when: new Date().toISOString(),
    cpus: cpus().length,
    loadBefore: loadavg()[0],
    targets: TARGETS,
  };
  if (o.only.includes("costs")) results.costs = await benchCosts(o);
  if (o.only.includes("inventory")) results.inventory = await benchInventory(o);
  results.loadAfter = loadavg()[0];
  writeFileSync(join(benchDir, "out", "facts.json"), `${JSON.stringify(results, null, 2)}\n`);
  log(`bench facts: wrote bench/out/facts.json`);
  return results;
}

/** The inventory: keys 5 to 12 levels deep (bucket/family/station/year, 0 to 7 more levels, object). */
async function benchInventory(o) {
  const file = join(dataDir, `inventory-${o.inventoryRows}.parquet`);
  if (o.force || !existsSync(file)) {
    log(`bench facts: generating ${o.inventoryRows} inventory rows in ${file} (once)…`);
    const extra = [
      "'/m' || ((i // 3) % 12)",
      "'/d' || ((i // 5) % 28)",
      "'/h' || ((i // 7) % 6)",
      "'/run-' || ((i // 11) % 4)",
      "'/part-' || ((i // 13) % 3)",
      "'/seg-' || ((i // 17) % 2)",
      "'/v' || ((i // 19) % 2)",
    ];
    const levels = extra.map((e, k) => `CASE WHEN h > ${k} THEN ${e} ELSE '' END`).join(" || ");
    await generate(
      `COPY (SELECT 'b' || (i % 8) || '/f' || ((i // 8) % 20) || '/s' || ((i // 160) % 50) || ` +
        `'/y' || (2028 + (i // 8000) % 4) || ${levels} || '/o' || i || '.dat' AS key, ` +
        "(i * 2654435761) % 1000000 AS size " +
        `FROM (SELECT i, (i * 40503) % 8 AS h FROM range(${o.inventoryRows}) AS t(i))) ` +
        "TO '__FILE__' (FORMAT parquet)",
      file,
    );
  }
  const bare = await engineTime(`SELECT count(*), sum(size) FROM read_parquet('${file}')`);
  // Reading the key column at all: the bare query reads only the size column (Parquet is stored by
  // column), and no summary of a key hierarchy can skip the keys.
  const keyScan = await engineTime(`SELECT count(*), sum(length(key)) FROM read_parquet('${file}')`);
  // The least the engine must do for exact node counts: group the rows by their key (one group per
  // distinct key); reported beside the target's ratio, not instead of it.
  const grouped = o.groupFloor
    ? await engineTime(
        `SELECT count(*) FROM (SELECT key, count(*), sum(size) FROM read_parquet('${file}') GROUP BY key)`,
      )
    : { ms: Number.NaN, cpuMs: Number.NaN };
  // Whether the file is in key order, from each row group's smallest and largest key (the file's
  // metadata): a row group that starts below the largest key of the one before breaks the order.
  const order = await engineTime(
    "SELECT count(*) FILTER (WHERE previous_max > stats_min), count(*) FROM (SELECT stats_min, " +
      "lag(stats_max) OVER (ORDER BY row_group_id) AS previous_max " +
      `FROM parquet_metadata('${file}') WHERE path_in_schema = 'key')`,
  );
  const foci = ["b1/f3/s43", "b6/f11"];
  const args = [file, "--key-field", "key", "--budget", String(o.budget), "--color", "never"];
  for (const f of foci) args.push("--focus", f);
  const run = timed(args);
  const out = {
    file,
    bytes: statSync(file).size,
    rows: o.inventoryRows,
    foci,
    rowGroupsBelowThePrevious: Number(order.values[0]),
    rowGroups: Number(order.values[1]),
    engineBareMs: bare.ms,
    engineKeyScanMs: keyScan.ms,
    engineGroupByKeyMs: grouped.ms,
    engineBareCpuMs: bare.cpuMs,
    engineKeyScanCpuMs: keyScan.cpuMs,
    engineGroupCpuMs: grouped.cpuMs,
    summary: run,
    timeRatio: round(run.ms / bare.ms),
    keyScanRatio: round(run.ms / keyScan.ms),
    groupRatio: round(run.ms / grouped.ms),
    cpuRatio: round(run.cpuMs / bare.cpuMs),
    cpuKeyScanRatio: round(run.cpuMs / keyScan.cpuMs),
    cpuGroupRatio: round(run.cpuMs / grouped.cpuMs),
    targetTime: TARGETS.inventoryTime,
    targetPeakMiB: TARGETS.inventoryPeakMiB,
  };
  log(
    `bench facts: inventory ${o.inventoryRows} rows: engine bare count/sum ${bare.ms} ms; espalier ` +
      `${run.ms} ms (${out.timeRatio}x, target ${TARGETS.inventoryTime}x; ${out.keyScanRatio}x the engine's ` +
      `scan of the keys, ${keyScan.ms} ms; ${out.groupRatio}x its GROUP BY key alone, ${grouped.ms} ms); ` +
      `CPU ${run.cpuMs} ms against ${bare.cpuMs} ms bare (${out.cpuRatio}x), ${keyScan.cpuMs} ms key scan ` +
      `(${out.cpuKeyScanRatio}x) and ${grouped.cpuMs} ms grouped (${out.cpuGroupRatio}x), peak ${run.maxRssMiB} MiB ` +
      `(target < ${TARGETS.inventoryPeakMiB}); ${out.rowGroupsBelowThePrevious} of ${out.rowGroups} row groups ` +
      `start below the previous one's largest key${run.error ? `; ERROR ${run.error}` : ""}`,
  );
  return out;
}

/** The cost export: account (12), service (40), region (6), usage (5), day, cost. */
async function benchCosts(o) {
  const file = join(dataDir, `costs-${o.costRows}.csv`);
  if (o.force || !existsSync(file)) {
    log(`bench facts: generating ${o.costRows} cost rows in ${file} (once)…`);
    await generate(
      "COPY (SELECT 'acct-' || (i % 12) AS account, 'svc-' || ((i // 12) % 40) AS service, " +
        "'region-' || ((i // 480) % 6) AS region, 'usage-' || ((i // 2880) % 5) AS usage, " +
        "DATE '2031-01-01' + CAST((i // 14400) % 365 AS INTEGER) AS day, " +
        `(i * 2654435761) % 5000 AS cost FROM range(${o.costRows}) AS t(i)) ` +
        "TO '__FILE__' (FORMAT csv, HEADER)",
      file,
    );
  }
  // The bare scan reads the file as espalier's view does (cells as text under the header's names).
  const columns =
    "{'account': 'VARCHAR', 'service': 'VARCHAR', 'region': 'VARCHAR', 'usage': 'VARCHAR', 'day': 'VARCHAR', 'cost': 'VARCHAR'}";
  const bare = await engineTime(
    `SELECT count(*), sum(CAST(cost AS DOUBLE)) FROM read_csv('${file}', header = true, auto_detect = false, columns = ${columns})`,
  );
  // The engine's own finest grouping over the four levels (what any exact rollup must do first).
  const grouped = await engineTime(
    `SELECT count(*) FROM (SELECT account, service, region, usage, count(*), sum(CAST(cost AS DOUBLE)) ` +
      `FROM read_csv('${file}', header = true, auto_detect = false, columns = ${columns}) ` +
      "GROUP BY account, service, region, usage)",
  );
  const args = [
    file,
    "--levels",
    "account,service,region,usage",
    "--size-field",
    "cost",
    "--budget",
    String(o.budget),
    "--color",
    "never",
  ];
  const run = timed(args);
  const out = {
    file,
    bytes: statSync(file).size,
    rows: o.costRows,
    engineBareMs: bare.ms,
    engineGroupMs: grouped.ms,
    engineBareCpuMs: bare.cpuMs,
    engineGroupCpuMs: grouped.cpuMs,
    summary: run,
    timeRatio: round(run.ms / bare.ms),
    groupRatio: round(run.ms / grouped.ms),
    cpuRatio: round(run.cpuMs / bare.cpuMs),
    cpuGroupRatio: round(run.cpuMs / grouped.cpuMs),
    targetTime: TARGETS.costTime,
  };
  log(
    `bench facts: costs ${o.costRows} rows: engine bare scan ${bare.ms} ms; espalier ${run.ms} ms ` +
      `(${out.timeRatio}x, target ${TARGETS.costTime}x; engine's own GROUP BY of the levels ${grouped.ms} ms, ` +
      `${out.groupRatio}x); CPU ${run.cpuMs} ms against ${bare.cpuMs} ms bare (${out.cpuRatio}x) and ` +
      `${grouped.cpuMs} ms grouped (${out.cpuGroupRatio}x), peak ${run.maxRssMiB} MiB` +
      `${run.error ? `; ERROR ${run.error}` : ""}`,
  );
  return out;
}

async function generate(sql, file) {
  const { DuckDBInstance } = await import("@duckdb/node-api");
  const db = await DuckDBInstance.create(":memory:");
  const c = await db.connect();
  const part = `${file}.part`;
  await c.run(sql.replace("__FILE__", part));
  c.closeSync();
  db.closeSync();
  renameSync(part, file);
}

/** The engine's own time for one query, in a fresh instance (opening excluded). */
async function engineTime(sql) {
  const { DuckDBInstance } = await import("@duckdb/node-api");
  // The memory cap espalier gives the engine (load-facts.ts): a grouping of 100M keys uncapped grows to
  // over 10 GB on this machine, which other work shares.
  const db = await DuckDBInstance.create(":memory:", { memory_limit: "1GB", temp_directory: tmpdir() });
  const c = await db.connect();
  const t0 = performance.now();
  const cpu0 = process.cpuUsage();
  const r = await c.runAndReadAll(sql);
  const ms = Math.round(performance.now() - t0);
  // The engine's threads run inside this process: its CPU time is the query's (a loaded machine
  // stretches wall time, CPU time much less).
  const cpu = process.cpuUsage(cpu0);
  const cpuMs = Math.round((cpu.user + cpu.system) / 1000);
  const values = r.getRowsJS()[0].map(String);
  c.closeSync();
  db.closeSync();
  return { ms, cpuMs, values };
}

/** The command line on `args`: wall time, exit, lines, and the peak RSS GNU time reports. */
function timed(args) {
  const t0 = performance.now();
  const proc = spawnSync(TIME, ["-v", process.execPath, cliScript, ...args], {
    encoding: "utf8",
    maxBuffer: 64 << 20,
  });
  const ms = Math.round(performance.now() - t0);
  const err = proc.stderr ?? "";
  const at = err.lastIndexOf("\tCommand being timed:");
  const peak = /Maximum resident set size \(kbytes\): (\d+)/.exec(at === -1 ? "" : err.slice(at));
  const exit = /Exit status: (\d+)/.exec(at === -1 ? "" : err.slice(at));
  const seconds = (what) =>
    Number(new RegExp(`${what} time \\(seconds\\): ([\\d.]+)`).exec(err.slice(at))?.[1]);
  const res = {
    ms,
    exit: exit ? Number(exit[1]) : proc.status,
    lines: (proc.stdout ?? "").split("\n").length - 1,
    maxRssMiB: peak ? Math.round(Number(peak[1]) / 102.4) / 10 : null,
    cpuMs: at === -1 ? null : Math.round((seconds("User") + seconds("System")) * 1000),
    command: `espalier ${args.join(" ")}`,
  };
  if (res.exit !== 0)
    res.error = (at === -1 ? err : err.slice(0, at)).trim().split("\n").slice(0, 3).join(" / ");
  else res.firstLines = proc.stdout.split("\n").slice(0, 4);
  return res;
}

function round(x) {
  return Math.round(x * 100) / 100;
}

if (process.argv[1] === fileURLToPath(import.meta.url)) await benchFacts(process.argv.slice(2));
