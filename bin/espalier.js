#!/usr/bin/env node
import { readFile } from "node:fs/promises";
import { run } from "../dist/cli/main.js";

// The edge: real streams, files and environment. A reader closing the pipe early ends us quietly.
process.stdout.on("error", (err) => {
  if (err.code === "EPIPE") process.exit(0);
  throw err;
});

async function readStdin() {
  const chunks = [];
  for await (const chunk of process.stdin) chunks.push(chunk);
  return Buffer.concat(chunks);
}

const code = await run(process.argv.slice(2), {
  stdout: process.stdout,
  stderr: process.stderr,
  readStdin,
  readFile: (path) => readFile(path),
  env: process.env,
});
process.exitCode = code;
