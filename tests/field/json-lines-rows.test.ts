import { execFileSync } from "node:child_process";
import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

// Field test: an export of rows as JSON Lines (one object a line, jsonlines.org), each with an id and a
// parent, as a database or an HR system writes one. Detected as JSON, it stops at line 2 (RFC 8259: one
// JSON text), and the message named only --input-format jsonl with --levels, a fact table's reading,
// which has no way to link an id to a parent. It now names the sed that makes the lines one array,
// which reads as JSON rows. The check: JSON.parse of each line (ECMA-262) for the count and the sizes.
const hasSed = (() => {
  try {
    return execFileSync("sed", ["s/a/b/"], { input: "a", encoding: "utf8" }) === "b";
  } catch {
    return false;
  }
})();

// An invented kite maker's cost centres; a blank line at the end, as exports often have.
const exported = [
  '{"id": "k1", "parent": null, "name": "Skyward Kites", "size": 0}',
  '{"id": "k2", "parent": "k1", "name": "Sails", "size": 5200}',
  '{"id": "k3", "parent": "k1", "name": "Frames", "size": 7100}',
  '{"id": "k4", "parent": "k3", "name": "Spars", "size": 1100}',
  "",
  "",
].join("\n");

describe("JSON Lines of rows linked by id and parent", () => {
  it.skipIf(!hasSed)(
    "is PARSE_JSON at line 2 naming the sed that makes them JSON rows, which read",
    async () => {
      const r = await cli(["-"], { stdin: exported });
      expect(r.code).toBe(2);
      expect(r.stderr).toMatch(/^espalier: <stdin>:2:1: .*\[PARSE_JSON\]\n$/);
      const named =
        /read as rows once they are one array: (sed .*) \| (sed .*) \| espalier - --input-format rows/.exec(
          r.stderr,
        );
      expect(named).not.toBeNull();
      const [, first, second] = named!;
      const array = execFileSync("sh", ["-c", `${first.replace("FILE", "")} | ${second}`], {
        input: exported,
        encoding: "utf8",
      });
      const read = await cli(["-", "--input-format", "rows", "--format", "json"], { stdin: array });
      expect(read.code, read.stderr).toBe(0);
      const records = exported
        .split("\n")
        .filter((line) => line.trim() !== "")
        .map((line) => JSON.parse(line) as { size: number });
      const doc = JSON.parse(read.stdout);
      expect(doc.totals).toEqual({ nodes: records.length, size: records.reduce((s, x) => s + x.size, 0) });
      expect(doc.input.linkedBy).toEqual(["id", "parent"]);
    },
  );
});
