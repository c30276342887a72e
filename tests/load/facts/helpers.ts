import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll } from "vitest";
import { type Engine, openEngine } from "../../../src/load/facts/engine.js";
import type { FactFormat, FactOptions } from "../../../src/load/facts/fact-options.js";
import { loadFactTable } from "../../../src/load/facts/load-facts.js";
import type { Tree } from "../../../src/model/tree.js";

/** A temporary folder, removed after the file's tests. */
export function scratchDir(): string {
  const dir = mkdtempSync(join(tmpdir(), "espalier-facts-"));
  afterAll(() => rmSync(dir, { recursive: true, force: true }));
  return dir;
}

/** Runs `fn` with a fresh engine instance, closed afterwards. */
export async function withEngine<T>(fn: (engine: Engine) => Promise<T>): Promise<T> {
  const engine = await openEngine();
  try {
    return await fn(engine);
  } finally {
    engine.close();
  }
}

export function levelsOptions(levels: string[], sizeField: string): FactOptions {
  return { levels, keyField: undefined, separator: "/", sizeField, table: "facts" };
}

export function keyOptions(keyField: string, sizeField: string, separator = "/"): FactOptions {
  return { levels: [], keyField, separator, sizeField, table: "facts" };
}

export function loadFacts(
  file: string,
  format: FactFormat,
  facts: FactOptions,
  extra: { rolledUp?: boolean; keepFields?: string[] } = {},
): Promise<Tree> {
  return loadFactTable({
    file,
    format,
    facts,
    rolledUp: extra.rolledUp ?? false,
    rootName: "facts",
    keepFields: extra.keepFields ?? ["rows"],
    maxNodes: Number.POSITIVE_INFINITY,
  });
}

/** A SQL string literal. */
export function lit(text: string): string {
  return `'${text.replaceAll("'", "''")}'`;
}

/** Every node of a tree as `path -> [rows, subtree size]`, paths joined with "/" (names are plain here). */
export function nodeTable(tree: Tree): Map<string, [number, number]> {
  const paths: string[] = new Array(tree.length);
  const size = Float64Array.from(tree.ownSize);
  for (let i = tree.length - 1; i > 0; i--) size[tree.parent[i]] += size[i];
  const out = new Map<string, [number, number]>();
  const rows = tree.fields.get("rows");
  for (let i = 0; i < tree.length; i++) {
    paths[i] = i === 0 ? "" : `${paths[tree.parent[i]]}/${tree.name.get(i)}`;
    out.set(paths[i], [rows ? Number(rows[i]) : Number.NaN, size[i]]);
  }
  return out;
}
