import type { ChangeKind } from "../diff/changes.js";

/** The styles the text rendering uses; identity functions when colour is off. */
export interface Palette {
  focus: (s: string) => string;
  path: (s: string) => string;
  quiet: (s: string) => string;
  /** A diff's change tag, one colour per kind (the tag's words carry the meaning without colour). */
  change: Record<ChangeKind, (s: string) => string>;
}

const plain = (s: string) => s;
export const noColour: Palette = {
  focus: plain,
  path: plain,
  quiet: plain,
  change: {
    added: plain,
    removed: plain,
    moved: plain,
    renamed: plain,
    edited: plain,
    resized: plain,
    linked: plain,
    unlinked: plain,
  },
};

/**
 * Colour is decided at the edge (terminal, NO_COLOR, --color) and handed in as a boolean. The basic
 * sixteen colours only, so any terminal shows them.
 */
export function palette(colour: boolean): Palette {
  if (!colour) return noColour;
  return {
    focus: styled("bold", "underline"),
    path: styled("bold"),
    quiet: styled("dim"),
    change: {
      added: styled("green"),
      removed: styled("magenta"),
      moved: styled("blue"),
      renamed: styled("cyan"),
      edited: styled("blueBright", "underline"),
      linked: styled("greenBright", "underline"),
      unlinked: styled("magentaBright", "underline"),
      resized: styled("yellow"),
    },
  };
}

// Select Graphic Rendition parameters (ECMA-48, 8.3.117) that turn each style on and off; the bright
// colours 90-97 are the common extension of the eight (common practice, no source). The styles are
// written as the chalk package writes them at its level 1 (tests/render/palette.test.ts compares the
// two): loading chalk itself took about a tenth of a small run's start (issue 14).
const SGR = {
  bold: [1, 22],
  dim: [2, 22],
  underline: [4, 24],
  green: [32, 39],
  yellow: [33, 39],
  blue: [34, 39],
  magenta: [35, 39],
  cyan: [36, 39],
  greenBright: [92, 39],
  blueBright: [94, 39],
  magentaBright: [95, 39],
} as const;

/**
 * Text in the styles given, outermost first: each style's "on" sequence before it and the "off" ones
 * after, innermost first. An "off" sequence inside the text (styled text within) turns its style on
 * again after it, and the styles end before each line break and start again after it, so no style
 * leaks out of the text or across lines. Empty text stays empty.
 */
function styled(...names: (keyof typeof SGR)[]): (text: string) => string {
  const on = names.map((name) => `\u001b[${SGR[name][0]}m`);
  const off = names.map((name) => `\u001b[${SGR[name][1]}m`);
  const onAll = on.join("");
  const offAll = [...off].reverse().join("");
  return (text) => {
    if (text === "") return text;
    let out = text;
    if (out.includes("\u001b"))
      for (let k = names.length - 1; k >= 0; k--) out = out.replaceAll(off[k], off[k] + on[k]);
    if (out.includes("\n")) out = out.replace(/\r?\n/g, (lineEnd) => offAll + lineEnd + onAll);
    return onAll + out + offAll;
  };
}
