import { spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";

// docs/api.md describes the public API: every name src/index.ts exports stands at the start of a code
// span in the first cell of one of its tables, and nothing else does. And every type of espalier's own
// that an exported function (or class constructor) takes is exported too, so a caller can name it: read
// from the declaration files tsc writes to dist/ (`npm test` builds first).
const read = (path: string) => readFileSync(new URL(`../../${path}`, import.meta.url), "utf8");

interface Export {
  /** The module it comes from (`./render/summary-text.js`). */
  from: string;
  /** Exported as a type only (a class exported so cannot be constructed by a caller). */
  typeOnly: boolean;
}

/** The names src/index.ts exports. */
function publicExports(): Map<string, Export> {
  const out = new Map<string, Export>();
  for (const m of read("src/index.ts").matchAll(/export (type )?\{([^}]*)\} from "([^"]+)";/g)) {
    for (const item of m[2].split(",")) {
      const typeOnly = m[1] !== undefined || item.trim().startsWith("type ");
      const words = item
        .trim()
        .replace(/^type /, "")
        .split(/\s+as\s+/);
      if (words[0] !== "") out.set(words[words.length - 1], { from: m[3], typeOnly });
    }
  }
  return out;
}

/** The declaration file (in dist/) that declares `name`, following `export { name } from` re-exports. */
function declarationsOf(name: string, from: string): string {
  const text = read(`dist/${from.replace(/^\.\//, "").replace(/\.js$/, ".d.ts")}`);
  for (const m of text.matchAll(/export (?:type )?\{([^}]*)\} from "(\.{1,2}\/[^"]+)";/g))
    if (m[1].split(",").some((item) => item.trim().replace(/^type /, "") === name)) {
      const next = new URL(m[2], `file:///${from.replace(/^\.\//, "")}`).pathname;
      return declarationsOf(name, `.${next}`);
    }
  return text;
}

/** Names at the start of the code spans in the first cell of every table row of the document. */
function documentedNames(markdown: string): Set<string> {
  const names = new Set<string>();
  for (const line of markdown.split("\n")) {
    if (!line.startsWith("| ") || line.startsWith("| ---")) continue;
    const first = line.slice(2, line.indexOf(" |", 2));
    for (const m of first.matchAll(/`([A-Za-z_$][\w$]*)/g)) names.add(m[1]);
  }
  return names;
}

/** The text between the parenthesis at `open` and its match. */
function parenthesised(text: string, open: number): string {
  let depth = 0;
  for (let k = open; k < text.length; k++) {
    if (text[k] === "(") depth++;
    else if (text[k] === ")" && --depth === 0) return text.slice(open + 1, k);
  }
  throw new Error(`no closing parenthesis after ${text.slice(open, open + 40)}`);
}

/** Parameter lists of an exported function or class constructor, as its declaration file writes them. */
function parameterLists(declarations: string, name: string, constructors: boolean): string[] {
  const lists: string[] = [];
  const fn = new RegExp(`export declare function ${name}\\b[^(]*\\(`, "g");
  for (const m of declarations.matchAll(fn))
    lists.push(parenthesised(declarations, m.index + m[0].length - 1));
  const cls = new RegExp(`export declare class ${name}\\b`).exec(declarations);
  if (cls && constructors) {
    const at = declarations.indexOf("constructor(", cls.index);
    const end = declarations.indexOf("\n}", cls.index);
    if (at >= 0 && at < end) lists.push(parenthesised(declarations, at + "constructor".length));
  }
  return lists;
}

/** Types declared in espalier's own modules that a declaration file names: imported from a relative path, or its own. */
function ownTypes(declarations: string): Set<string> {
  const own = new Set<string>();
  for (const m of declarations.matchAll(/import (?:type )?\{([^}]*)\} from "\.{1,2}\/[^"]+";/g))
    for (const item of m[1].split(",")) {
      const name = item.trim().replace(/^type /, "");
      if (name !== "") own.add(name);
    }
  for (const m of declarations.matchAll(/(?:interface|type|class) ([A-Z]\w*)/g)) own.add(m[1]);
  return own;
}

describe("docs/api.md and src/index.ts", () => {
  const exported = publicExports();

  it("docs/api.md's tables name exactly the exports of src/index.ts", () => {
    const documented = documentedNames(read("docs/api.md"));
    expect(exported.size).toBeGreaterThan(50);
    const undocumented = [...exported.keys()].filter((n) => !documented.has(n)).sort();
    const unexported = [...documented].filter((n) => !exported.has(n)).sort();
    expect(undocumented, "exported, not in docs/api.md").toEqual([]);
    expect(unexported, "in docs/api.md, not exported").toEqual([]);
  });

  it("every type of espalier's own that an exported function or constructor takes is exported", () => {
    const missing: string[] = [];
    let checked = 0;
    for (const [name, { from, typeOnly }] of exported) {
      const declarations = declarationsOf(name, from);
      const own = ownTypes(declarations);
      for (const list of parameterLists(declarations, name, !typeOnly)) {
        checked++;
        for (const m of list.matchAll(/\b[A-Z]\w*\b/g))
          if (own.has(m[0]) && !exported.has(m[0])) missing.push(`${name} takes ${m[0]}`);
      }
    }
    expect(checked).toBeGreaterThan(30);
    expect([...new Set(missing)].sort()).toEqual([]);
  });
});

describe("docs/api.md's example", () => {
  it("runs as written from the project's folder, importing the package by its name, and prints two summaries", () => {
    const page = read("docs/api.md").split("\n");
    const open = page.indexOf("```js");
    const close = page.indexOf("```", open + 1);
    expect(open, "docs/api.md has a js example").toBeGreaterThan(0);
    // A module in the project's folder: "espalier" resolves to the package itself (its "exports").
    const dir = mkdtempSync(join(fileURLToPath(new URL("../../", import.meta.url)), ".api-example-"));
    try {
      const file = join(dir, "example.mjs");
      writeFileSync(file, page.slice(open + 1, close).join("\n"));
      const r = spawnSync(process.execPath, [file], {
        cwd: fileURLToPath(new URL("../../", import.meta.url)),
        encoding: "utf8",
      });
      expect(r.stderr).toBe("");
      expect(r.status).toBe(0);
      // Two foci, budget 20 each: each summary's tree lines start at the root's line.
      const roots = r.stdout
        .split("\n")
        .filter((line) => /^[:.*] Rosa Istrian, Chief Executive Officer/.test(line));
      expect(roots.length).toBe(2);
      expect(r.stdout).toContain("Marit Okonkwo-Lund, Staff Firmware Engineer");
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});
