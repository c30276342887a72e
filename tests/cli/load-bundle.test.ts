import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
// @ts-expect-error: a CommonJS script of the launcher, without types
import { buildId, loadBundle } from "../../bin/load-bundle.js";

const dir = mkdtempSync(join(tmpdir(), "espalier-bundle-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** A bundle as scripts/bundle.js writes one: the build id line, then CommonJS code. */
function writeBundle(name: string, id: string, answer: number): string {
  const file = join(dir, name);
  writeFileSync(file, `//build:${id}\nmodule.exports = { answer: () => ${answer}, file: __filename };\n`);
  return file;
}

/** Its code cache as scripts/bundle.js writes it: the build id, a newline, V8's cache. */
function writeCache(file: string, id: string): void {
  const { script } = loadBundle(file);
  writeFileSync(`${file}.cache`, Buffer.concat([Buffer.from(`${id}\n`), script.createCachedData()]));
}

describe("loadBundle(file) (bin/load-bundle.js)", () => {
  it("runs the file as CommonJS and uses the cache made from that very file", () => {
    const file = writeBundle("a.cjs", "0a1b", 41);
    writeCache(file, "0a1b");
    const loaded = loadBundle(file);
    expect(loaded.exports.answer()).toBe(41);
    expect(loaded.exports.file).toBe(file);
    expect(loaded.cacheUsed).toBe(true);
  });

  it("never runs a cache made from another build: same length, other code, other id", () => {
    // V8 checks a code cache against the source's length, not its text: a cache left from an earlier
    // build of the same length would run the old code. The build id is what tells them apart.
    const file = writeBundle("b.cjs", "0a1b", 41);
    writeCache(file, "0a1b");
    const cache = readFileSync(`${file}.cache`);
    writeBundle("b.cjs", "0a1c", 42);
    writeFileSync(`${file}.cache`, cache);
    const loaded = loadBundle(file);
    expect(loaded.exports.answer()).toBe(42);
    expect(loaded.cacheUsed).toBe(false);
  });

  it("runs without a cache, and without a build id", () => {
    const file = join(dir, "c.cjs");
    writeFileSync(file, "module.exports = { answer: () => 7 };\n");
    expect(buildId(readFileSync(file, "utf8"))).toBeUndefined();
    const loaded = loadBundle(file);
    expect(loaded.exports.answer()).toBe(7);
    expect(loaded.cacheUsed).toBe(false);
  });
});

describe("dist/bundle/espalier.cjs (npm run build)", () => {
  it("carries a build id, and its cache is accepted by this engine", () => {
    const bundle = new URL("../../dist/bundle/espalier.cjs", import.meta.url).pathname;
    expect(buildId(readFileSync(bundle, "utf8"))).toMatch(/^[0-9a-f]{32}$/);
    const loaded = loadBundle(bundle);
    expect(typeof loaded.exports.run).toBe("function");
    expect(loaded.cacheUsed).toBe(true);
  });

  it("is ASCII only, so the engine holds it as a one-byte string", () => {
    const bundle = readFileSync(new URL("../../dist/bundle/espalier.cjs", import.meta.url));
    expect(bundle.findIndex((byte) => byte > 0x7f)).toBe(-1);
  });
});
