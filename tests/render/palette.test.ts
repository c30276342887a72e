import { Chalk } from "chalk";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { noColour, palette } from "../../src/render/palette.js";

// The reference: the chalk package (npm registry), at level 1 (the sixteen basic colours), which wrote
// espalier's colours before palette.ts wrote them itself.
const c = new Chalk({ level: 1 });
const reference = {
  focus: (s: string) => c.bold.underline(s),
  path: (s: string) => c.bold(s),
  quiet: (s: string) => c.dim(s),
  added: (s: string) => c.green(s),
  removed: (s: string) => c.magenta(s),
  moved: (s: string) => c.blue(s),
  renamed: (s: string) => c.cyan(s),
  edited: (s: string) => c.blueBright.underline(s),
  linked: (s: string) => c.greenBright.underline(s),
  unlinked: (s: string) => c.magentaBright.underline(s),
  resized: (s: string) => c.yellow(s),
};

const p = palette(true);
const ours: Record<keyof typeof reference, (s: string) => string> = {
  focus: p.focus,
  path: p.path,
  quiet: p.quiet,
  ...p.change,
};

// Text made of pieces that matter to styling: line breaks, escape sequences turning styles off and on.
const piece = fc.constantFrom(
  "a",
  "ledger",
  " ",
  "\n",
  "\r\n",
  "\r",
  "\u001b[22m",
  "\u001b[24m",
  "\u001b[39m",
  "\u001b[1m",
  "\u001b",
  "é",
);
const text = fc.array(piece, { maxLength: 12 }).map((parts) => parts.join(""));

describe("palette(colour)", () => {
  it("palette(true) styles every kind of text as chalk does at level 1 (reference library)", () => {
    fc.assert(
      fc.property(
        text,
        fc.constantFrom(...(Object.keys(reference) as (keyof typeof reference)[])),
        (s, kind) => {
          expect(ours[kind](s)).toBe(reference[kind](s));
        },
      ),
      { numRuns: 2000 },
    );
  });

  it("palette(true) writes bold and underline around a focus, off in reverse order (ECMA-48 SGR 1, 4, 24, 22)", () => {
    expect(p.focus("ledger")).toBe("\u001b[1m\u001b[4mledger\u001b[24m\u001b[22m");
    expect(p.focus("")).toBe("");
  });

  it("palette(false) leaves text as it is", () => {
    expect(palette(false)).toBe(noColour);
    expect(noColour.focus("a\nb")).toBe("a\nb");
  });
});
