import { readdirSync, readFileSync, statSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

// Field tests: the package.json files installed in this checkout's node_modules (written by their
// packages' authors, not here). 21 of 181 package.json files under node_modules here were read as
// the records of one field, the rest of the manifest left out: `contributors` (a list of people
// sharing the manifest's `name`), `funding`, `devEngines`, or `exports` as a listing of paths, each
// a tree of two to ten nodes, exit 0. Read as values, a document's root is its byte length (stat).
const modules = join(process.cwd(), "node_modules");
const manifests = readdirSync(modules)
  .flatMap((entry) =>
    entry.startsWith("@") ? readdirSync(join(modules, entry)).map((name) => join(entry, name)) : [entry],
  )
  .map((name) => join(modules, name, "package.json"))
  .filter((file) => {
    try {
      return statSync(file).isFile();
    } catch {
      return false;
    }
  });

describe.skipIf(manifests.length === 0)("every package.json in node_modules", () => {
  it("reads as values: every key seen, the root's size the file's length", async () => {
    for (const file of manifests) {
      const result = await cli([file, "--format", "json", "--budget", "3"]);
      expect({ file, code: result.code }).toEqual({ file, code: 0 });
      const doc = JSON.parse(result.stdout);
      expect({ file, shape: doc.input.shape }).toEqual({ file, shape: "values" });
      expect({ file, size: doc.totals.size }).toEqual({ file, size: statSync(file).size });
      // Every member of the top-level object (JSON.parse, RFC 8259) is a child of the root.
      const keys = Object.keys(JSON.parse(readFileSync(file, "utf8")));
      const children = doc.root.children.length + (doc.root.hidden?.children ?? 0);
      expect({ file, children }).toEqual({ file, children: keys.length });
    }
  });
});
