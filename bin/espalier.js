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
  const { run, openFile, loadInWorker } = cli;
  // A reader closing the pipe early ends us quietly.
  process.stdout.on("error", (err) => {
    if (err.code === "EPIPE") process.exit(0);
    throw err;
  });
  process.exitCode = await run(args, {
    stdout: process.stdout,
    stderr: process.stderr,
    readStdin,
    readFile: (path) => readFile(path),
    openInput: (name) => (name === "-" ? openStdin() : openFile(name)),
    loadInWorker,
    now: () => performance.now(),
    env: process.env,
  });
}

async function readStdin() {
  const chunks = [];
  for await (const chunk of process.stdin) chunks.push(chunk);
  return Buffer.concat(chunks);
}

/** Standard input in the chunks it comes in, with its size when it is a regular file. */
function openStdin() {
  let size;
  try {
    const stat = fstatSync(0);
    if (stat.isFile()) size = stat.size;
  } catch {
    // Unknown size.
  }
  return { size, chunks: process.stdin };
}
