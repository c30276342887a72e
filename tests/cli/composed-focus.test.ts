import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

// Unicode normalization forms NFC and NFD (UAX #15): "í" composed is U+00ED; decomposed, "i" and U+0301
// COMBINING ACUTE ACCENT. macOS file systems hand out decomposed names, so a listing made there holds
// them; a focus typed or kept in a CI file is composed (or the other way round).
const composed = "guías/ruta.md";
const decomposed = composed.normalize("NFD");
const listing = (path: string) =>
  `4096\tdocs\n4096\tdocs/${path.slice(0, path.indexOf("/"))}\n120\tdocs/${path}\n4096\tsrc\n70\tsrc/índice.ts\n`;
const dir = mkdtempSync(join(tmpdir(), "espalier-composed-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe("espalier LISTING --focus PATH whose letters are composed otherwise than the names'", () => {
  it("the two spellings differ as code points (the test's own premise)", () => {
    expect(decomposed).not.toBe(composed);
    expect(decomposed.normalize("NFC")).toBe(composed);
  });

  // Field defect: such a focus failed, 'focus "docs/guías" matches no node; did you mean "docs/guías"?'.
  const cases: [string, string, string][] = [
    ["NFC", composed, decomposed],
    ["NFD", decomposed, composed],
  ];
  for (const [form, listed, typed] of cases) {
    it(`names the node in a listing in ${form}, by --focus and by a --focus-from line`, async () => {
      const file = join(dir, `${form}.paths`);
      writeFileSync(file, listing(listed));
      const byFlag = await cli([file, "--focus", `docs/${typed}`, "--format", "json"]);
      expect(byFlag.code, byFlag.stderr).toBe(0);
      expect(JSON.parse(byFlag.stdout).foci).toEqual([`docs/${listed}`]);
      const list = join(dir, `${form}.txt`);
      writeFileSync(list, `docs/${typed}\n`);
      const fromList = await cli([file, "--focus-from", list, "--format", "json"]);
      expect(fromList.code, fromList.stderr).toBe(0);
      expect(JSON.parse(fromList.stdout).foci).toEqual([`docs/${listed}`]);
    });
  }

  it("takes the name as typed where two spellings are siblings, and will not choose for a third", async () => {
    // U+1E1D (e with cedilla and breve) and its NFD, e U+0327 U+0306; typed with the marks in the other
    // order, e U+0306 U+0327, it is canonically equivalent to both (UAX #15, canonical ordering).
    const [one, two, third] = ["\u1e1d", "e\u0327\u0306", "e\u0306\u0327"];
    expect(new Set([one, two, third].map((s) => s.normalize("NFC"))).size).toBe(1);
    const file = join(dir, "both.paths");
    writeFileSync(file, `1\tnotes/${one}\n2\tnotes/${two}\n3\tother/x\n`);
    for (const typed of [one, two]) {
      const r = await cli([file, "--focus", `notes/${typed}`, "--format", "json"]);
      expect(r.code, r.stderr).toBe(0);
      expect(JSON.parse(r.stdout).foci).toEqual([`notes/${typed}`]);
    }
    const none = await cli([file, "--focus", `notes/${third}`]);
    expect(none.code).toBe(2);
    expect(none.stderr).toMatch(/\[FOCUS_NO_MATCH\]\n$/);
  });
});
