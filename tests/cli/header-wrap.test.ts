import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { displayWidth } from "../../src/render/display-width.js";
import { KEY_MOST_ROWS, KEY_ONE_ROW } from "../../src/render/key-line.js";
import { cli } from "../helpers/cli.js";

// A header wider than --width (a diff's counts of every kind, both versions' totals, the foci) used to
// be cut at the width, so an 80-column terminal lost the node counts and the lines used. It now wraps
// at its `; ` clauses, and the budget counts its lines in every format.
const files = readFileSync("fixtures/tidewater-files.paths", "utf8");
const edited = files
  .split("\n")
  .filter((line) => !line.includes("services/ledger/test"))
  .join("\n");

/**
 * The lines before the tree: the header, then the key from its "key: " line on (the root's line is
 * the first starting with a mark).
 */
function split(stdout: string): { header: string[]; key: string[]; tree: string[] } {
  const lines = stdout.trimEnd().split("\n");
  const root = lines.findIndex((line) => /^[.*:&] /.test(line));
  const at = lines.findIndex((line) => line.startsWith("key: "));
  const end = at < 0 ? root : at;
  return { header: lines.slice(0, end), key: lines.slice(end, root), tree: lines.slice(root) };
}

/** A diff header's kinds each with its count, in their order, however the header said them. */
function kindsListed(text: string): string {
  return text.replace(/^(diff by \w+: )([^;]*)/, (_, start: string, clause: string) => {
    const said = new Map<string, string>();
    let count = "";
    // `0 moved, renamed or edited (compared: version)`: a count stands for the kinds after it.
    for (const part of clause.split(/, | or /)) {
      const m = /^(?:([\d,]+) )?([a-z]+)(.*)$/.exec(part)!;
      count = m[1] ?? count;
      said.set(m[2], `${count} ${m[2]}${m[3]}`);
    }
    const order = ["added", "removed", "moved", "renamed", "edited", "resized", "linked", "unlinked"];
    return (
      start +
      order
        .filter((k) => said.has(k))
        .map((k) => said.get(k))
        .join(", ")
    );
  });
}

describe("a header wider than --width", () => {
  it.each([30, 44, 61, 80, 100])(
    "wraps at %i columns, whole, and the budget counts its lines",
    async (width) => {
      const args = [
        "diff",
        "fixtures/tidewater-files.paths",
        "-",
        "--budget",
        "14",
        "--focus",
        "services/ledger",
      ];
      const wide = await cli(args, { stdin: edited });
      expect(wide.code).toBe(0);
      const [full] = split(wide.stdout).header;
      const narrow = await cli([...args, "--width", String(width)], { stdin: edited });
      expect(narrow.stderr).toBe("");
      const { header, key, tree } = split(narrow.stdout);
      // The key is at least one line from 60 columns (KEY_ONE_ROW), two below, and more where those
      // cannot say all it explains (at most KEY_MOST_ROWS): the fit counts them once it has laid a
      // screen out. A budget too small for the header, the key and the foci drops the key (its spare
      // lines).
      if (key.length > 0) {
        expect(key.length).toBeGreaterThanOrEqual(width >= KEY_ONE_ROW ? 1 : 2);
        expect(key.length).toBeLessThanOrEqual(KEY_MOST_ROWS);
      }
      for (const line of [...header, ...key, ...tree]) expect(displayWidth(line)).toBeLessThanOrEqual(width);
      // Nothing of the header is lost: its lines, joined again, are the unwrapped header but for the
      // lines used (fewer tree lines fit when the header takes more).
      const used = /(\d+) of 14 lines$/;
      const joined = header.map((line, k) => (k === 0 ? line : line.trimStart())).join(" ");
      // A budget with no line for the key says so before the lines used (`no key: --budget 16; `).
      const note = /(key left out: --budget \d+ has room|no key: --budget \d+); /;
      // Where it takes fewer lines so, the kinds no node has are said once (`0 moved, renamed or edited`).
      expect(kindsListed(joined.replace(note, "").replace(used, ""))).toBe(full.replace(used, ""));
      const [, lines] = joined.match(used)!;
      expect(Number(lines)).toBe(header.length + key.length + tree.length);
      expect(header.length + key.length + tree.length).toBeLessThanOrEqual(14);
      if (displayWidth(full) > width) expect(header.length).toBeGreaterThan(1);
      // JSON at the same width shows the same nodes: its fit counted the same header lines.
      const json = await cli([...args, "--width", String(width), "--format", "json"], { stdin: edited });
      expect(JSON.parse(json.stdout).lines).toBe(Number(lines));
    },
  );

  it("keeps the foci short first: one line when naming fewer foci makes it fit", async () => {
    const foci = ["docs", "services/ledger", "services"].flatMap((f) => ["--focus", f]);
    const r = await cli(["fixtures/tidewater-files.paths", ...foci, "--budget", "20", "--width", "78"]);
    expect(r.code).toBe(0);
    const { header } = split(r.stdout);
    expect(header).toHaveLength(1);
    expect(header[0]).toMatch(/and 2 more; \d+ of 20 lines$/);
  });
});
