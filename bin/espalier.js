#!/usr/bin/env node
"use strict";
// The edge: real streams, files, environment and engine. A CommonJS script (bin/package.json), so a
// run never starts the engine's ES module loader: that alone is a good part of a small run (issue 14).
const { fstatSync, statSync } = require("node:fs");
const { readFile } = require("node:fs/promises");
const { totalmem } = require("node:os");
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
      env: { ...process.env, [RESTARTED]: String(mib) },
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
  const { run, openFile, loadInWorker, standardStreams } = cli;
  // Output that cannot be written ends us with status 2 and one line; a reader closing the pipe early
  // (| head) ends us quietly.
  const std = standardStreams(process);
  const code = await run(args, {
    stdout: std.stdout,
    stderr: std.stderr,
    readStdin: (bound) => readStdin(cli, bound),
    readFile: (path, bound) => (bound ? cli.readBounded(path, bound) : readFile(path)),
    openInput: (name) => (name === "-" ? openStdin(cli) : openFile(name)),
    loadInWorker,
    now: () => performance.now(),
    env: process.env,
  });
  process.exitCode = std.finish(code);
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
