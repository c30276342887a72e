import { readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import { formatError } from "../../src/cli/report-error.js";
import { EspalierError, quoted, say } from "../../src/errors.js";
import { safeText } from "../../src/model/safe-text.js";
import { cli } from "../helpers/cli.js";

// Source: Unicode Character Database 15.0.0, via Debian package unicode-data 15.0.0-1: the
// Default_Ignorable_Code_Point lines of DerivedCoreProperties.txt and the Cf lines of
// extracted/DerivedGeneralCategory.txt (fixtures/external/invisible-15.0.0.txt; see its README).
const fixture = fileURLToPath(new URL("../../fixtures/external/invisible-15.0.0.txt", import.meta.url));

function invisibleCodePoints(): number[] {
  const out = new Set<number>();
  for (const line of readFileSync(fixture, "utf8").split("\n")) {
    const m = /^([0-9A-F]{4,6})(?:\.\.([0-9A-F]{4,6}))?\s*;/.exec(line);
    if (!m) continue;
    const from = Number.parseInt(m[1], 16);
    const to = m[2] ? Number.parseInt(m[2], 16) : from;
    for (let c = from; c <= to; c++) out.add(c);
  }
  return [...out].sort((a, b) => a - b);
}

const INVISIBLE = invisibleCodePoints();
const isInvisible = new Set(INVISIBLE);
const rawInvisible = (text: string) => [...text].filter((ch) => isInvisible.has(ch.codePointAt(0)!));

describe("invisible characters (Default_Ignorable_Code_Point and Cf, Unicode 15.0)", () => {
  it("reads the published lists (sanity: soft hyphen, ZWSP, word joiner, BOM, tags are in them)", () => {
    for (const c of [0xad, 0x200b, 0x2060, 0xfeff, 0xe0041, 0xfff9, 0x3164])
      expect(isInvisible.has(c)).toBe(true);
    expect(INVISIBLE.length).toBeGreaterThan(4000);
  });

  it("safeText escapes every one of them inside a Latin name (adm\\u{200b}in never prints as admin)", () => {
    for (const c of INVISIBLE) {
      const ch = String.fromCodePoint(c);
      const out = safeText(`adm${ch}in`);
      expect(rawInvisible(out), c.toString(16)).toEqual([]);
      expect(out).toBe(`adm\\u{${c.toString(16)}}in`);
    }
  });

  it("escapes them at the start and the end of a name, and alone", () => {
    for (const c of INVISIBLE) {
      const ch = String.fromCodePoint(c);
      for (const name of [ch, `${ch}x`, `x${ch}`, `${ch}${ch}`])
        expect(rawInvisible(safeText(name))).toEqual([]);
    }
  });

  it("keeps those that shape the text where they do (documented in docs/reliability.md)", () => {
    const kept = [
      "\u{1F469}\u{1F3FD}\u200D\u{1F4BB}", // emoji ZWJ sequence (UTS #51)
      "\u{1F3F3}\uFE0F\u200D\u{1F308}", // emoji presentation selector, then ZWJ
      "1\uFE0F\u20E3", // keycap sequence
      "\u{1F3F4}\u{E0067}\u{E0062}\u{E0065}\u{E006E}\u{E0067}\u{E007F}", // flag tag sequence
      "\u0915\u094D\u200D\u0937", // Devanagari half form with ZWJ
      "\u0645\u06CC\u200C\u062E\u0648\u0627\u0647\u0645", // Persian with ZWNJ
      "\u845B\u{E0100}", // ideographic variation sequence
    ];
    for (const name of kept) expect(safeText(name)).toBe(name);
    // The same characters out of those contexts are escaped.
    expect(safeText("a\u200Db")).toBe("a\\u{200d}b");
    expect(safeText("a\uFE0F")).toBe("a\\u{fe0f}");
    expect(safeText("\u{E0067}\u{E0062}")).toBe("\\u{e0067}\\u{e0062}");
    expect(safeText("\u{1F3F4}\u{E0067}x")).toBe("\u{1F3F4}\\u{e0067}x");
  });

  // End to end: names with a sample of every range (its first and last code point) in every human format.
  const sample = INVISIBLE.filter(
    (c, k) => k === 0 || INVISIBLE[k - 1] !== c - 1 || INVISIBLE[k + 1] !== c + 1,
  );
  const stdin = JSON.stringify({
    name: "quillfeather",
    children: sample.map((c, k) => ({ name: `adm${String.fromCodePoint(c)}in`, size: k + 1 })),
  });

  for (const format of ["text", "markdown", "svg"]) {
    it(`shows none of them raw in ${format} output, and no two of those names alike`, async () => {
      const r = await cli(["-", "--format", format, "--budget", "1000", "--no-chains", "--color", "never"], {
        stdin,
      });
      expect(r.code, r.stderr).toBe(0);
      expect(rawInvisible(r.stdout)).toEqual([]);
      for (const c of sample) expect(r.stdout).toContain(`\\u{${c.toString(16)}}`);
    });
  }

  it("shows none of them raw in an error line", () => {
    for (const c of sample) {
      const name = `adm${String.fromCodePoint(c)}in`;
      const line = formatError(new EspalierError("DUPLICATE_ID", say`repeats the id ${quoted.id(name)}`));
      expect(rawInvisible(line)).toEqual([]);
    }
  });
});
