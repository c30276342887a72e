import { Chalk, type ChalkInstance } from "chalk";
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
 * sixteen colours only (chalk level 1), so any terminal shows them.
 */
export function palette(colour: boolean): Palette {
  if (!colour) return noColour;
  const c: ChalkInstance = new Chalk({ level: 1 });
  return {
    focus: (s) => c.bold.underline(s),
    path: (s) => c.bold(s),
    quiet: (s) => c.dim(s),
    change: {
      added: (s) => c.green(s),
      removed: (s) => c.magenta(s),
      moved: (s) => c.blue(s),
      renamed: (s) => c.cyan(s),
      edited: (s) => c.blueBright.underline(s),
      linked: (s) => c.greenBright.underline(s),
      unlinked: (s) => c.magentaBright.underline(s),
      resized: (s) => c.yellow(s),
    },
  };
}
