// Bundles the command line (dist/cli/launch.js, compiled by tsc) into dist/bundle/ with esbuild, and
// makes the engine's code cache for it. Node resolves and compiles hundreds of small modules slowly, and
// compiling even one big file is a good part of a small run (issue 14), so:
// - espalier.cjs: the whole command line as ONE CommonJS file. Code only some runs need (YAML, other
//   output formats, the diff, the interactive view, fact tables) stays inside it behind lazy
//   initialisers: it is compiled, never run, unless a run needs it. Its first line is its build id.
// - espalier.cjs.cache: the build id, then V8's code cache of that file, made here by running it on a
//   few tiny invented inputs so the functions a run needs are compiled already; bin/load-bundle.js uses
//   it only with the file it was made from (and V8 refuses it under another engine version or flags).
// - load-worker.js: the diff's loading thread (an ES module, started by load-in-worker next to itself).
// - engine-api-VERSION.cjs: the SQL engine's JavaScript layer (@duckdb/node-api, an optional dependency)
//   as one file, built against VERSION of its native part (@duckdb/node-bindings, left outside and found
//   at run time). The package is some 120 small modules, resolved and compiled one by one on every run
//   that reads a fact table; src/load/facts/engine.ts loads this file instead when the installed native
//   part is VERSION. Not written when the package is not installed.
// Run by `npm run build` and `prepare` after tsc.
import { createHash } from "node:crypto";
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { readFile } from "node:fs/promises";
import { createRequire } from "node:module";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { build } from "esbuild";
import { buildId, loadBundle } from "../bin/load-bundle.js";

const dist = (path) => new URL(`../dist/${path}`, import.meta.url).pathname;
const outdir = dist("bundle/");
rmSync(outdir, { recursive: true, force: true });

const common = {
  bundle: true,
  platform: "node",
  target: "node20",
  minify: true,
  legalComments: "eof",
  logLevel: "warning",
};

const bundle = `${outdir}espalier.cjs`;
await build({
  ...common,
  entryPoints: [dist("cli/launch.js")],
  outfile: bundle,
  format: "cjs",
  // The modules find files next to themselves (package.json two levels up, the worker beside them):
  // the bundle is two levels down too, and its worker is beside it.
  define: { "import.meta.url": "__espalierUrl" },
  banner: { js: 'const __espalierUrl=require("node:url").pathToFileURL(__filename).href;' },
});
const body = asciiOnly(readFileSync(bundle, "utf8"));
const id = createHash("sha256").update(body).digest("hex").slice(0, 32);
writeFileSync(bundle, `//build:${id}\n${body}`);
if (buildId(readFileSync(bundle, "utf8")) !== id)
  throw new Error("bundle.js: the build id did not read back");

await build({
  ...common,
  entryPoints: [dist("cli/load-worker.js")],
  outfile: `${outdir}load-worker.js`,
  format: "esm",
  // CommonJS dependencies require Node's modules: give the ES module a require of its own.
  banner: {
    js: 'import{createRequire as __espalierRequire}from"node:module";const require=__espalierRequire(import.meta.url);',
  },
});

// The engine's JavaScript layer, named after the native part it was built against (its own dependency,
// resolved from where it is installed, as it is resolved at run time from the bundle's folder).
const fromHere = createRequire(import.meta.url);
let engineApi;
try {
  engineApi = fromHere.resolve("@duckdb/node-api");
} catch {
  engineApi = undefined;
}
if (engineApi !== undefined) {
  const { version } = createRequire(engineApi)("@duckdb/node-bindings/package.json");
  await build({
    ...common,
    entryPoints: [engineApi],
    outfile: `${outdir}engine-api-${version}.cjs`,
    format: "cjs",
    external: ["@duckdb/node-bindings"],
  });
}

// The code cache: run the bundle here on tiny inputs of each common format, then save what V8 compiled.
const { exports: cli, script } = loadBundle(bundle);
const inputs = {
  "tiny.json": '{"name":"root","children":[{"name":"a","size":1},{"name":"b","size":2}]}',
  "tiny.csv": "id,parent,name,size\n1,,root,0\n2,1,a,1\n3,1,b,2\n",
  "tiny.paths": "0\t.\n1\t./a\n2\t./b\n",
};
// The inputs are real files in an empty folder, opened and read (the config file looked for) through
// the same functions bin/espalier.js hands the command line, so their code is in the cache too.
const home = process.cwd();
const scratch = mkdtempSync(join(tmpdir(), "espalier-bundle-"));
process.chdir(scratch);
try {
  cli.heapToRestartWith({ heapLimit: 2 ** 32, totalMemory: 2 ** 34, inputBytes: [1] });
  for (const [name, text] of Object.entries(inputs)) {
    writeFileSync(name, text);
    let out = "";
    const code = await cli.run([name, "--focus", "a"], {
      stdout: { write: (t) => (out += t) },
      stderr: { write: (t) => (out += t) },
      readStdin: async () => Buffer.alloc(0),
      readFile: (path, bound) => (bound ? cli.readBounded(path, bound) : readFile(path)),
      openInput: (file) => cli.openFile(file),
      env: {},
    });
    if (code !== 0) throw new Error(`bundle.js: the bundle failed on ${name} (exit ${code}): ${out}`);
  }
} finally {
  process.chdir(home);
  rmSync(scratch, { recursive: true, force: true });
}
writeFileSync(`${bundle}.cache`, Buffer.concat([Buffer.from(`${id}\n`), script.createCachedData()]));

/**
 * The bundle with every character past ASCII written as a `\uXXXX` escape. esbuild escapes them in
 * strings, but leaves a tagged template's text as written (the tag may read its raw form; ours never
 * do): one such character makes the engine hold the whole bundle as a two-byte string, twice the
 * memory and a slower decoding at every start. The escape means the same character in a string, a
 * template, a regular expression or a name (a code unit at a time: a pair of surrogate escapes is one
 * code point, in a `u` pattern too).
 */
function asciiOnly(text) {
  return text.replace(/[^\x00-\x7f]/g, (ch) => `\\u${ch.charCodeAt(0).toString(16).padStart(4, "0")}`);
}
