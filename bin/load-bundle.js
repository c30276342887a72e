"use strict";
const { readFileSync, statSync } = require("node:fs");
const { createRequire } = require("node:module");
const { dirname, join } = require("node:path");
const { pathToFileURL } = require("node:url");
const { Script } = require("node:vm");

// The command line's modules, from the single-file bundle `npm run build` makes (scripts/bundle.js)
// with the engine's compiled code for it (a V8 code cache, made at build time from the same file), or
// from the compiled modules when there is no bundle or a plain `tsc` made them newer, so a stale bundle
// never runs. Engine start-up is most of a small run (issue 14): the cache spares compiling the bundle.

const BUNDLE = join(__dirname, "../dist/bundle/espalier.cjs");
const MODULES = join(__dirname, "../dist/cli/launch.js");

/** The CLI's exports (dist/cli/launch.ts): from the bundle when it is there and fresh, else the modules. */
async function loadCli() {
  let fresh = false;
  try {
    fresh = statSync(BUNDLE).mtimeMs >= statSync(MODULES).mtimeMs;
  } catch {
    // No bundle (a tsc build only), or no modules: whichever is there.
    fresh = !exists(MODULES);
  }
  return fresh ? loadBundle(BUNDLE).exports : import(pathToFileURL(MODULES).href);
}

/**
 * Runs a CommonJS bundle as Node would, compiled with its code cache (`FILE.cache`) when that cache was
 * made from this very file: the cache starts with the build id the bundle's first line carries, and the
 * engine itself refuses a cache made by another engine version or with other flags (then it compiles
 * the source as usual). `script` can make a new cache (scripts/bundle.js).
 */
function loadBundle(file) {
  const source = readFileSync(file, "utf8");
  const cachedData = matchingCache(file, buildId(source));
  const script = new Script(`(function (exports, require, module, __filename, __dirname) {${source}\n})`, {
    filename: file,
    cachedData,
  });
  const module = { exports: {} };
  script.runInThisContext()(module.exports, createRequire(file), module, file, dirname(file));
  return {
    exports: module.exports,
    script,
    cacheUsed: cachedData !== undefined && !script.cachedDataRejected,
  };
}

/** The build id on the bundle's first line (`//build:ID`), or undefined. */
function buildId(source) {
  const match = /^\/\/build:([0-9a-f]+)\n/.exec(source.slice(0, 100));
  return match?.[1];
}

/** Cache file layout: the build id's bytes, a newline, then the engine's code cache. */
function matchingCache(file, id) {
  if (id === undefined) return undefined;
  let bytes;
  try {
    bytes = readFileSync(`${file}.cache`);
  } catch {
    return undefined;
  }
  const head = `${id}\n`;
  if (bytes.length <= head.length || bytes.toString("latin1", 0, head.length) !== head) return undefined;
  return bytes.subarray(head.length);
}

function exists(path) {
  try {
    statSync(path);
    return true;
  } catch {
    return false;
  }
}

module.exports = { loadCli, loadBundle, buildId };
