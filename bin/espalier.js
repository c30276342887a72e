#!/usr/bin/env node
import { spawn } from "node:child_process";
import { fstatSync, statSync } from "node:fs";
import { readFile } from "node:fs/promises";
import { totalmem } from "node:os";
import { fileURLToPath } from "node:url";
import { getHeapStatistics } from "node:v8";

// The single-file bundle `npm run build` makes (scripts/bundle.js), or the compiled modules it is made
// of when they are newer (a plain `tsc` since), so a stale bundle never runs.
const cli = await import(freshest());
const { heapToRestartWith } = cli;

// The edge: real streams, files, environment and engine. Decided before the CLI's modules load: an input
// too big for the engine's default heap restarts the command with a larger one.
const args = process.argv.slice(2);
const RESTARTED = "ESPALIER_HEAP_RESTARTED";
const heap =
  process.env[RESTARTED] === undefined
    ? heapToRestartWith({
        heapLimit: getHeapStatistics().heap_size_limit,
        totalMemory: totalmem(),
        inputBytes: inputSizes(args),
      })
    : 0;
if (heap > 0) restart(heap);
else await main();

function freshest() {
  const bundle = new URL("../dist/bundle/espalier.js", import.meta.url);
  const modules = new URL("../dist/cli/launch.js", import.meta.url);
  try {
    if (statSync(bundle).mtimeMs >= statSync(modules).mtimeMs) return bundle.href;
  } catch {
    // No bundle (a tsc build only): the modules.
  }
  return modules.href;
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
function restart(mib) {
  const script = fileURLToPath(import.meta.url);
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
    await main();
  });
  child.on("exit", (code, signal) => {
    for (const s of signals) process.off(s, forward);
    if (signal) process.kill(process.pid, signal);
    else process.exitCode = code ?? 2;
  });
}

async function main() {
  const { run, openFile, loadInWorker, standardStreams } = cli;
  // Output that cannot be written ends us with status 2 and one line; a reader closing the pipe early
  // (| head) ends us quietly.
  const std = standardStreams(process);
  const code = await run(args, {
    stdout: std.stdout,
    stderr: std.stderr,
    readStdin,
    readFile: (path, bound) => (bound ? cli.readBounded(path, bound) : readFile(path)),
    openInput: (name) => (name === "-" ? openStdin() : openFile(name)),
    loadInWorker,
    now: () => performance.now(),
    env: process.env,
  });
  process.exitCode = std.finish(code);
}

async function readStdin(bound) {
  await terminalHint();
  if (bound) return cli.readStreamBounded(process.stdin, "-", bound);
  const chunks = [];
  for await (const chunk of process.stdin) chunks.push(chunk);
  return Buffer.concat(chunks);
}

/** When "-" is a terminal, says on standard error how to end the input, rather than wait silently. */
async function terminalHint() {
  if (process.stdin.isTTY) process.stderr.write(cli.TERMINAL_INPUT_HINT);
}

/** Standard input in the chunks it comes in, with its size when it is a regular file. */
async function openStdin() {
  await terminalHint();
  let size;
  try {
    const stat = fstatSync(0);
    if (stat.isFile()) size = stat.size;
  } catch {
    // Unknown size.
  }
  return { size, chunks: process.stdin };
}
