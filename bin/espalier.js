#!/usr/bin/env node
"use strict";
// The edge: real streams, files, environment and engine. A CommonJS script (bin/package.json), so a
// run never starts the engine's ES module loader: that alone is a good part of a small run (issue 14).
// node:fs's callbacks, not node:fs/promises: that module is not loaded by Node's own start, and loading
// it would be a good part of a small run's (issue 14).
const { fstatSync, readFile, statSync } = require("node:fs");
const { availableParallelism, loadavg, totalmem } = require("node:os");
const { getHeapStatistics } = require("node:v8");
const { loadCli } = require("./load-bundle.js");

const args = process.argv.slice(2);
const RESTARTED = "ESPALIER_HEAP_RESTARTED";

start();

async function start() {
  const cli = await loadCli();
  // An input too big for the engine's default heap restarts the command with a larger one.
  const heap =
    process.env[RESTARTED] === undefined
      ? cli.heapToRestartWith({
          heapLimit: getHeapStatistics().heap_size_limit,
          totalMemory: totalmem(),
          inputBytes: inputSizes(args),
          args,
        })
      : 0;
  if (heap > 0) restart(cli, heap);
  else await main(cli);
}

/** Sizes of the arguments that name regular files; "-" is standard input (undefined when a pipe). */
function inputSizes(argv) {
  const sizes = [];
  for (const arg of argv) {
    try {
      if (arg === "-") {
        const stat = fstatSync(0);
        if (stat.isFile()) sizes.push(stat.size);
        else if (stat.isFIFO() || stat.isSocket()) sizes.push(undefined);
      } else if (!arg.startsWith("-")) {
        const stat = statSync(arg);
        if (stat.isFile()) sizes.push(stat.size);
      }
    } catch {
      // Not a file: an option's value, a command name, or a file the CLI will report.
    }
  }
  return sizes;
}

/**
 * For the restarted (big-input) run, unless the user set them: the C library's allocator keeps freed
 * memory for reuse. glibc serves every allocation above 32 MiB with a mapping of its own and unmaps it
 * when freed, so each array a big load grows by doubling, and each array a later stage makes, comes as
 * fresh pages the kernel must fault in one by one, where a smaller input's arrays are reused: a
 * 10M-line listing took about 15% less CPU time with these, and peaked about 40% higher (freed arrays
 * stay resident; docs/performance.md, issue 14; mallopt(3): M_MMAP_MAX, M_TRIM_THRESHOLD). Other C
 * libraries ignore these variables.
 */
const ALLOCATOR = { MALLOC_MMAP_MAX_: "0", MALLOC_TRIM_THRESHOLD_: String(2 ** 40) };

/** Runs this script again with a larger heap, on the same streams; its exit (code or signal) is ours. */
function restart(cli, mib) {
  // Only a big input restarts: a small run never loads the child-process module.
  const { spawn } = require("node:child_process");
  const script = __filename;
  const child = spawn(
    process.execPath,
    [...process.execArgv, `--max-old-space-size=${mib}`, script, ...args],
    {
      stdio: "inherit",
      env: { ...ALLOCATOR, ...process.env, [RESTARTED]: String(mib) },
    },
  );
  const signals = ["SIGINT", "SIGTERM", "SIGHUP", "SIGQUIT"];
  const forward = (signal) => child.kill(signal);
  for (const signal of signals) process.on(signal, forward);
  child.on("error", async () => {
    // Could not start a second engine: run here with the default heap.
    for (const signal of signals) process.off(signal, forward);
    await main(cli);
  });
  child.on("exit", (code, signal) => {
    for (const s of signals) process.off(s, forward);
    if (signal) process.kill(process.pid, signal);
    else process.exitCode = code ?? 2;
  });
}

async function main(cli) {
  const { run, openFile, fileReadAgain, loadInWorker, standardStreams } = cli;
  // Output that cannot be written ends us with status 2 and one line; a reader closing the pipe early
  // (| head) ends us quietly.
  const std = standardStreams(process);
  const code = await run(args, {
    stdout: std.stdout,
    stderr: std.stderr,
    readStdin: (bound) => readStdin(cli, bound),
    readFile: (path, bound) => (bound ? cli.readBounded(path, bound) : readWhole(path)),
    openInput: (name) => (name === "-" ? openStdin(cli) : openFile(name)),
    readAgainAt: fileReadAgain,
    loadInWorker,
    machineLoad: () => ({ cores: availableParallelism(), load: loadavg()[0] }),
    now: () => performance.now(),
    env: process.env,
  });
  process.exitCode = std.finish(code);
}

function readWhole(path) {
  return new Promise((resolve, reject) =>
    readFile(path, (error, bytes) => (error ? reject(error) : resolve(bytes))),
  );
}

async function readStdin(cli, bound) {
  terminalHint(cli);
  if (bound) return cli.readStreamBounded(process.stdin, "-", bound);
  const chunks = [];
  for await (const chunk of process.stdin) chunks.push(chunk);
  return Buffer.concat(chunks);
}

/** When "-" is a terminal, says on standard error how to end the input, rather than wait silently. */
function terminalHint(cli) {
  if (process.stdin.isTTY) process.stderr.write(cli.TERMINAL_INPUT_HINT);
}

/** Standard input in the chunks it comes in, with its size when it is a regular file. */
async function openStdin(cli) {
  terminalHint(cli);
  let size;
  try {
    const stat = fstatSync(0);
    if (stat.isFile()) size = stat.size;
  } catch {
    // Unknown size.
  }
  return { size, chunks: process.stdin };
}
