// Bundles the command line (dist/cli/launch.js, compiled by tsc) and its worker into dist/bundle/ with
// esbuild: one minified file per entry, code used only by some runs (YAML, other output formats, the
// diff) in chunks loaded when a run needs them. Node resolves and compiles hundreds of small modules
// slowly; one file starts in a fraction of the time. Run by `npm run build` and `prepare` after tsc.
import { rmSync } from "node:fs";
import { build } from "esbuild";

const outdir = new URL("../dist/bundle/", import.meta.url).pathname;
rmSync(outdir, { recursive: true, force: true });
await build({
  entryPoints: {
    espalier: new URL("../dist/cli/launch.js", import.meta.url).pathname,
    // load-in-worker starts "./load-worker.js" next to itself: the bundle's own directory.
    "load-worker": new URL("../dist/cli/load-worker.js", import.meta.url).pathname,
  },
  outdir,
  bundle: true,
  splitting: true,
  format: "esm",
  platform: "node",
  target: "node20",
  minify: true,
  legalComments: "eof",
  // CommonJS dependencies require Node's modules: give the ES module a require of its own.
  banner: {
    js: 'import{createRequire as __espalierRequire}from"node:module";const require=__espalierRequire(import.meta.url);',
  },
  logLevel: "warning",
});
