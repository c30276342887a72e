import { describe, expect, it } from "vitest";
import { displayWidth } from "../../src/render/display-width.js";
import { cli } from "../helpers/cli.js";

// Field test: at a narrow --width, siblings whose names share a long start (a package's builds for
// each platform, as a package manager lists them; a department's sections named in CJK) were cut at
// the end and printed identically. Invented tidewater names; widths per Unicode UAX #11 (CJK
// ideographs of class W take two columns), as string-width reads them.
const platforms = [
  "darwin-arm64",
  "darwin-x64",
  "linux-arm64-musl",
  "linux-arm64",
  "linux-x64-musl",
  "linux-x64",
];
const children: Record<string, { size: number }> = {};
for (const p of platforms) children[`@tidewater/ledger-bindings-${p}`] = { size: 1 };
children["潮汐台帳部門第一設計課記録"] = { size: 2 };
children["潮汐台帳部門第一設計課帳簿"] = { size: 3 };
const input = JSON.stringify({ name: "tidewater", children });

describe("sibling names cut at --width 30", () => {
  it.each([
    ["no focus", []],
    ["each a focus, with its numbers on the line", ["--focus", "*"]],
  ])("stay different from one another, and every line fits 30 columns (%s)", async (_, focus) => {
    const result = await cli(["-", "--width", "30", "--budget", "20", ...focus], { stdin: input });
    expect(result.stderr).toBe("");
    const lines = result.stdout.trimEnd().split("\n");
    for (const line of lines) expect(displayWidth(line)).toBeLessThanOrEqual(30);
    // The header wraps at 30 columns; the tree starts at the root's line (a mark in the first column).
    const root = lines.findIndex((line) => /^[.*:] /.test(line));
    const names = lines.slice(root + 1).map((line) => line.replace(/^ +[.*:] /, "").replace(/ {2}.*$/, ""));
    expect(names).toHaveLength(platforms.length + 2);
    expect(names.some((n) => n.includes("…"))).toBe(true);
    expect(new Set(names).size).toBe(names.length);
  });
});
